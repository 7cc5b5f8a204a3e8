import type { DiscreteOperator } from './discrete-operator';
import { dilate } from './initial-data';
import { remapMonotone } from './monotone-remap';

/**
 * Möbius dilations of the sphere domain (numerics.md §1, "Möbius dilations and the
 * normalized flow"): tan(γ_s(r)/2) = s·tan(r/2), the center X of a map, re-centring
 * of initial data and the Möbius energy profile F(s) = D(h∘γ_s).
 *
 * Everything is evaluated with the discrete energy and center of the operator
 * (DiscreteOperator.energy / .center), on a whole-sphere grid: h∘γ_s is sampled at
 * the grid nodes (exactly for closed-form data, by monotone Steffen interpolation
 * for a tabulated state) and the discrete functionals are applied to it.
 */

/** γ_s⁻¹ = γ_{1/s}: tan(r/2) = s·tan(γ_s(r)/2). Exact inverse of `dilate(s, ·)` up to round-off. */
export function undilate(s: number, r: number): number {
  return dilate(1 / s, r);
}

/**
 * A map to be composed with dilations: evaluates h at sorted points of [0, π] into
 * `out` (batch form, so a tabulated profile is interpolated in one sweep).
 */
export type DilationSource = (points: Float64Array, out: Float64Array) => void;

/** A closed-form h(r) as a {@link DilationSource}. */
export function functionSource(h: (r: number) => number): DilationSource {
  return (points, out) => {
    for (let i = 0; i < points.length; i++) out[i] = h(points[i]!);
  };
}

/** A whole-sphere profile (r from 0 to π) as a {@link DilationSource}: monotone Steffen interpolation (monotone-remap.ts). */
export function profileSource(profile: { r: Float64Array; h: Float64Array }): DilationSource {
  return (points, out) => remapMonotone(profile.r, profile.h, points, out);
}

/**
 * (h∘γ_s)(r_i) into `out` on a whole-sphere grid r (r_0 = 0, r_N = π), with the
 * degree-one end values h(0) = 0, h(π) = π imposed exactly. `scratch` has r's length.
 */
export function composeDilation(
  source: DilationSource,
  s: number,
  r: Float64Array,
  out: Float64Array,
  scratch: Float64Array,
): void {
  const n = r.length - 1;
  for (let i = 0; i <= n; i++) scratch[i] = dilate(s, r[i]!);
  scratch[0] = 0;
  scratch[n] = Math.PI;
  source(scratch, out);
  out[0] = 0;
  out[n] = Math.PI;
}

/** Error for initial data that no dilation centres (X(h₀∘γ_s) keeps one sign). */
export class RecentreError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'RecentreError';
  }
}

/** What re-centring did (the summary's `recentre` object). */
export interface RecentreResult {
  /** The dilation s with X(h₀∘γ_s) = 0 (1 when X(h₀) is already 0). */
  s: number;
  centerBefore: number;
  centerAfter: number;
  energyBefore: number;
  energyAfter: number;
  /** Evaluations of X used by bracketing and Brent's method. */
  evaluations: number;
}

/** Options of {@link recentreOnGrid}. */
export interface RecentreOptions {
  /** Smallest and largest s searched for a bracket (default 1e-6 and 1e6). */
  sMin?: number;
  sMax?: number;
}

/**
 * Re-centring (numerics.md §1): finds s with X(h₀∘γ_s) = 0 on the whole-sphere grid
 * of `op` (discrete center, so X_h of the result vanishes to round-off), leaving
 * h₀∘γ_s in `out`. Safeguarded 1-D root find: a bracket by doubling/halving s from 1
 * (X grows with s: γ_s, s > 1, moves the map's features toward r = 0 where cos r > 0;
 * both directions are tried), then Brent's method (R. P. Brent, Algorithms for
 * Minimization without Derivatives, 1973, ch. 4) in s. Throws {@link RecentreError}
 * when X keeps one sign over [sMin, sMax]. `area` is |S^(m−1)| (for the reported values).
 */
export function recentreOnGrid(
  op: DiscreteOperator,
  source: DilationSource,
  out: Float64Array,
  area: number,
  opts: RecentreOptions = {},
): RecentreResult {
  const sMin = opts.sMin ?? 1e-6;
  const sMax = opts.sMax ?? 1e6;
  const r = op.r;
  const scratch = new Float64Array(r.length);
  let evaluations = 0;
  const X = (s: number): number => {
    evaluations++;
    composeDilation(source, s, r, out, scratch);
    return op.center(out);
  };
  const x1 = X(1);
  const energyBefore = area * op.energy(out);
  const centerBefore = area * x1;
  if (!Number.isFinite(x1)) throw new RecentreError('cannot re-centre: the center X of the initial data is not finite');
  const done = (s: number): RecentreResult => {
    const xs = X(s);
    return { s, centerBefore, centerAfter: area * xs, energyBefore, energyAfter: area * op.energy(out), evaluations };
  };
  if (x1 === 0) return done(1);
  // Bracket: step from s = 1 in the direction that should change the sign of X, then the other.
  let a = 1;
  let fa = x1;
  let b = NaN;
  let fb = NaN;
  for (const factor of x1 > 0 ? [0.5, 2] : [2, 0.5]) {
    let lo = 1;
    let flo = x1;
    for (let s = factor; s >= sMin && s <= sMax; s *= factor) {
      const fs = X(s);
      if (!Number.isFinite(fs)) break;
      if (fs === 0) return done(s);
      if (Math.sign(fs) !== Math.sign(flo)) {
        a = lo;
        fa = flo;
        b = s;
        fb = fs;
        break;
      }
      lo = s;
      flo = fs;
    }
    if (Number.isFinite(b)) break;
  }
  if (!Number.isFinite(b)) {
    throw new RecentreError(
      `cannot re-centre: X(h₀∘γ_s) keeps the sign of X(h₀) = ${centerBefore.toExponential(3)} for s in [${sMin}, ${sMax}], so no dilation centres these data`,
    );
  }
  const s = brentRoot(X, a, b, fa, fb);
  return done(s);
}

