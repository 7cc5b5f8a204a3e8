import type { ReactNode } from 'react';
import { IconCheck, IconCross, IconIdle, IconInfo, IconWarning } from './icons';

export type StatusTone = 'ok' | 'warn' | 'down' | 'idle' | 'info';

const toneIcon: Record<StatusTone, (props: object) => ReactNode> = {
  ok: IconCheck,
  warn: IconWarning,
  down: IconCross,
  idle: IconIdle,
  info: IconInfo,
};

/**
 * A status as icon + word (+ colour). The word is required: colour is never the
 * only carrier of meaning.
 */
export function StatusTag({ tone, label, title }: { tone: StatusTone; label: string; title?: string }) {
  const Glyph = toneIcon[tone];
  return (
    <span className={`status-tag status-tag--${tone}`} title={title} data-status={tone}>
      <Glyph />
      <span>{label}</span>
    </span>
  );
}
