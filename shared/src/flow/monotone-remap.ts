/**
 * Monotone remapping of a profile onto a new grid (numerics.md §2, refinement):
 * piecewise cubic Hermite interpolation with Steffen's slopes (M. Steffen, Astron.
 * Astrophys. 239, 1990), which creates no new extrema and is exact for linear data
 * (h ≈ c·r at a pole). Both grids are sorted and share their end points.
 */
export function remapMonotone(
  xOld: Float64Array,
  yOld: Float64Array,
  xNew: Float64Array,
  yNew: Float64Array,
): void {
  const n = xOld.length - 1;
  const slope = new Float64Array(n + 1);
  const sec = (k: number) => (yOld[k + 1]! - yOld[k]!) / (xOld[k + 1]! - xOld[k]!);
  for (let k = 1; k < n; k++) {
    const h0 = xOld[k]! - xOld[k - 1]!;
    const h1 = xOld[k + 1]! - xOld[k]!;
    const s0 = sec(k - 1);
    const s1 = sec(k);
    const p = (s0 * h1 + s1 * h0) / (h0 + h1);
    slope[k] = (Math.sign(s0) + Math.sign(s1)) * Math.min(Math.abs(s0), Math.abs(s1), 0.5 * Math.abs(p));
  }
  slope[0] = endSlope(xOld[1]! - xOld[0]!, n > 1 ? xOld[2]! - xOld[1]! : 1, sec(0), n > 1 ? sec(1) : sec(0));
  slope[n] = endSlope(
    xOld[n]! - xOld[n - 1]!,
    n > 1 ? xOld[n - 1]! - xOld[n - 2]! : 1,
    sec(n - 1),
    n > 1 ? sec(n - 2) : sec(n - 1),
  );
  let k = 0;
  const last = xNew.length - 1;
  for (let i = 0; i <= last; i++) {
    const x = xNew[i]!;
    while (k < n - 1 && x > xOld[k + 1]!) k++;
    const hk = xOld[k + 1]! - xOld[k]!;
    const t = (x - xOld[k]!) / hk;
    const t2 = t * t;
    const t3 = t2 * t;
    yNew[i] =
      (2 * t3 - 3 * t2 + 1) * yOld[k]! +
      (t3 - 2 * t2 + t) * hk * slope[k]! +
      (-2 * t3 + 3 * t2) * yOld[k + 1]! +
      (t3 - t2) * hk * slope[k + 1]!;
  }
  yNew[0] = yOld[0]!;
  yNew[last] = yOld[n]!;
}

function endSlope(h0: number, h1: number, s0: number, s1: number): number {
  const p = s0 * (1 + h0 / (h0 + h1)) - (s1 * h0) / (h0 + h1);
  if (p * s0 <= 0) return 0;
  if (Math.abs(p) > 2 * Math.abs(s0)) return 2 * s0;
  return p;
}
