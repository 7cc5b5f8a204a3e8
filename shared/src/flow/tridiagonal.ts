/**
 * Thomas algorithm for a symmetric-pattern tridiagonal system on the interior
 * nodes lo..hi (inclusive): diag[i] x_i + upper[i−1] x_{i−1} + upper[i] x_{i+1} = rhs[i].
 * `lower` may differ from `upper` (pass the same array for a symmetric matrix).
 * Overwrites `rhs` with the solution; `work` is scratch of the same length.
 * O(N), no allocation, no pivoting: the matrices here are M + θ·H with a positive
 * lumped mass M, diagonally dominant for the step sizes the controller accepts.
 * Returns false when a pivot is not a finite non-zero number (the caller treats it
 * as a Newton failure and shrinks the step).
 */
export function solveTridiagonal(
  lo: number,
  hi: number,
  lower: Float64Array,
  diag: Float64Array,
  upper: Float64Array,
  rhs: Float64Array,
  work: Float64Array,
): boolean {
  // Row i: lower[i−1]·x_{i−1} + diag[i]·x_i + upper[i]·x_{i+1} = rhs[i]
  let inv = 1 / diag[lo]!;
  if (!Number.isFinite(inv)) return false;
  rhs[lo] = rhs[lo]! * inv;
  for (let i = lo + 1; i <= hi; i++) {
    const w = upper[i - 1]! * inv;
    work[i - 1] = w;
    const l = lower[i - 1]!;
    inv = 1 / (diag[i]! - l * w);
    // A zero or non-finite pivot gives a non-finite reciprocal.
    if (!Number.isFinite(inv)) return false;
    rhs[i] = (rhs[i]! - l * rhs[i - 1]!) * inv;
  }
  for (let i = hi - 1; i >= lo; i--) {
    rhs[i] = rhs[i]! - work[i]! * rhs[i + 1]!;
  }
  return true;
}

/**
 * {@link solveTridiagonal} for two right-hand sides at once (one elimination, both
 * vectors carried through it): the two Thomas solves of the bordered system of the
 * normalized flow (tr-bdf2-stepper.ts). Overwrites `rhsA` and `rhsB`.
 */
export function solveTridiagonal2(
  lo: number,
  hi: number,
  lower: Float64Array,
  diag: Float64Array,
  upper: Float64Array,
  rhsA: Float64Array,
  rhsB: Float64Array,
  work: Float64Array,
): boolean {
  let inv = 1 / diag[lo]!;
  if (!Number.isFinite(inv)) return false;
  rhsA[lo] = rhsA[lo]! * inv;
  rhsB[lo] = rhsB[lo]! * inv;
  for (let i = lo + 1; i <= hi; i++) {
    const w = upper[i - 1]! * inv;
    work[i - 1] = w;
    const l = lower[i - 1]!;
    inv = 1 / (diag[i]! - l * w);
    if (!Number.isFinite(inv)) return false;
    rhsA[i] = (rhsA[i]! - l * rhsA[i - 1]!) * inv;
    rhsB[i] = (rhsB[i]! - l * rhsB[i - 1]!) * inv;
  }
  for (let i = hi - 1; i >= lo; i--) {
    rhsA[i] = rhsA[i]! - work[i]! * rhsA[i + 1]!;
    rhsB[i] = rhsB[i]! - work[i]! * rhsB[i + 1]!;
  }
  return true;
}
