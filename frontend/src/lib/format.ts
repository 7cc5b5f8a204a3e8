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
