import type { Quota } from '@kiln/shared';
import { formatNumber } from '@/lib/format';

/** A CPU time limit the way people think of it: "48 h", "12 h 30 min", "45 min". */
export function formatRunTime(seconds: number): string {
  const hours = Math.floor(seconds / 3600);
  const minutes = (seconds - hours * 3600) / 60;
  const min = minutes ? `${formatNumber(minutes, 3)} min` : '';
  if (!hours) return min || `${formatNumber(seconds, 3)} s`;
  return min ? `${hours} h ${min}` : `${hours} h`;
}

/** Grid points with thin-space thousands ("20 000"). */
export const formatPoints = (points: number) => `${points.toLocaleString('en-GB').replace(/,/g, '\u2009')} points`;

/** One quota field, readably. */
export function formatQuotaField(field: keyof Quota, value: number): string {
  switch (field) {
    case 'slots':
      return `${value} ${value === 1 ? 'slot' : 'slots'}`;
    case 'cpuHoursPerMonth':
      return `${formatNumber(value, 4)} CPU-h a month`;
    case 'maxGridPoints':
      return formatPoints(value);
    case 'maxRunCpuSeconds':
      return formatRunTime(value);
  }
}

export const quotaFieldLabel: Record<keyof Quota, string> = {
  slots: 'Slots',
  cpuHoursPerMonth: 'CPU-hours per month',
  maxGridPoints: 'Largest grid',
  maxRunCpuSeconds: 'Longest run (CPU time)',
};
