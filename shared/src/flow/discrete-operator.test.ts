import { describe, expect, it } from 'vitest';
import { parseRunSpec } from '../spec';
import { createFlowRun, advanceFlowRun, refreshDiagnostics } from './flow-run';
import { unitSphereArea } from './flow-model';
import { dilationProfileOfRun } from './dilation-profile';

/** F(s) = 12π² s/(1+s)² for the identity of S³ (derived, numerics.md §4.3). */
function identityS3DilationEnergy(s: number): number {
  return (12 * Math.PI * Math.PI * s) / ((1 + s) * (1 + s));
}

function sphereIdentity(points: number, symmetry: 'auto' | 'none' = 'auto') {
  return createFlowRun(
    parseRunSpec({
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      symmetry,
      grid: { points },
      time: { tMax: 1 },
    }),
  );
}

// 10-point Gauss–Legendre nodes and weights on [0, 1] (classical tables, from memory;
// checked below by integrating polynomials exactly).
const GL_X = [
  -0.9739065285171717, -0.8650633666889845, -0.6794095682990244, -0.4333953941292472, -0.1488743389816312,
  0.1488743389816312, 0.4333953941292472, 0.6794095682990244, 0.8650633666889845, 0.9739065285171717,
];
const GL_W = [
  0.0666713443086881, 0.1494513491505806, 0.219086362515982, 0.2692667193099963, 0.2955242247147529,
  0.2955242247147529, 0.2692667193099963, 0.219086362515982, 0.1494513491505806, 0.0666713443086881,
];

