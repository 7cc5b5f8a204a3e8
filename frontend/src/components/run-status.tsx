import type { FlowOutcome, RunState } from '@kiln/shared';
import type { ReactNode } from 'react';
import {
  IconCheck,
  IconClock,
  IconCross,
  IconFlare,
  IconHourglass,
  IconPaused,
  IconQueue,
  IconRunning,
  IconStop,
  IconWarning,
} from './icons';
import { StatusTag, type StatusTone } from './status-tag';

interface StatusLook {
  label: string;
  tone: StatusTone;
  icon: ReactNode;
  title: string;
}

/** A run's state: icon + word (+ colour), never colour alone. */
export const runStateLook: Record<RunState, StatusLook> = {
  queued: { label: 'In queue', tone: 'idle', icon: <IconQueue />, title: 'Submitted; waiting for a worker to pick it up' },
  waiting: { label: 'Waiting', tone: 'warn', icon: <IconHourglass />, title: 'Not admitted yet (quota, or no free slot)' },
  running: { label: 'Running', tone: 'info', icon: <IconRunning />, title: 'A worker is computing it now' },
  paused: { label: 'Paused', tone: 'idle', icon: <IconPaused />, title: 'Checkpointed and stopped; can be resumed' },
  finished: { label: 'Finished', tone: 'ok', icon: <IconCheck />, title: 'Ended with an outcome' },
  failed: { label: 'Failed', tone: 'down', icon: <IconCross />, title: 'A software error stopped it' },
  cancelled: { label: 'Cancelled', tone: 'idle', icon: <IconStop />, title: 'Stopped on request; its checkpoints are kept' },
};

/** How a run ended (numerics.md §3). */
export const outcomeLook: Record<FlowOutcome, StatusLook> = {
  converged: { label: 'Converged', tone: 'ok', icon: <IconCheck />, title: 'The tension fell below the threshold: a harmonic map' },
  blowup: { label: 'Blow-up', tone: 'ember', icon: <IconFlare />, title: 'Singularity indicators fired; numerical evidence to confirm with a finer run' },
  'time-limit': { label: 'Time limit', tone: 'warn', icon: <IconClock />, title: 'Reached t_max or its CPU budget; resumable' },
  'numerics-failed': { label: 'Numerics failed', tone: 'down', icon: <IconWarning />, title: 'NaN, Newton failure or step collapse without gradient growth' },
  degenerate: { label: 'Degenerate', tone: 'down', icon: <IconWarning />, title: "The normalized flow's σ-equation became singular" },
};

export function RunStateTag({ state }: { state: RunState }) {
  const look = runStateLook[state];
  return <StatusTag tone={look.tone} label={look.label} icon={look.icon} title={look.title} />;
}

export function OutcomeTag({ outcome }: { outcome: FlowOutcome | null }) {
  if (!outcome) return <span className="muted">—</span>;
  const look = outcomeLook[outcome];
  return <StatusTag tone={look.tone} label={look.label} icon={look.icon} title={look.title} />;
}
