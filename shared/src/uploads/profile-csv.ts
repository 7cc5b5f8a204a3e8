// Parsing and checking uploaded profile tables, shared by the API (which stores
// only what passes) and the browser (which can say what is wrong before uploading).

export const UPLOAD_LIMITS = {
  /** Largest CSV upload, bytes. */
  csvBytes: 2 * 1024 * 1024,
  /** Largest checkpoint upload, bytes. */
  checkpointBytes: 32 * 1024 * 1024,
  minRows: 3,
  maxRows: 100_000,
} as const;

export interface CsvProblem {
  /** 1-based line number in the file (the header is line 1); 0 for the file as a whole. */
  row: number;
  column: string;
  message: string;
}

export type ParsedTable<C extends string> =
  | { ok: true; columns: Record<C, number[]>; rows: number }
  | { ok: false; problems: CsvProblem[] };

/** Reads a numeric CSV with exactly the given header; every problem names its row and column. */
export function parseNumericCsv<C extends string>(text: string, columns: readonly C[]): ParsedTable<C> {
  const problems: CsvProblem[] = [];
  if (text.includes('\u0000')) return { ok: false, problems: [{ row: 0, column: '', message: 'the file is binary, not a CSV text file' }] };
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  while (lines.length > 0 && lines[lines.length - 1]!.trim() === '') lines.pop();
  const header = (lines[0] ?? '').split(',').map((cell) => cell.trim().toLowerCase());
  if (header.length !== columns.length || header.some((name, i) => name !== columns[i])) {
    return { ok: false, problems: [{ row: 1, column: '', message: `the header must be exactly "${columns.join(',')}" (found "${header.join(',')}")` }] };
  }
  const rows = lines.length - 1;
  if (rows < UPLOAD_LIMITS.minRows) problems.push({ row: 0, column: '', message: `at least ${UPLOAD_LIMITS.minRows} data rows are needed (found ${rows})` });
  if (rows > UPLOAD_LIMITS.maxRows) return { ok: false, problems: [{ row: 0, column: '', message: `at most ${UPLOAD_LIMITS.maxRows} data rows are allowed (found ${rows})` }] };
  const out = Object.fromEntries(columns.map((c) => [c, [] as number[]])) as Record<C, number[]>;
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i]!.split(',');
    if (cells.length !== columns.length) {
      problems.push({ row: i + 1, column: '', message: `expected ${columns.length} values, found ${cells.length}` });
      continue;
    }
    cells.forEach((cell, c) => {
      const text = cell.trim();
      const value = text === '' ? NaN : Number(text);
      if (!Number.isFinite(value)) problems.push({ row: i + 1, column: columns[c]!, message: `"${text}" is not a finite number` });
      out[columns[c]!].push(value);
    });
    if (problems.length > 20) break;
  }
  return problems.length > 0 ? { ok: false, problems } : { ok: true, columns: out, rows };
}

function increasing(values: number[], column: string, problems: CsvProblem[]): void {
  for (let i = 1; i < values.length; i++) {
    if (!(values[i]! > values[i - 1]!)) {
      problems.push({ row: i + 2, column, message: `${column} must increase strictly (${values[i]} after ${values[i - 1]})` });
      return;
    }
  }
}

const near = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b));

export interface InitialProfile {
  /** Which domain the table spans: r ∈ [0, π] (sphere) or r ∈ [0, 1] (ball). */
  domain: 'sphere' | 'ball';
  r: number[];
  h: number[];
}

/** An initial profile h₀(r) with columns r,h: r from 0 to π (sphere) or 1 (ball), h(0) = 0, and h(π) = π on the sphere. */
export function parseInitialProfileCsv(text: string): { ok: true; profile: InitialProfile } | { ok: false; problems: CsvProblem[] } {
  const table = parseNumericCsv(text, ['r', 'h'] as const);
  if (!table.ok) return table;
  const { r, h } = table.columns;
  const problems: CsvProblem[] = [];
  increasing(r, 'r', problems);
  if (!near(r[0]!, 0)) problems.push({ row: 2, column: 'r', message: `r must start at 0 (found ${r[0]})` });
  if (!near(h[0]!, 0)) problems.push({ row: 2, column: 'h', message: `h must be 0 at r = 0, where the map is smooth (found ${h[0]})` });
  const last = r[r.length - 1]!;
  const domain = near(last, Math.PI) ? 'sphere' : near(last, 1) ? 'ball' : undefined;
  if (!domain) problems.push({ row: r.length + 1, column: 'r', message: `r must end at π (sphere) or 1 (ball); found ${last}` });
  if (domain === 'sphere' && !near(h[h.length - 1]!, Math.PI)) {
    problems.push({ row: r.length + 1, column: 'h', message: `on the sphere h must be π at r = π (degree one); found ${h[h.length - 1]}` });
  }
  if (h.some((v) => Math.abs(v) > 4 * Math.PI)) problems.push({ row: 0, column: 'h', message: 'h must stay within ±4π' });
  return problems.length > 0 ? { ok: false, problems } : { ok: true, profile: { domain: domain!, r, h } };
}

export interface TargetProfile {
  h: number[];
  f: number[];
  z: number[];
}

/** A target hypersurface of revolution (h, f(h), z(h)): h from 0 to π, f = 0 at both poles and f > 0 between. */
export function parseTargetProfileCsv(text: string): { ok: true; profile: TargetProfile } | { ok: false; problems: CsvProblem[] } {
  const table = parseNumericCsv(text, ['h', 'f', 'z'] as const);
  if (!table.ok) return table;
  const { h, f, z } = table.columns;
  const problems: CsvProblem[] = [];
  increasing(h, 'h', problems);
  if (!near(h[0]!, 0)) problems.push({ row: 2, column: 'h', message: `h must start at 0 (found ${h[0]})` });
  if (!near(h[h.length - 1]!, Math.PI)) problems.push({ row: h.length + 1, column: 'h', message: `h must end at π (found ${h[h.length - 1]})` });
  if (Math.abs(f[0]!) > 1e-9) problems.push({ row: 2, column: 'f', message: `f must be 0 at the pole h = 0 (found ${f[0]})` });
  if (Math.abs(f[f.length - 1]!) > 1e-9) problems.push({ row: f.length + 1, column: 'f', message: `f must be 0 at the pole h = π (found ${f[f.length - 1]})` });
  for (let i = 1; i < f.length - 1; i++) {
    if (!(f[i]! > 0)) {
      problems.push({ row: i + 2, column: 'f', message: `f must be positive between the poles (found ${f[i]})` });
      break;
    }
  }
  const zSpan = Math.abs(z[0]! - z[z.length - 1]!);
  if (!(zSpan > 0)) problems.push({ row: 0, column: 'z', message: 'z must differ between the two poles' });
  return problems.length > 0 ? { ok: false, problems } : { ok: true, profile: { h, f, z } };
}

export const UPLOAD_KINDS = ['initial-profile', 'target-profile', 'checkpoint'] as const;
export type UploadKind = (typeof UPLOAD_KINDS)[number];

export interface UploadInfo {
  id: string;
  kind: UploadKind;
  filename: string;
  sizeBytes: number;
  sha256: string;
  createdAt: string;
  /** What the check learnt: rows and domain of a profile, step and t of a checkpoint. */
  summary: Record<string, unknown>;
}
