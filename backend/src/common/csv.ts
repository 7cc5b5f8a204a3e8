/** One CSV field (RFC 4180): quoted when it holds a comma, quote or line break. */
export function csvField(value: unknown): string {
  if (value === null || value === undefined) return '';
  const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : String(value)) : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvLine(fields: unknown[]): string {
  return `${fields.map(csvField).join(',')}\r\n`;
}
