import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import { advanceFlowRun, createFlowRun, runDiagnostics, type FlowRun } from './flow-run';
import { summarizeFlowRun, blowupEstimate } from './flow-summary';

function run(spec: RunSpecInput): FlowRun {
  const r = createFlowRun(parseRunSpec(spec));
  advanceFlowRun(r);
  return r;
}

function ball(dim: number, alpha: number, points: number, gradientBound: number, tension = 1e-8): RunSpecInput {
  return {
    domain: { kind: 'ball', dim, boundaryAngle: alpha },
    target: { kind: 'sphere' },
    initial: { kind: 'identity' },
    grid: { points },
    time: { tMax: 50, maxStep: 1 },
    stop: { tension, gradientBound },
  };
}

describe('outcomes on the ball (numerics.md §3, §4.4, §4.5)', () => {
  it('B² → S², h₀ = 0.9π·r converges to the harmonic map with energy 2π(1 − cos α)', () => {
    // Source: global existence and convergence for |h₀| ≤ π (Chang & Ding, 1991); steady energy
    // 2π(1 − cos α) derived — numerics.md §4.4.
    const alpha = 0.9 * Math.PI;
    const s = summarizeFlowRun(run(ball(2, alpha, 200, 1e8)));
    expect(s.outcome).toBe('converged');
    expect(s.blowup).toBeNull();
    const exact = 2 * Math.PI * (1 - Math.cos(alpha));
    expect(Math.abs(s.energyFinal - exact) / exact).toBeLessThan(2e-4);
  });

  for (const factor of [1.1, 1.5]) {
    it(`B² → S², h₀ = ${factor}π·r blows up in finite time, faster than self-similar`, () => {
      // Source: finite-time blow-up for α > π (Chang, Ding & Ye, J. Differential Geom. 36, 1992); no type I
      // blow-up in two dimensions, local exponent a little above 1 (Raphaël & Schweyer, arXiv:1301.1859) — numerics.md §4.4, §4.5.
      const r = run(ball(2, factor * Math.PI, 200, 1e5));
      const s = summarizeFlowRun(r);
      expect(s.outcome).toBe('blowup');
      expect(s.blowup).not.toBeNull();
      expect(s.blowup!.kind).toBe('type-II');
      expect(s.blowup!.exponent!).toBeGreaterThan(0.9);
      expect(s.blowup!.exponent!).toBeLessThan(1.6);
      expect(s.blowup!.T!).toBeGreaterThan(s.tFinal);
      // The singularity forms at the pole r = 0.
      expect(runDiagnostics(r).gradMaxAt).toBeLessThan(1e-3);
      // One bubble of energy (4π, the area of S², numerics.md §4.2) is concentrating at the pole: the energy
      // cannot fall below 4π plus the least energy of a map from h = π (bubble's end) to h(1) = α, which is
      // 2π(1 − cos(α − π)) (§4.4 with h ↦ h − π, derived); and it is already below the initial energy.
      const outside = 2 * Math.PI * (1 - Math.cos(factor * Math.PI - Math.PI));
      expect(s.energyFinal).toBeGreaterThan(4 * Math.PI + outside - 1e-2);
      expect(s.energyFinal).toBeLessThan(s.energyInitial);
      // The evidence names the bubble energy: the area of S², 4π (numerics.md §4.2).
      expect(blowupEstimate(r).evidence.bubbleEnergy!).toBeCloseTo(4 * Math.PI, 10);
      console.info(`B2 α=${factor}π: p = ${s.blowup!.exponent}, T = ${s.blowup!.T}, E = ${s.energyFinal} vs 4π + ${outside}`);
    });
  }

  it('B³ → S³, h₀ = 2π·r blows up with the self-similar exponent ½ (type I)', () => {
    // Source: type I blow-up max|∇u| ~ C (T − t)^(−1/2) for 3 ≤ m ≤ 6 (Fan, Sci. China Ser. A 42, 1999;
    // Biernat & Bizoń, Nonlinearity 24, 2011) — numerics.md §4.5.
    const r = run(ball(3, 2 * Math.PI, 200, 1e10));
    const s = summarizeFlowRun(r);
    expect(s.outcome).toBe('blowup');
    expect(s.blowup!.kind).toBe('type-I');
    expect(Math.abs(s.blowup!.exponent! - 0.5)).toBeLessThan(0.005);
    expect(s.blowup!.confidence).toBeGreaterThan(0.8);
    // λ followed over many decades with a bounded number of points.
    expect(s.gradMaxFinal).toBeGreaterThanOrEqual(1e10);
    expect(s.gridPoints).toBeLessThan(2000);
    console.info(`B3 type I: p = ${s.blowup!.exponent} ± ${s.blowup!.exponentUncertainty}, T = ${s.blowup!.T}, N = ${s.gridPoints}, steps = ${s.steps}`);
  });

  it('energy identity dD/dt = −‖τ‖² along computed trajectories, tighter on finer runs', () => {
    // Source: dD/dt = −‖τ‖² (numerics.md §1, §4.7). The semi-discrete identity is exact (discrete-operator
    // tests), so the mismatch D(0) − D(t) − ∫‖τ‖² dt (trapezoidal in t) measures the discretisation error.
    const mismatch: number[] = [];
    for (const [points, tolerance] of [
      [100, 1e-5],
      [200, 1e-6],
      [400, 1e-7],
    ] as const) {
      const r = createFlowRun(
        parseRunSpec({
          domain: { kind: 'ball', dim: 2, boundaryAngle: 0.9 * Math.PI },
          target: { kind: 'sphere' },
          initial: { kind: 'identity' },
          grid: { points },
          time: { tMax: 0.3, maxStep: 0.01, tolerance },
        }),
      );
      let integral = 0;
      let prev = runDiagnostics(r);
      const d0 = prev.energy;
      while (!advanceFlowRun(r, { maxSteps: 1 }).done) {
        const cur = runDiagnostics(r);
        integral += 0.5 * (cur.t - prev.t) * (cur.tension ** 2 + prev.tension ** 2);
        prev = cur;
      }
      const cur = runDiagnostics(r);
      integral += 0.5 * (cur.t - prev.t) * (cur.tension ** 2 + prev.tension ** 2);
      const drop = d0 - cur.energy;
      mismatch.push(Math.abs(drop - integral) / drop);
    }
    expect(mismatch[0]!).toBeLessThan(1e-2);
    expect(mismatch[2]!).toBeLessThan(mismatch[0]!);
    expect(mismatch[2]!).toBeLessThan(2e-3);
    console.info(`energy identity relative mismatch: ${mismatch.map((m) => m.toExponential(2)).join(', ')}`);
  });
});