describe('discrete energy (numerics.md §1, §2)', () => {
  it('unit sphere areas: |S^1| = 2π, |S^2| = 4π, |S^3| = 2π²', () => {
    // Source: classical formulas for the area of the unit sphere.
    expect(unitSphereArea(1)).toBeCloseTo(2 * Math.PI, 14);
    expect(unitSphereArea(2)).toBeCloseTo(4 * Math.PI, 14);
    expect(unitSphereArea(3)).toBeCloseTo(2 * Math.PI * Math.PI, 13);
  });

  it('energy of the identity of S^3 is 3π², second order in the grid', () => {
    // Source: energy of the identity of S^m is (m/2)|S^m|, = 3π² for m = 3 — classical; numerics.md §4.1.
    const exact = 3 * Math.PI * Math.PI;
    const errors = [100, 199, 397].map((n) => Math.abs(sphereIdentity(n).energy - exact));
    expect(errors[2]! / exact).toBeLessThan(1e-5);
    // Doubling the cells (nested grids) divides the error by about four (numerics.md §4.9).
    const r1 = errors[0]! / errors[1]!;
    const r2 = errors[1]! / errors[2]!;
    expect(r1).toBeGreaterThan(3.5);
    expect(r1).toBeLessThan(4.5);
    expect(r2).toBeGreaterThan(3.5);
    expect(r2).toBeLessThan(4.5);
    // With symmetry "none" the whole sphere gives the same value.
    expect(Math.abs(sphereIdentity(400, 'none').energy - exact) / exact).toBeLessThan(1e-5);
  });

  it('Möbius energy profile of the identity of S³: F(s) = 12π² s/(1+s)²', () => {
    // Source: F(s) = 6π ∫ sin²(γ_s) dr = 12π² s/(1+s)² for the identity of S³ (derived, numerics.md §4.3).
    for (const s of [0.5, 2, 0.2]) {
      const run = createFlowRun(
        parseRunSpec({
          domain: { kind: 'sphere', dim: 3 },
          target: { kind: 'sphere' },
          initial: { kind: 'dilated', s },
          grid: { points: 400 },
          time: { tMax: 1 },
        }),
      );
      const exact = identityS3DilationEnergy(s);
      expect(Math.abs(run.energy - exact) / exact).toBeLessThan(1e-4);
    }
  });

  it('Möbius energy profile of the identity state: dilationProfileOfRun matches 12π² s/(1+s)², and F → 0 as s → 0', () => {
    // Source: F(s) = 12π² s/(1+s)² for the identity of S³ (derived, numerics.md §4.3); F → 0 as s → 0 for m ≥ 3
    // (Eells & Sampson, Amer. J. Math. 86, 1964; numerics.md §4.3). The state is the half-domain (reflection) run, mirrored.
    const run = sphereIdentity(400);
    const sValues = [0.1, 0.5, 2, 10];
    const F = dilationProfileOfRun(run, sValues);
    for (const [s, f] of F) expect(Math.abs(f - identityS3DilationEnergy(s)) / identityS3DilationEnergy(s)).toBeLessThan(1e-4);
    const small = dilationProfileOfRun(run, [1e-1, 1e-2, 1e-3]).map(([, f]) => f);
    expect(small[1]!).toBeLessThan(small[0]!);
    expect(small[2]!).toBeLessThan(small[1]!);
    expect(small[2]! / (3 * Math.PI * Math.PI)).toBeLessThan(0.01);
    console.info(`identity of S³: F(1e-1, 1e-2, 1e-3) = ${small.map((f) => f.toPrecision(5)).join(', ')}`);
  });

  it('m = 2: γ_s on S² (2·arctan(r/λ) on the plane) is stationary with energy 4π', () => {
    // Source: degree-one harmonic maps S² → S² have energy 4π = area of S² — classical;
    // D is conformally invariant for m = 2, so every dilation γ_s is harmonic (numerics.md §4.2, §4.3).
    for (const s of [1, 0.3]) {
      const run = createFlowRun(
        parseRunSpec({
          domain: { kind: 'sphere', dim: 2 },
          target: { kind: 'sphere' },
          initial: { kind: 'dilated', s },
          grid: { points: 400 },
          time: { tMax: 0.5 },
          stop: { tension: 1e-14 },
        }),
      );
      expect(Math.abs(run.energy - 4 * Math.PI)).toBeLessThan(1e-3);
      expect(run.tension).toBeLessThan(1e-2);
      const e0 = run.energy;
      const h0 = run.h.slice();
      advanceFlowRun(run);
      let drift = 0;
      for (let i = 0; i < h0.length; i++) drift = Math.max(drift, Math.abs(run.h[i]! - h0[i]!));
      expect(drift).toBeLessThan(1e-3); // stays put: stationary up to the grid error
      expect(Math.abs(run.energy - e0)).toBeLessThan(1e-4);
    }
  });

  it('ball B²: h = 2·arctan(r/λ) is stationary with energy 2π(1 − cos α), α = 2·arctan(1/λ)', () => {
    // Source: 2·arctan(r/λ) is harmonic on the plane — classical; energy 2π(1 − cos α) derived, numerics.md §4.2, §4.4.
    const lambda = 0.2;
    const alpha = 2 * Math.atan(1 / lambda);
    const run = createFlowRun(
      parseRunSpec({
        domain: { kind: 'ball', dim: 2, boundaryAngle: alpha },
        target: { kind: 'sphere' },
        initial: { kind: 'identity' },
        grid: { points: 400 },
        time: { tMax: 0.2 },
        stop: { tension: 1e-14 },
      }),
    );
    for (let i = 0; i < run.r.length; i++) run.h[i] = 2 * Math.atan(run.r[i]! / lambda);
    refreshDiagnostics(run);
    const exact = 2 * Math.PI * (1 - Math.cos(alpha));
    expect(Math.abs(run.energy - exact) / exact).toBeLessThan(1e-4);
    const tension400 = run.tension;
    expect(tension400).toBeLessThan(0.05);
    const h0 = run.h.slice();
    advanceFlowRun(run);
    let drift = 0;
    for (let i = 0; i < h0.length; i++) drift = Math.max(drift, Math.abs(run.h[i]! - h0[i]!));
    expect(drift).toBeLessThan(1e-3);
  });

  it('the flow is exactly the gradient of the discrete energy: per-step identity to round-off', () => {
    // Source: the variational scheme of numerics.md §2 — D_h(h₁) − D_h(h₀) = ∫₀¹ ∇D_h(h₀ + θΔh)·Δh dθ,
    // with ∇D_h = −M τ_h; the integrand is analytic in θ, so 10-point Gauss–Legendre is exact to round-off.
    // The rule integrates x^(2k) on [0, 1] exactly up to degree 19.
    for (let k = 0; k <= 9; k++) {
      let q = 0;
      for (let j = 0; j < 10; j++) q += 0.5 * GL_W[j]! * Math.pow(0.5 * (GL_X[j]! + 1), 2 * k);
      expect(Math.abs(q - 1 / (2 * k + 1))).toBeLessThan(1e-14);
    }
    const run = createFlowRun(
      parseRunSpec({
        domain: { kind: 'ball', dim: 3, boundaryAngle: 2 * Math.PI },
        target: { kind: 'sphere' },
        initial: { kind: 'identity' },
        grid: { points: 120 },
        time: { tMax: 1 },
        stop: { gradientBound: 1e4 },
      }),
    );
    const ell = createFlowRun(
      parseRunSpec({
        domain: { kind: 'sphere', dim: 4 },
        target: { kind: 'ellipsoid', axisRatio: 2 },
        initial: { kind: 'perturbed', amplitude: 0.4, mode: 3 },
        grid: { points: 150 },
        time: { tMax: 1 },
      }),
    );
    for (const r of [run, ell]) {
      for (let step = 0; step < 30; step++) {
        const before = r.h.slice();
        const e0 = r.energy;
        advanceFlowRun(r, { maxSteps: 1 });
        if (r.r.length !== before.length) continue; // a regrid changed the grid: skip that step
        const after = r.h;
        const grad = new Float64Array(after.length);
        const point = new Float64Array(after.length);
        let integral = 0;
        for (let q = 0; q < 10; q++) {
          const th = 0.5 * (GL_X[q]! + 1);
          for (let i = 0; i < point.length; i++) point[i] = before[i]! + th * (after[i]! - before[i]!);
          r.op.assemble(point, grad, null, null);
          let dot = 0;
          for (let i = 1; i < point.length - 1; i++) dot += grad[i]! * (after[i]! - before[i]!);
          integral += 0.5 * GL_W[q]! * dot;
        }
        const dD = r.energy - e0;
        const predicted = r.model.energyFactor * integral;
        expect(Math.abs(dD - predicted)).toBeLessThan(1e-12 * Math.max(1, Math.abs(e0)));
      }
    }
  });

  it('dD_h/dt = −‖τ‖_h² exactly in the semi-discrete flow (directional derivative along τ)', () => {
    // Source: energy identity dD/dt = −‖τ‖², numerics.md §1 and §4.7, in its discrete form.
    const run = createFlowRun(
      parseRunSpec({
        domain: { kind: 'sphere', dim: 3 },
        target: { kind: 'ellipsoid', axisRatio: 1.5 },
        initial: { kind: 'perturbed', amplitude: 0.3, mode: 1 },
        grid: { points: 200 },
        time: { tMax: 1 },
      }),
    );
    const eps = 1e-6;
    const plus = run.h.slice();
    const minus = run.h.slice();
    for (let i = 0; i < plus.length; i++) {
      plus[i] = plus[i]! + eps * run.tau[i]!;
      minus[i] = minus[i]! - eps * run.tau[i]!;
    }
    const f = run.model.energyFactor;
    const slope = (f * (run.op.energy(plus) - run.op.energy(minus))) / (2 * eps);
    // Central difference: error O(eps²) relative, far below the grid error.
    expect(Math.abs(slope + run.tension * run.tension) / (run.tension * run.tension)).toBeLessThan(1e-8);
  });

  it('the tridiagonal Hessian is the derivative of the gradient (finite differences)', () => {
    // Source: internal consistency of Newton's Jacobian (no outside value).
    const run = createFlowRun(
      parseRunSpec({
        domain: { kind: 'sphere', dim: 5 },
        target: { kind: 'ellipsoid', axisRatio: 3 },
        initial: { kind: 'perturbed', amplitude: 0.5, mode: 1 },
        grid: { points: 60 },
        time: { tMax: 1 },
      }),
    );
    const n = run.h.length;
    const g0 = new Float64Array(n);
    const g1 = new Float64Array(n);
    const g2 = new Float64Array(n);
    const diag = new Float64Array(n);
    const upper = new Float64Array(n);
    run.op.assemble(run.h, g0, diag, upper);
    const eps = 1e-6;
    for (const j of [1, 7, 30, n - 2]) {
      const hp = run.h.slice();
      const hm = run.h.slice();
      hp[j] = hp[j]! + eps;
      hm[j] = hm[j]! - eps;
      run.op.assemble(hp, g1, null, null);
      run.op.assemble(hm, g2, null, null);
      const dj = (g1[j]! - g2[j]!) / (2 * eps);
      const dn = (g1[j + 1]! - g2[j + 1]!) / (2 * eps);
      expect(Math.abs(dj - diag[j]!)).toBeLessThan(1e-6 * Math.max(1, Math.abs(diag[j]!)));
      expect(Math.abs(dn - upper[j]!)).toBeLessThan(1e-6 * Math.max(1, Math.abs(upper[j]!)));
    }
  });
});
