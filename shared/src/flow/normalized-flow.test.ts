import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import { advanceFlowRun, createFlowRun, drainSamples, type FlowRun } from './flow-run';
import { deserializeCheckpoint, serializeCheckpoint } from './checkpoint-format';
import { summarizeFlowRun } from './flow-summary';
import { forkFlowRun } from './fork-flow-run';

function bits(a: Float64Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('hex');
}

/** h₀ = r + 0.2 sin r on S³ → S³ (not reflection-symmetric), whole sphere. */
function perturbedS3(flow: 'standard' | 'normalized', extra: Partial<RunSpecInput> = {}): RunSpecInput {
  return {
    domain: { kind: 'sphere', dim: 3 },
    target: { kind: 'sphere' },
    flow,
    symmetry: 'none',
    initial: { kind: 'perturbed', amplitude: 0.2, mode: 1 },
    grid: { points: 200 },
    time: { tMax: 30, maxStep: 0.5 },
    stop: { tension: 1e-9, gradientBound: 1e3 },
    ...extra,
  };
}

/** Runs step by step, calling `each` after every accepted step. */
function stepThrough(run: FlowRun, each: () => void): void {
  for (;;) {
    const res = advanceFlowRun(run, { maxSteps: 1 });
    if (res.steps > 0) each();
    if (res.done) return;
  }
}