/**
 * Brent's root finder (zeroin; Brent 1973, ch. 4) on a sign-changing bracket [a, b]
 * with f(a) = fa, f(b) = fb: inverse quadratic / secant steps safeguarded by
 * bisection, to the floating-point resolution of the root (tolerance 2ε|x|).
 */
export function brentRoot(f: (x: number) => number, a0: number, b0: number, fa0: number, fb0: number): number {
  let a = a0;
  let b = b0;
  let fa = fa0;
  let fb = fb0;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < 200; iter++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 1e-300;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      let p: number;
      let q: number;
      const s = fb / fa;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const rr = fb / fc;
        p = s * (2 * m * qq * (qq - rr) - (b - a) * (rr - 1));
        q = (qq - 1) * (rr - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

/**
 * Möbius energy profile F(s) = D_h(h∘γ_s) (numerics.md §1) for each s of `sValues`,
 * on the whole-sphere grid of `op`; `factor` is |S^(m−1)|.
 */
export function dilationEnergies(
  op: DiscreteOperator,
  source: DilationSource,
  sValues: readonly number[],
  factor: number,
): number[] {
  const r = op.r;
  const h = new Float64Array(r.length);
  const scratch = new Float64Array(r.length);
  return sValues.map((s) => {
    composeDilation(source, s, r, h, scratch);
    return factor * op.energy(h);
  });
}

/** The energy profile on a log grid, its maximiser s* and the gap F(s*) − F(1). */
export interface DilationProfileMaximum {
  /** [s, F(s)] on the log grid. */
  samples: [number, number][];
  sStar: number;
  energyAtMax: number;
  energyAtOne: number;
  /** F(s*) − F(1) ≥ 0. */
  gap: number;
}

/** Options of {@link dilationProfileMaximum}. */
export interface DilationProfileOptions {
  /** Log grid from sMin to sMax (defaults 1e-2 and 1e2), `perDecade` points per decade (default 8). */
  sMin?: number;
  sMax?: number;
  perDecade?: number;
}

/**
 * F on a log grid of s, then the maximiser refined by golden-section search in ln s
 * (Kiefer 1953) between the neighbours of the best grid point, to ≈1e-8 in ln s.
 * s = 1 is always a grid point, so gap ≥ 0 exactly.
 */
export function dilationProfileMaximum(
  op: DiscreteOperator,
  source: DilationSource,
  factor: number,
  opts: DilationProfileOptions = {},
): DilationProfileMaximum {
  const sMin = opts.sMin ?? 1e-2;
  const sMax = opts.sMax ?? 1e2;
  const perDecade = opts.perDecade ?? 8;
  const lo = Math.floor(Math.log10(sMin) * perDecade);
  const hi = Math.ceil(Math.log10(sMax) * perDecade);
  const sValues: number[] = [];
  for (let k = lo; k <= hi; k++) sValues.push(k === 0 ? 1 : Math.pow(10, k / perDecade));
  const F = dilationEnergies(op, source, sValues, factor);
  let best = 0;
  for (let k = 1; k < F.length; k++) if (F[k]! > F[best]!) best = k;
  const energyAtOne = F[-lo]!;
  let sStar = sValues[best]!;
  let energyAtMax = F[best]!;
  if (best > 0 && best < F.length - 1) {
    const f = (x: number) => dilationEnergies(op, source, [Math.exp(x)], factor)[0]!;
    let a = Math.log(sValues[best - 1]!);
    let b = Math.log(sValues[best + 1]!);
    const g = (Math.sqrt(5) - 1) / 2;
    let x1 = b - g * (b - a);
    let x2 = a + g * (b - a);
    let f1 = f(x1);
    let f2 = f(x2);
    while (b - a > 1e-8) {
      if (f1 >= f2) {
        b = x2;
        x2 = x1;
        f2 = f1;
        x1 = b - g * (b - a);
        f1 = f(x1);
      } else {
        a = x1;
        x1 = x2;
        f1 = f2;
        x2 = a + g * (b - a);
        f2 = f(x2);
      }
    }
    const x = f1 >= f2 ? x1 : x2;
    const fx = Math.max(f1, f2);
    if (fx > energyAtMax) {
      sStar = Math.exp(x);
      energyAtMax = fx;
    }
  }
  return {
    samples: sValues.map((s, k) => [s, F[k]!] as [number, number]),
    sStar,
    energyAtMax,
    energyAtOne,
    gap: energyAtMax - energyAtOne,
  };
}
