import type { ReactNode } from 'react';
import { IconCheck, IconCross, IconIdle, IconInfo, IconWarning } from './icons';

export type StatusTone = 'ok' | 'warn' | 'down' | 'idle' | 'info' | 'ember';

const toneIcon: Record<StatusTone, (props: object) => ReactNode> = {
  ok: IconCheck,
  warn: IconWarning,
  down: IconCross,
  idle: IconIdle,
  info: IconInfo,
  ember: IconInfo,
};

/**
 * A status as icon + word (+ colour). The word is required: colour is never the
 * only carrier of meaning.
 */
export function StatusTag({
  tone,
  label,
  title,
  icon,
}: {
  tone: StatusTone;
  label: string;
  title?: string;
  /** A more specific glyph than the tone's own (run states, outcomes). */
  icon?: ReactNode;
}) {
  const Glyph = toneIcon[tone];
  return (
    <span className={`status-tag status-tag--${tone}`} title={title} data-status={tone}>
      {icon ?? <Glyph />}
      <span>{label}</span>
    </span>
  );
}
