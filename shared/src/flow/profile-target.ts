import type { TargetProfile } from '../uploads/profile-csv';
import type { TargetGeometry } from './target-geometry';

/**
 * A tabulated target (numerics.md §1, target kind `profile`): cubic splines of the
 * uploaded f(h) and z(h) on their knots h₀ = 0 < … < h_n = π, with the end
 * conditions a smooth surface of revolution imposes at its poles, where it crosses
 * the axis at a right angle:
 *   f is odd about each pole (f ≈ f'(0)·h), so f'' = 0 there: a natural spline;
 *   z is even about each pole, so z' = 0 there: a clamped spline with zero slopes.
 * With these ends the splines are fourth-order accurate in f and z and third-order
 * in f', z' (de Boor, A Practical Guide to Splines, 1978, ch. IV–V), and their odd
 * (f) / even (z) reflections about the poles are C², which is how the target is
 * read outside [0, π] (angles a ball run with |α| > π reaches): the 2π-periodic
 * extension f(−h) = −f(h), z(−h) = z(h).
 *
 * The operator needs P = ρ² = f'² + z'², Q = f² and their derivatives:
 *   P' = 2(f'f'' + z'z''), P'' = 2(f''² + f'f''' + z''² + z'z'''), Q' = 2ff', Q'' = 2(f'² + ff'').
 * Everything is a pure function of the knots (interval by binary search, never a
 * cached index), so a run rebuilt from its checkpoint's knots continues bit for bit.
 */
export class ProfileTarget implements TargetGeometry {
  readonly kind = 'profile' as const;
  readonly reflectionSymmetric: boolean;
  readonly equatorRho: number;
  /** The knots as used (f set to exactly 0 at the poles, symmetrised when the table is symmetric). */
  readonly knotsH: Float64Array;
  readonly knotsF: Float64Array;
  readonly knotsZ: Float64Array;
  /** Spline second derivatives (moments) at the knots. */
  private readonly mf: Float64Array;
  private readonly mz: Float64Array;
  private readonly d = new Float64Array(8);

  /**
   * Builds the splines from knots. Throws a clear error for tables that are not a
   * target profile (see `parseTargetProfileCsv`, which the API applied already).
   */
  constructor(h: ArrayLike<number>, f: ArrayLike<number>, z: ArrayLike<number>, exactKnots = false) {
    const n = h.length - 1;
    if (n < 2 || f.length !== h.length || z.length !== h.length) {
      throw new Error('target profile: h, f and z must have the same length, at least 3 rows');
    }
    for (let i = 0; i <= n; i++) {
      if (!(Number.isFinite(h[i]!) && Number.isFinite(f[i]!) && Number.isFinite(z[i]!))) {
        throw new Error(`target profile: row ${i + 1} is not finite`);
      }
      if (i > 0 && !(h[i]! > h[i - 1]!)) throw new Error(`target profile: h must increase strictly (row ${i + 1})`);
      if (i > 0 && i < n && !(f[i]! > 0)) throw new Error(`target profile: f must be positive between the poles (row ${i + 1})`);
    }
    if (Math.abs(h[0]!) > 1e-9 || Math.abs(h[n]! - Math.PI) > 1e-9) {
      throw new Error(`target profile: h must run from 0 to π (found ${h[0]} to ${h[n]})`);
    }
    if (Math.abs(f[0]!) > 1e-9 || Math.abs(f[n]!) > 1e-9) {
      throw new Error(`target profile: f must be 0 at both poles (found ${f[0]} and ${f[n]})`);
    }
    this.knotsH = Float64Array.from(h);
    this.knotsF = Float64Array.from(f);
    this.knotsZ = Float64Array.from(z);
    this.knotsH[0] = 0;
    this.knotsH[n] = Math.PI;
    this.knotsF[0] = 0;
    this.knotsF[n] = 0;
    // Knots read back from a checkpoint are used as stored (symmetrising is not idempotent in floating point).
    this.reflectionSymmetric = exactKnots ? isSymmetric(this.knotsH, this.knotsF, this.knotsZ) : symmetrise(this.knotsH, this.knotsF, this.knotsZ);
    this.mf = splineMoments(this.knotsH, this.knotsF, null);
    this.mz = splineMoments(this.knotsH, this.knotsZ, 0);
    this.equatorRho = Math.sqrt(this.rhoSquared(Math.PI / 2));
  }

