import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import { advanceFlowRun, createFlowRun, flowProfile, runTime, type FlowRun } from './flow-run';
import { deserializeCheckpoint, serializeCheckpoint } from './checkpoint-format';
import { forkFlowRun, forkIncompatibility } from './fork-flow-run';
import { summarizeFlowRun } from './flow-summary';

// Ball B² → S² with boundary angle α = 2 < π from h₀ = α·r: the flow exists globally and
// converges (Chang & Ding, 1991; numerics.md §4.4) to h(r) = 2·arctan(r·tan(α/2)), whose
// energy is 2π(1 − cos α) (derived: the degree-one harmonic map of §4.2 restricted to the
// disc it covers; numerics.md §4.4).
const ALPHA = 2;
const EXACT_ENERGY = 2 * Math.PI * (1 - Math.cos(ALPHA));
const exactProfile = (r: number) => 2 * Math.atan(r * Math.tan(ALPHA / 2));

const base: RunSpecInput = {
  domain: { kind: 'ball', dim: 2, boundaryAngle: ALPHA },
  target: { kind: 'sphere' },
  initial: { kind: 'identity' },
  grid: { points: 61 },
  time: { tMax: 50, maxStep: 1, tolerance: 1e-7 },
  stop: { tension: 1e-10 },
};
const spec = (over: Partial<RunSpecInput> = {}) => parseRunSpec({ ...base, ...over });

function bits(a: Float64Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('hex');
}

function maxProfileError(run: FlowRun): number {
  let err = 0;
  for (let i = 0; i < run.r.length; i++) err = Math.max(err, Math.abs(run.h[i]! - exactProfile(run.r[i]!)));
  return err;
}

/** A parent advanced part of the way: still far from the steady state. */
function parentMidRun(over: Partial<RunSpecInput> = {}): FlowRun {
  const parent = createFlowRun(spec(over));
  advanceFlowRun(parent, { maxSteps: 40 });
  expect(parent.s.outcomeCode).toBe(0);
  expect(parent.tension).toBeGreaterThan(1e-3);
  return parent;
}