describe('Möbius-normalized flow (numerics.md §1, §4.7)', () => {
  it('a reflection-symmetric map has X = 0, and the standard and normalized flows give the same trajectory (σ at round-off)', () => {
    // Source: numerics.md §1 "Reflection symmetry" and §4.7: the reflection class is invariant and has X = 0,
    // so σ = 0 and the two flows coincide. Whole sphere (symmetry none), so σ is computed, not assumed.
    const base: RunSpecInput = {
      domain: { kind: 'sphere', dim: 4 },
      target: { kind: 'ellipsoid', axisRatio: 1.3 },
      symmetry: 'none',
      initial: { kind: 'perturbed', amplitude: 0.3, mode: 2 },
      grid: { points: 201 },
      time: { tMax: 1, maxStep: 0.05 },
    };
    const std = createFlowRun(parseRunSpec({ ...base, flow: 'standard' }));
    const nrm = createFlowRun(parseRunSpec({ ...base, flow: 'normalized' }));
    expect(Math.abs(std.center)).toBeLessThan(1e-13 * std.energy);
    expect(nrm.normalized).toBe(true);
    expect(summarizeFlowRun(nrm).recentre!.s).toBeCloseTo(1, 12);
    let sigmaMax = 0;
    stepThrough(nrm, () => (sigmaMax = Math.max(sigmaMax, Math.abs(nrm.sigma))));
    advanceFlowRun(std);
    expect(std.r.length).toBe(nrm.r.length);
    let diff = 0;
    for (let i = 0; i < std.h.length; i++) diff = Math.max(diff, Math.abs(std.h[i]! - nrm.h[i]!));
    expect(sigmaMax).toBeLessThan(1e-12);
    expect(diff).toBeLessThan(1e-10);
    expect(Math.abs(std.energy - nrm.energy)).toBeLessThan(1e-11 * std.energy);
    console.info(`symmetric data: max|σ| = ${sigmaMax.toExponential(2)}, max|h_std − h_norm| at t = 1: ${diff.toExponential(2)}`);
  });

  it('energy identity dD/dt = −‖τ‖² holds for the normalized flow while X = 0; X stays at round-off along the whole run', () => {
    // Source: numerics.md §1 and §4.7: when X = 0 the drift σ·sin r·h_r is L²-orthogonal to τ. Discretely the
    // drift's contribution σ·G·w vanishes only to grid accuracy (the continuous identity, not an exact discrete one).
    const run = createFlowRun(parseRunSpec(perturbedS3('normalized', { time: { tMax: 3, maxStep: 0.05, tolerance: 1e-8 } })));
    let worstX = Math.abs(run.center);
    let worstRel = 0;
    let dissipated = 0;
    let tPrev = run.s.tHi;
    let tension2Prev = run.tension ** 2;
    const e0 = run.energy;
    const f = run.model.energyFactor;
    const grad = new Float64Array(run.h.length);
    const check = () => {
      // dD_h/dt along the normalized velocity v = τ + σw, exactly: ∇D_h·v (the assembled gradient).
      // It differs from −‖τ‖² by σ·∇D_h·w = −σ⟨τ, w⟩_M, which vanishes in the continuum while X = 0.
      run.op.assemble(run.h, grad, null, null);
      let dot = 0;
      for (let i = 1; i < grad.length - 1; i++) dot += grad[i]! * run.velocity[i]!;
      const t2 = run.tension ** 2;
      worstRel = Math.max(worstRel, Math.abs(f * dot + t2) / t2);
    };
    check();
    stepThrough(run, () => {
      worstX = Math.max(worstX, Math.abs(run.center));
      const t = run.s.tHi + run.s.tLo;
      const t2 = run.tension ** 2;
      dissipated += 0.5 * (t - tPrev) * (t2 + tension2Prev);
      tPrev = t;
      tension2Prev = t2;
      check();
    });
    expect(worstX).toBeLessThan(1e-13 * e0);
    expect(worstRel).toBeLessThan(1e-5);
    const lost = e0 - run.energy;
    expect(Math.abs(lost - dissipated) / lost).toBeLessThan(1e-3);
    console.info(
      `normalized S³, r + 0.2 sin r re-centred: max|X| = ${worstX.toExponential(2)}, max |dD/dt + ‖τ‖²|/‖τ‖² = ${worstRel.toExponential(2)}, ` +
        `D(0) − D(t) = ${lost.toExponential(6)} vs ∫‖τ‖²dt = ${dissipated.toExponential(6)}`,
    );
  });

  it('S³ → S³ from h₀ = r + 0.2 sin r: the standard flow leaves the identity, the normalized flow from the re-centred datum returns to it', () => {
    // A fact of the trade, no published source (numerics.md §4.7): the identity of S³ is unstable only along
    // the dilations (R. T. Smith, Proc. Amer. Math. Soc. 47, 1975), which the normalized flow removes.
    const std = createFlowRun(parseRunSpec(perturbedS3('standard')));
    advanceFlowRun(std);
    const a = summarizeFlowRun(std);
    const at = std.op.rMid[std.gradMaxCell]!;
    expect(a.outcome).toBe('blowup');
    expect(at).toBeLessThan(0.01); // the gradient concentrates at the pole r = 0 (X > 0: energy toward r = 0)
    expect(a.energyFinal).toBeLessThan(0.5 * 3 * Math.PI ** 2);
    const nrm = createFlowRun(parseRunSpec(perturbedS3('normalized')));
    const sigmas: number[] = [];
    stepThrough(nrm, () => sigmas.push(nrm.sigma));
    const b = summarizeFlowRun(nrm);
    let dist = 0;
    for (let i = 0; i < nrm.r.length; i++) dist = Math.max(dist, Math.abs(nrm.h[i]! - nrm.r[i]!));
    expect(b.outcome).toBe('converged');
    expect(dist).toBeLessThan(1e-3);
    expect(Math.abs(b.energyFinal - 3 * Math.PI ** 2)).toBeLessThan(1e-3); // energy of the identity, numerics.md §4.1
    expect(Math.abs(nrm.sigma)).toBeLessThan(1e-8);
    expect(b.recentre!.s).toBeLessThan(1);
    expect(Math.abs(b.sigmaInitial!)).toBeGreaterThan(0);
    console.info(
      `standard: ${a.outcome} (${a.reason}) at t = ${a.tFinal.toFixed(4)}, max|∇u| = ${a.gradMaxFinal.toExponential(2)} at r = ${at.toExponential(2)}, ` +
        `D ${a.energyInitial.toFixed(4)} → ${a.energyFinal.toFixed(4)}, X = ${a.center!.toFixed(3)}; ` +
        `normalized: re-centred with s = ${b.recentre!.s.toFixed(6)} (X ${b.recentre!.centerBefore.toFixed(4)} → 0), ${b.outcome} at t = ${b.tFinal.toFixed(3)}, ` +
        `max|h − r| = ${dist.toExponential(2)}, σ ${b.sigmaInitial!.toExponential(2)} → ${nrm.sigma.toExponential(2)}`,
    );
  });

  it('resume from a checkpoint is bit-identical for the normalized flow; samples carry σ and its denominator', () => {
    // Source: numerics.md §2 "Deterministic".
    const spec = parseRunSpec(perturbedS3('normalized', { time: { tMax: 2, maxStep: 0.05 } }));
    const straight = createFlowRun(spec);
    advanceFlowRun(straight);
    const sliced = createFlowRun(spec);
    advanceFlowRun(sliced, { maxSteps: 7 });
    const samples = drainSamples(sliced);
    expect(samples[0]!.sigma).not.toBe(0);
    expect(samples[0]!.sigmaDenominator).toBeGreaterThan(0);
    const resumed = deserializeCheckpoint(serializeCheckpoint(sliced));
    advanceFlowRun(resumed);
    expect(bits(resumed.h)).toBe(bits(straight.h));
    expect(Object.is(resumed.sigma, straight.sigma)).toBe(true);
    expect(JSON.stringify(summarizeFlowRun(resumed))).toBe(JSON.stringify(summarizeFlowRun(straight)));
  });

  it('forking a standard run into the normalized flow re-centres the carried profile', () => {
    // Source: numerics.md §1 (the normalized flow starts from X = 0).
    const parent = createFlowRun(parseRunSpec(perturbedS3('standard')));
    advanceFlowRun(parent, { maxSteps: 20 });
    expect(Math.abs(parent.center)).toBeGreaterThan(0.1);
    const fork = forkFlowRun(parent, parseRunSpec(perturbedS3('normalized')));
    expect(fork.normalized).toBe(true);
    expect(Math.abs(fork.center)).toBeLessThan(1e-12 * fork.energy);
    const s = summarizeFlowRun(fork);
    expect(Math.abs(s.recentre!.centerBefore - parent.center)).toBeLessThan(1e-9);
    advanceFlowRun(fork);
    expect(summarizeFlowRun(fork).outcome).toBe('converged');
  });

  it('through refinement toward a pole X stays at round-off (S³ → ellipsoid b = 4, beyond the existence threshold)', () => {
    // Source: numerics.md §4.6 (no co-rotational harmonic map into the ellipsoid for b far above b* ≈ 2.83 when
    // m = 3, so a singularity forms); X = 0 is the constraint of the normalized flow (numerics.md §1).
    const run = createFlowRun(
      parseRunSpec({
        domain: { kind: 'sphere', dim: 3 },
        target: { kind: 'ellipsoid', axisRatio: 4 },
        flow: 'normalized',
        symmetry: 'none',
        initial: { kind: 'perturbed', amplitude: 0.1, mode: 1 },
        grid: { points: 200 },
        time: { tMax: 50, maxStep: 0.1 },
        stop: { gradientBound: 1e5 },
      }),
    );
    let worstX = Math.abs(run.center);
    stepThrough(run, () => (worstX = Math.max(worstX, Math.abs(run.center))));
    const s = summarizeFlowRun(run);
    expect(s.outcome).toBe('blowup');
    expect(run.s.regrids).toBeGreaterThan(3);
    expect(worstX).toBeLessThan(1e-12 * s.energyInitial);
    console.info(
      `normalized S³ → ellipsoid b = 4: ${s.outcome} (${s.reason}) at t = ${s.tFinal.toFixed(4)}, ${run.s.regrids} regrids, ` +
        `max|X| = ${worstX.toExponential(2)}, σ = ${run.sigma.toExponential(3)}, denominator ratio ${run.sigmaRatio.toFixed(3)}`,
    );
  });
});