describe('ellipsoid targets (numerics.md §4.6)', () => {
  it('S³ → ellipsoid b = 5 (far above b* = 2√2) develops a singularity, in infinite time', () => {
    // Source: no co-rotational harmonic map into elongated ellipsoids past the threshold (R. T. Smith,
    // Amer. J. Math. 97, 1975, from memory; b* = 2√2 derived) — numerics.md §4.6; targets without a steady
    // state in the symmetry class grow the gradient roughly exponentially with T̂ receding (numerics.md §3).
    const r = run({
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'ellipsoid', axisRatio: 5 },
      initial: { kind: 'identity' },
      grid: { points: 150 },
      time: { tMax: 100, maxStep: 1 },
      stop: { gradientBound: 1e5 },
    });
    const s = summarizeFlowRun(r);
    expect(s.outcome).toBe('blowup');
    expect(s.symmetry).toBe('reflection');
    expect(s.blowup!.kind).toBe('infinite-time');
    expect(s.blowup!.T).toBeNull();
    const e = blowupEstimate(r);
    expect(e.evidence.exponentialRate!).toBeGreaterThan(0);
  });

  it('near the threshold b* = 2√2 the evidence separates a steep steady state from a singularity', () => {
    // Source: b* = 2√(m−1)/(m−2) = 2√2 ≈ 2.83 for m = 3 (derived, numerics.md §4.6); close to an existence
    // threshold the steady state itself is extremely steep, the look-alike of numerics.md §3.
    const ellipsoid = (b: number, gradientBound: number) =>
      run({
        domain: { kind: 'sphere', dim: 3 },
        target: { kind: 'ellipsoid', axisRatio: b },
        initial: { kind: 'identity' },
        grid: { points: 150 },
        time: { tMax: 200, maxStep: 5 },
        stop: { gradientBound, tension: 1e-8 },
      });
    // Below b*: a steady state exists; at b = 2.5 it is steep but the flow converges to it.
    const below = summarizeFlowRun(ellipsoid(2.5, 1e6));
    expect(below.outcome).toBe('converged');
    expect(below.gradMaxFinal).toBeGreaterThan(100);
    // Closer to b*, a modest gradient bound fires on the way to a steeper steady state: the growth rate
    // is falling, so the engine does not call it a singularity.
    const near = ellipsoid(2.7, 1e6);
    const nearSummary = summarizeFlowRun(near);
    expect(nearSummary.outcome).toBe('blowup');
    expect(nearSummary.blowup!.kind).toBe('inconclusive');
    expect(blowupEstimate(near).evidence.notes.join(' ')).toMatch(/steep steady state/);
    // Just above b*: no steady state in the class; the gradient grows at a steady exponential rate.
    const above = ellipsoid(2.9, 1e6);
    expect(summarizeFlowRun(above).blowup!.kind).toBe('infinite-time');
    const e = blowupEstimate(above).evidence;
    expect(e.rateLate!).toBeGreaterThan(0.75 * e.rateEarly!);
  });
});