  /** The spline of an uploaded, parsed target table. */
  static fromTable(profile: TargetProfile): ProfileTarget {
    return new ProfileTarget(profile.h, profile.f, profile.z);
  }

  /** The spline of knots exactly as stored in a checkpoint (see {@link ProfileTarget.knotsH}). */
  static fromKnots(h: Float64Array, f: Float64Array, z: Float64Array): ProfileTarget {
    return new ProfileTarget(h, f, z, true);
  }

  /**
   * Writes [f, f', f'', f''', z, z', z'', z'''] at h into this.d; returns the sign of
   * the reflection used (+1 inside [0, π], −1 when h was reflected about a pole).
   */
  private splines(h: number): number {
    const twoPi = 2 * Math.PI;
    let x = h;
    let sign = 1;
    if (x < 0 || x > Math.PI) {
      x = h - twoPi * Math.floor(h / twoPi);
      if (x > Math.PI) {
        x = twoPi - x;
        sign = -1;
      }
    }
    const k = this.knotsH;
    let lo = 0;
    let hi = k.length - 2;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (k[mid]! <= x) lo = mid;
      else hi = mid - 1;
    }
    const i = lo;
    const w = k[i + 1]! - k[i]!;
    const A = (k[i + 1]! - x) / w;
    const B = (x - k[i]!) / w;
    const d = this.d;
    evalSpline(this.knotsF, this.mf, i, w, A, B, d, 0);
    evalSpline(this.knotsZ, this.mz, i, w, A, B, d, 4);
    if (sign < 0) {
      // h ↦ 2π − h (or −h): f odd, z even about the pole.
      d[0] = -d[0]!;
      d[2] = -d[2]!;
      d[5] = -d[5]!;
      d[7] = -d[7]!;
    }
    return sign;
  }

  evaluate(h: number, out: Float64Array): void {
    this.splines(h);
    const d = this.d;
    const f = d[0]!;
    const f1 = d[1]!;
    const f2 = d[2]!;
    const f3 = d[3]!;
    const z1 = d[5]!;
    const z2 = d[6]!;
    const z3 = d[7]!;
    out[0] = f1 * f1 + z1 * z1;
    out[1] = 2 * (f1 * f2 + z1 * z2);
    out[2] = 2 * (f2 * f2 + f1 * f3 + z2 * z2 + z1 * z3);
    out[3] = f * f;
    out[4] = 2 * f * f1;
    out[5] = 2 * (f1 * f1 + f * f2);
  }

  rhoSquared(h: number): number {
    this.splines(h);
    const d = this.d;
    return d[1]! * d[1]! + d[5]! * d[5]!;
  }

  rhoSquaredPrime(h: number): number {
    this.splines(h);
    const d = this.d;
    return 2 * (d[1]! * d[2]! + d[5]! * d[6]!);
  }

  f(h: number): number {
    this.splines(h);
    return this.d[0]!;
  }

  z(h: number): number {
    this.splines(h);
    return this.d[4]!;
  }
}

/** Value and first three derivatives of the cubic spline on knot interval i into out[o..o+3]. */
function evalSpline(y: Float64Array, M: Float64Array, i: number, w: number, A: number, B: number, out: Float64Array, o: number): void {
  const mi = M[i]!;
  const mj = M[i + 1]!;
  const yi = y[i]!;
  const yj = y[i + 1]!;
  out[o] = A * yi + B * yj + ((A * A * A - A) * mi + (B * B * B - B) * mj) * (w * w) / 6;
  out[o + 1] = (yj - yi) / w - ((3 * A * A - 1) * w * mi) / 6 + ((3 * B * B - 1) * w * mj) / 6;
  out[o + 2] = A * mi + B * mj;
  out[o + 3] = (mj - mi) / w;
}

/**
 * Second derivatives of the interpolating cubic spline: natural ends (M = 0) when
 * `endSlope` is null, otherwise clamped with that slope at both ends. Thomas algorithm.
 */
