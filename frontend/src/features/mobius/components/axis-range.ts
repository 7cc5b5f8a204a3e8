/**
 * A value-axis range for a series that may be (nearly) constant: when the data span
 * less than `minSpan`, an explicit range `minSpan` wide around the data's middle, so
 * round-off never fills the plot height; otherwise null (the chart picks nice bounds).
 */
export function forcedAxisRange(values: readonly (number | null)[], minSpan: number): { min: number; max: number } | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v === null || !Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo > hi || hi - lo >= minSpan) return null;
  const mid = (lo + hi) / 2;
  return { min: mid - minSpan / 2, max: mid + minSpan / 2 };
}

/** ECharts y-axis bounds: the forced range (hide its odd end labels with `showMin/MaxLabel`) or nice automatic bounds. */
export function yBounds(range: { min: number; max: number } | null) {
  return range ? { min: range.min, max: range.max } : { scale: true };
}

/**
 * Significant digits for axis labels, enough that neighbouring ticks of a narrow
 * range around a large value do not print alike (29.61, 29.62 rather than 29.6, 29.6).
 */
export function labelDigits(values: readonly (number | null)[], range: { min: number; max: number } | null): number {
  let lo = range?.min ?? Infinity;
  let hi = range?.max ?? -Infinity;
  for (const v of values) {
    if (v === null || !Number.isFinite(v)) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  const size = Math.max(Math.abs(lo), Math.abs(hi));
  const span = hi - lo;
  if (!(span > 0) || !(size > 0)) return 3;
  // Ticks sit about span/5 apart; one more digit than it takes to tell them apart.
  return Math.min(8, Math.max(3, Math.ceil(Math.log10(size / (span / 5))) + 1));
}
