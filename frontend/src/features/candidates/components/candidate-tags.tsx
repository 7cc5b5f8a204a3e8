import './candidates.css';
import type { Candidate, Verdict } from '@kiln/shared';
import type { ReactNode } from 'react';
import { IconCheck, IconClock, IconCross, IconFlare, IconIdle, IconInfo, IconWarning } from '@/components/icons';
import { StatusTag, type StatusTone } from '@/components/status-tag';

type Kind = Candidate['kind'];

interface Look {
  label: string;
  tone: StatusTone;
  icon: ReactNode;
  title: string;
}

/** The engine's classes of a possible singularity (numerics.md §3), as icon + word. */
export const kindLook: Record<Kind, Look> = {
  'type-I': { label: 'Self-similar (type I)', tone: 'ember', icon: <IconFlare />, title: 'Finite time, p near ½ and the rescaled profiles collapsing' },
  'type-II': { label: 'Faster (type II)', tone: 'ember', icon: <IconFlare />, title: 'Finite time, faster than self-similar: p above ½' },
  'infinite-time': { label: 'Infinite time', tone: 'info', icon: <IconClock />, title: 'The gradient keeps growing while the fitted T̂ recedes' },
  inconclusive: { label: 'Inconclusive', tone: 'idle', icon: <IconIdle />, title: 'The indicators fired but no class fits well' },
};

export const verdictLook: Record<Verdict, Look> = {
  confirmed: { label: 'Confirmed singularity', tone: 'ok', icon: <IconCheck />, title: 'A reviewer judged this a real singularity' },
  artefact: { label: 'Numerical artefact', tone: 'down', icon: <IconCross />, title: 'A reviewer judged this an effect of the discretisation' },
  'needs-finer-run': { label: 'Needs a finer run', tone: 'warn', icon: <IconWarning />, title: 'A reviewer asked for a finer run before deciding' },
};

export function KindTag({ kind }: { kind: Kind }) {
  const look = kindLook[kind];
  return <StatusTag tone={look.tone} label={look.label} icon={look.icon} title={look.title} />;
}

export function VerdictTag({ verdict }: { verdict: Verdict | null }) {
  if (!verdict) return <StatusTag tone="idle" label="Awaiting verdict" icon={<IconInfo />} title="Nobody has judged this candidate yet" />;
  const look = verdictLook[verdict];
  return <StatusTag tone={look.tone} label={look.label} icon={look.icon} title={look.title} />;
}
