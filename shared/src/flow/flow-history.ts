/**
 * Bounded history of the run used by the blow-up fit and the look-alike check
 * (numerics.md §3). A ring buffer of rows [tHi, tLo, ln max|∇u|, ‖τ‖, D, dt, r*],
 * written after accepted steps whenever max|∇u| grew by 5 % since the last row or
 * 25 steps passed. It is part of the checkpoint, so a resumed run fits the same data.
 */
export const HISTORY_CAPACITY = 512;
export const HISTORY_FIELDS = 7;
export const H_T_HI = 0;
export const H_T_LO = 1;
export const H_LOG_GRAD = 2;
export const H_TENSION = 3;
export const H_ENERGY = 4;
export const H_DT = 5;
export const H_GRAD_AT = 6;
/** A row is written when ln max|∇u| grew by this much since the last row… */
export const HISTORY_LOG_GROWTH = Math.log(1.05);
/** …or after this many accepted steps. */
export const HISTORY_STEP_INTERVAL = 25;

export interface HistoryRow {
  /** t as a double-double: tHi + tLo. */
  tHi: number;
  tLo: number;
  logGrad: number;
  tension: number;
  energy: number;
  dt: number;
  gradAt: number;
}

/** Rows oldest first (allocates: call at the end of a run, not per step). */
export function historyRows(buffer: Float64Array, head: number, count: number): HistoryRow[] {
  const rows: HistoryRow[] = [];
  const start = (head - count + HISTORY_CAPACITY) % HISTORY_CAPACITY;
  for (let k = 0; k < count; k++) {
    const o = ((start + k) % HISTORY_CAPACITY) * HISTORY_FIELDS;
    rows.push({
      tHi: buffer[o + H_T_HI]!,
      tLo: buffer[o + H_T_LO]!,
      logGrad: buffer[o + H_LOG_GRAD]!,
      tension: buffer[o + H_TENSION]!,
      energy: buffer[o + H_ENERGY]!,
      dt: buffer[o + H_DT]!,
      gradAt: buffer[o + H_GRAD_AT]!,
    });
  }
  return rows;
}
