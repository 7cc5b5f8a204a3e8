const monthFormat = new Intl.DateTimeFormat(undefined, { month: 'short', year: 'numeric', timeZone: 'UTC' });

/** "Dec 2026" from the ledger's 'YYYY-MM-01'. */
export const formatMonth = (month: string) => monthFormat.format(new Date(`${month.slice(0, 10)}T00:00:00Z`));

/** The last `count` calendar months (UTC) as 'YYYY-MM-01', oldest first. */
export function lastMonths(count: number, now = new Date()): string[] {
  const months: string[] = [];
  for (let back = count - 1; back >= 0; back--) {
    const date = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - back, 1));
    months.push(`${date.getUTCFullYear()}-${String(date.getUTCMonth() + 1).padStart(2, '0')}-01`);
  }
  return months;
}