function splineMoments(x: Float64Array, y: Float64Array, endSlope: number | null): Float64Array {
  const n = x.length - 1;
  const sub = new Float64Array(n + 1);
  const diag = new Float64Array(n + 1);
  const sup = new Float64Array(n + 1);
  const rhs = new Float64Array(n + 1);
  for (let i = 1; i < n; i++) {
    const w0 = x[i]! - x[i - 1]!;
    const w1 = x[i + 1]! - x[i]!;
    sub[i] = w0 / 6;
    diag[i] = (w0 + w1) / 3;
    sup[i] = w1 / 6;
    rhs[i] = (y[i + 1]! - y[i]!) / w1 - (y[i]! - y[i - 1]!) / w0;
  }
  if (endSlope === null) {
    diag[0] = 1;
    diag[n] = 1;
  } else {
    const w0 = x[1]! - x[0]!;
    const wn = x[n]! - x[n - 1]!;
    diag[0] = w0 / 3;
    sup[0] = w0 / 6;
    rhs[0] = (y[1]! - y[0]!) / w0 - endSlope;
    sub[n] = wn / 6;
    diag[n] = wn / 3;
    rhs[n] = endSlope - (y[n]! - y[n - 1]!) / wn;
  }
  for (let i = 1; i <= n; i++) {
    const q = sub[i]! / diag[i - 1]!;
    diag[i] = diag[i]! - q * sup[i - 1]!;
    rhs[i] = rhs[i]! - q * rhs[i - 1]!;
  }
  const M = new Float64Array(n + 1);
  M[n] = rhs[n]! / diag[n]!;
  for (let i = n - 1; i >= 0; i--) M[i] = (rhs[i]! - sup[i]! * M[i + 1]!) / diag[i]!;
  return M;
}

/** Relative tolerance within which a table counts as reflection-symmetric (and is made exactly so). */
export const PROFILE_SYMMETRY_TOLERANCE = 1e-9;

/**
 * Whether the knots satisfy h_{n−i} = π − h_i, f_{n−i} = f_i, z_{n−i} = z₀ + z_n − z_i
 * (the reflection class of numerics.md; z is determined up to a constant) within
 * {@link PROFILE_SYMMETRY_TOLERANCE}. If so, the knots are replaced by their
 * symmetric averages, so the splines are exactly symmetric and the half-domain
 * solve of `symmetry: auto` is exact for them.
 */
function isSymmetric(h: Float64Array, f: Float64Array, z: Float64Array): boolean {
  const n = h.length - 1;
  const zs = z[0]! + z[n]!;
  let scale = 0;
  for (let i = 0; i <= n; i++) scale = Math.max(scale, Math.abs(f[i]!), Math.abs(z[i]! - 0.5 * zs));
  const tol = PROFILE_SYMMETRY_TOLERANCE * Math.max(1, scale);
  for (let i = 0; i <= n; i++) {
    const j = n - i;
    if (Math.abs(h[j]! - (Math.PI - h[i]!)) > PROFILE_SYMMETRY_TOLERANCE * Math.PI) return false;
    if (Math.abs(f[j]! - f[i]!) > tol || Math.abs(z[j]! - (zs - z[i]!)) > tol) return false;
  }
  return true;
}

function symmetrise(h: Float64Array, f: Float64Array, z: Float64Array): boolean {
  if (!isSymmetric(h, f, z)) return false;
  const n = h.length - 1;
  for (let i = 0; 2 * i < n; i++) {
    const j = n - i;
    const hi = 0.5 * (h[i]! + (Math.PI - h[j]!));
    const fi = 0.5 * (f[i]! + f[j]!);
    const zi = 0.5 * (z[i]! - z[j]!);
    h[i] = hi;
    h[j] = Math.PI - hi;
    f[i] = fi;
    f[j] = fi;
    z[i] = zi;
    z[j] = -zi;
  }
  if (n % 2 === 0) {
    h[n / 2] = Math.PI / 2;
    z[n / 2] = 0;
  }
  h[0] = 0;
  h[n] = Math.PI;
  return true;
}