describe('forkFlowRun (issue 5: fork from a checkpoint with spec overrides)', () => {
  it('same spec: the start is bit-identical to the parent, t carries over, and the continuation agrees within the time tolerance', () => {
    const parent = parentMidRun();
    // Fork from the checkpoint, as the worker does.
    const fork = forkFlowRun(deserializeCheckpoint(serializeCheckpoint(parent)), spec());
    expect(bits(fork.r)).toBe(bits(parent.r));
    expect(bits(fork.h)).toBe(bits(parent.h));
    expect(Object.is(fork.energy, parent.energy)).toBe(true);
    expect(Object.is(fork.tension, parent.tension)).toBe(true);
    expect(runTime(fork)).toBe(runTime(parent));
    expect(fork.s.tLo).toBe(parent.s.tLo);
    expect(fork.s.energyInitial).toBe(parent.s.energyInitial);
    expect(fork.s.step).toBe(0);
    expect(fork.s.regridEnergyChange).toBe(0);
    // The first sample of the fork is at the parent's time (plots continue).
    expect(fork.samples[0]!.t).toBe(runTime(parent));
    // Step sizes do not carry over: the fork's first step is chosen afresh.
    expect(fork.s.dt).not.toBe(parent.s.dt);

    advanceFlowRun(parent);
    advanceFlowRun(fork);
    const a = summarizeFlowRun(parent);
    const b = summarizeFlowRun(fork);
    expect(a.outcome).toBe('converged');
    expect(b.outcome).toBe('converged');
    // Both end at the same discrete steady state: the only difference is the step sequence.
    let diff = 0;
    for (let i = 0; i < parent.h.length; i++) diff = Math.max(diff, Math.abs(parent.h[i]! - fork.h[i]!));
    expect(diff).toBeLessThan(1e-8);
    expect(Math.abs(a.energyFinal - b.energyFinal)).toBeLessThan(1e-10);
    console.info(`fork same spec: steady-state max|Δh| = ${diff.toExponential(2)}, ΔD = ${(a.energyFinal - b.energyFinal).toExponential(2)}`);
  });

  it('a 2× finer grid reaches the steady state with the finer grid\'s accuracy (second order)', () => {
    const parent = parentMidRun();
    const fork = forkFlowRun(parent, spec({ grid: { points: 121 } }));
    expect(fork.r.length).toBe(121);
    expect(runTime(fork)).toBe(runTime(parent));
    // The transfer changes the energy only by the interpolation error.
    expect(Math.abs(fork.energy - parent.energy)).toBeLessThan(1e-3 * parent.energy);
    advanceFlowRun(parent);
    advanceFlowRun(fork);
    expect(summarizeFlowRun(fork).outcome).toBe('converged');
    const coarseError = Math.abs(parent.energy - EXACT_ENERGY);
    const fineError = Math.abs(fork.energy - EXACT_ENERGY);
    // Halving the spacing divides the error by about four (numerics.md §4.9).
    expect(coarseError / fineError).toBeGreaterThan(3.5);
    expect(coarseError / fineError).toBeLessThan(4.5);
    const ratio = maxProfileError(parent) / maxProfileError(fork);
    expect(ratio).toBeGreaterThan(3.5);
    expect(ratio).toBeLessThan(4.5);
    // And the same steady state as a fresh run on the finer grid (far below the grid error).
    const fresh = createFlowRun(spec({ grid: { points: 121 } }));
    advanceFlowRun(fresh);
    expect(Math.abs(fresh.energy - fork.energy)).toBeLessThan(0.01 * fineError);
    console.info(
      `fork 61 → 121 points: energy error ${coarseError.toExponential(3)} → ${fineError.toExponential(3)} (exact 2π(1 − cos 2) = ${EXACT_ENERGY}), profile error ratio ${ratio.toFixed(2)}`,
    );
  });

  it('a coarser grid, another step size and tolerance are accepted; the fork checkpoints and resumes bit for bit', () => {
    const parent = parentMidRun({ grid: { points: 121 } });
    const fork = forkFlowRun(parent, spec({ grid: { points: 61 }, time: { tMax: 50, maxStep: 0.5, tolerance: 1e-6 } }));
    expect(fork.r.length).toBe(61);
    expect(fork.spec.time.tolerance).toBe(1e-6);
    advanceFlowRun(fork, { maxSteps: 10 });
    const resumed = deserializeCheckpoint(serializeCheckpoint(fork));
    advanceFlowRun(fork);
    advanceFlowRun(resumed);
    expect(bits(resumed.h)).toBe(bits(fork.h));
    expect(summarizeFlowRun(fork).outcome).toBe('converged');
    expect(Math.abs(fork.energy - EXACT_ENERGY)).toBeLessThan(2e-3);
  });

  it('a run that reached t_max continues in a fork with a later t_max', () => {
    const parent = createFlowRun(spec({ time: { tMax: 0.5, maxStep: 0.1, tolerance: 1e-7 } }));
    advanceFlowRun(parent);
    expect(summarizeFlowRun(parent).outcome).toBe('time-limit');
    const fork = forkFlowRun(parent, spec());
    expect(fork.s.outcomeCode).toBe(0);
    expect(runTime(fork)).toBe(0.5);
    advanceFlowRun(fork);
    const summary = summarizeFlowRun(fork);
    expect(summary.outcome).toBe('converged');
    expect(summary.tFinal).toBeGreaterThan(0.5);
    expect(summary.energyInitial).toBe(parent.s.energyInitial);
    expect(Math.abs(fork.energy - EXACT_ENERGY)).toBeLessThan(1e-3);
  });

  it('a reflection-symmetric parent forks onto the whole sphere (symmetry "none"), mirrored', () => {
    const sphere: RunSpecInput = {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'ellipsoid', axisRatio: 1.5 },
      initial: { kind: 'identity' },
      grid: { points: 41 },
      time: { tMax: 50, maxStep: 1 },
    };
    const parent = createFlowRun(parseRunSpec(sphere));
    advanceFlowRun(parent, { maxSteps: 10 });
    expect(parent.model.symmetry).toBe('reflection');
    const fork = forkFlowRun(parent, parseRunSpec({ ...sphere, symmetry: 'none', grid: { points: 81 } }));
    expect(fork.model.symmetry).toBe('none');
    expect(fork.r[fork.r.length - 1]).toBe(Math.PI);
    const whole = flowProfile(fork);
    // h(π − r) = π − h(r) at the start, up to interpolation round-off.
    const n = whole.r.length;
    for (let i = 0; i < n; i++) expect(Math.abs(whole.h[i]! + whole.h[n - 1 - i]! - Math.PI)).toBeLessThan(1e-12);
    // Same energy as the parent (both count the whole sphere) up to the discretisation error: the
    // two grids are graded differently (zone π/8 vs π/4), and at ~40 cells per π/2 the midpoint
    // energy is accurate to a few 1e-4 relative (cf. the 61-point ball case above: 8e-5).
    expect(Math.abs(fork.energy - parent.energy)).toBeLessThan(1e-3 * parent.energy);
    // The other direction is refused: a whole-sphere profile is not exactly symmetric.
    expect(() => forkFlowRun(fork, parseRunSpec({ ...sphere, symmetry: 'reflection' }))).toThrow(/symmetry "reflection"/);
  });

  it('incompatible overrides are refused with the field named', () => {
    const parent = parentMidRun();
    expect(() => forkFlowRun(parent, parseRunSpec({ ...base, domain: { kind: 'sphere', dim: 2 } }))).toThrow(/domain\.kind/);
    expect(() => forkFlowRun(parent, spec({ domain: { kind: 'ball', dim: 3, boundaryAngle: ALPHA } }))).toThrow(/domain\.dim/);
    expect(() => forkFlowRun(parent, spec({ domain: { kind: 'ball', dim: 2, boundaryAngle: 2.5 } }))).toThrow(
      /domain\.boundaryAngle/,
    );
    expect(() => forkFlowRun(parent, spec({ target: { kind: 'ellipsoid', axisRatio: 1.5 } }))).toThrow(/target/);
    // The same check without a state, for the API to refuse such a fork up front.
    expect(forkIncompatibility(spec(), spec({ target: { kind: 'ellipsoid', axisRatio: 1.5 } }))).toMatch(/^target /);
    expect(forkIncompatibility(spec(), spec({ grid: { points: 300 }, time: { tMax: 10 } }))).toBeNull();
  });

  it('standard → normalized: forks when the engine supports the normalized flow, otherwise a clear error', () => {
    const sphere: RunSpecInput = {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'sphere' },
      initial: { kind: 'perturbed', amplitude: 0.1, mode: 1 },
      grid: { points: 41 },
      time: { tMax: 1 },
    };
    const parent = createFlowRun(parseRunSpec(sphere));
    advanceFlowRun(parent, { maxSteps: 5 });
    const normalized = parseRunSpec({ ...sphere, flow: 'normalized' });
    let supported = true;
    try {
      createFlowRun(normalized);
    } catch {
      supported = false;
    }
    if (supported) {
      const fork = forkFlowRun(parent, normalized);
      expect(fork.spec.flow).toBe('normalized');
      expect(runTime(fork)).toBe(runTime(parent));
    } else {
      expect(() => forkFlowRun(parent, normalized)).toThrow(/cannot fork into flow "normalized"/);
    }
  });
});
