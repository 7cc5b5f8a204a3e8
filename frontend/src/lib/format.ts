const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
const date = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });
const time = new Intl.DateTimeFormat(undefined, { timeStyle: 'medium' });

function parse(iso: string): Date | null {
  const value = new Date(iso);
  return Number.isNaN(value.getTime()) ? null : value;
}

export const formatDateTime = (iso: string) => (parse(iso) ? dateTime.format(parse(iso)!) : '—');
export const formatDate = (iso: string) => (parse(iso) ? date.format(parse(iso)!) : '—');
export const formatTime = (iso: string) => (parse(iso) ? time.format(parse(iso)!) : '—');

/** Milliseconds with two significant figures below 10 ms, whole numbers above. */
export function formatLatency(ms: number): string {
  if (ms < 10) return `${ms.toPrecision(2)} ms`;
  if (ms < 10_000) return `${Math.round(ms)} ms`;
  return `${(ms / 1000).toPrecision(3)} s`;
}

export const plural = (count: number, one: string, many: string) => `${count} ${count === 1 ? one : many}`;

const MINUS = '−';

/**
 * A measured number with `digits` significant figures; exponent notation
 * (1.2 × 10⁻⁸ written as 1.2e−8) outside [1e−3, 1e5). Tabular figures come from CSS.
 */
export function formatNumber(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '∞' : `${MINUS}∞`;
  if (value === 0) return '0';
  const abs = Math.abs(value);
  let text: string;
  if (abs >= 1e-3 && abs < 1e5) {
    text = String(Number(value.toPrecision(digits)));
  } else {
    const [mantissa, exponent] = value.toExponential(Math.max(0, digits - 1)).split('e');
    text = `${String(Number(mantissa))}e${exponent!.replace('+', '')}`;
  }
  return text.replace(/-/g, MINUS);
}

/** A number with a unit after a thin space. */
export const withUnit = (value: number | null | undefined, unit: string, digits = 4) =>
  value === null || value === undefined ? '—' : `${formatNumber(value, digits)} ${unit}`;

/** CPU time: seconds below a minute, minutes below an hour, then hours. */
export function formatCpu(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined) return '—';
  if (seconds < 60) return `${formatNumber(seconds, 2)} s`;
  if (seconds < 3600) return `${formatNumber(seconds / 60, 3)} min`;
  return `${formatNumber(seconds / 3600, 3)} h`;
}

/** CPU-hours for estimates and quotas. */
export const formatCpuHours = (hours: number | null | undefined) =>
  hours === null || hours === undefined ? '—' : `${formatNumber(hours, hours < 10 ? 2 : 3)} CPU-h`;

/** An amount of CPU time given in hours, in CPU-s or CPU-min when small (estimates, this month's use). */
export function formatCpuAmount(hours: number | null | undefined): string {
  if (hours === null || hours === undefined) return '—';
  // Tiny amounts read better in seconds or minutes than as 6.4e−4 CPU-h.
  if (hours > 0 && hours < 1 / 60) return `${formatNumber(hours * 3600, 2)} CPU-s`;
  if (hours > 0 && hours < 1) return `${formatNumber(hours * 60, 2)} CPU-min`;
  return formatCpuHours(hours);
}

/** Bytes as kB/MB. */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${formatNumber(bytes / 1024, 3)} kB`;
  return `${formatNumber(bytes / 1024 / 1024, 3)} MB`;
}

/** An angle in radians, also as a multiple of π when that reads better. */
export function formatAngle(radians: number): string {
  return `${formatNumber(radians / Math.PI, 4)}π`;
}

/** "3 min ago" style age of a timestamp. */
export function formatAge(iso: string | null | undefined, now = Date.now()): string {
  if (!iso) return '—';
  const ms = now - new Date(iso).getTime();
  if (Number.isNaN(ms)) return '—';
  const s = Math.max(0, Math.round(ms / 1000));
  if (s < 60) return `${s} s ago`;
  if (s < 3600) return `${Math.round(s / 60)} min ago`;
  if (s < 86_400) return `${Math.round(s / 3600)} h ago`;
  return `${Math.round(s / 86_400)} d ago`;
}

/** A number as a person would type it: 1e8 rather than 100000000, 1e-6 rather than 0.000001. */
export function formatForInput(value: number | null | undefined): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '';
  const abs = Math.abs(value);
  if (abs !== 0 && (abs >= 1e5 || abs < 1e-3)) return value.toExponential().replace('e+', 'e').replace(/\.?0+e/, 'e');
  return String(value);
}

/** The first block of a uuid, enough to tell runs apart on screen. */
export const shortId = (id: string) => id.slice(0, 8);
