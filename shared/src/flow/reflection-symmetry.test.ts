import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import { advanceFlowRun, createFlowRun, flowProfile } from './flow-run';
import { summarizeFlowRun } from './flow-summary';

function identityS3(symmetry: 'auto' | 'none'): RunSpecInput {
  return {
    domain: { kind: 'sphere', dim: 3 },
    target: { kind: 'sphere' },
    initial: { kind: 'identity' },
    symmetry,
    grid: { points: 100 },
    // A tension threshold at the floor, so only the dilation instability can end the run early.
    time: { tMax: 60, maxStep: 1 },
    stop: { tension: 1e-14, gradientBound: 1e3 },
  };
}

describe('reflection symmetry on the sphere (numerics.md §1 "Reflection symmetry", §4.3, §4.7)', () => {
  it('symmetry auto keeps the identity of S³ (a symmetric steady state) and reports "reflection"', () => {
    // Source: the reflection class is invariant and has X = 0 (numerics.md §1); the identity is harmonic
    // with energy 3π² (numerics.md §4.1).
    const run = createFlowRun(parseRunSpec(identityS3('auto')));
    advanceFlowRun(run);
    const s = summarizeFlowRun(run);
    expect(s.symmetry).toBe('reflection');
    expect(s.outcome).toBe('time-limit');
    expect(s.center).toBe(0);
    expect(Math.abs(s.energyFinal - 3 * Math.PI * Math.PI) / (3 * Math.PI * Math.PI)).toBeLessThan(1e-4);
    const { r, h } = flowProfile(run);
    for (let i = 0; i < r.length; i++) expect(Math.abs(h[i]! - r[i]!)).toBeLessThan(1e-3);
  });

  it('symmetry none: the plain flow from the identity of S³ eventually leaves it toward a pole', () => {
    // Source: the identity of S^m, m ≥ 3, is unstable along the dilation direction (R. T. Smith, Proc. Amer.
    // Math. Soc. 47, 1975), so round-off alone pulls a plain run off the class (numerics.md §1, §4.3, §4.7).
    const run = createFlowRun(parseRunSpec(identityS3('none')));
    advanceFlowRun(run);
    const s = summarizeFlowRun(run);
    expect(s.symmetry).toBe('none');
    expect(s.outcome).toBe('blowup'); // the energy concentrates at one pole
    expect(Math.abs(s.center!)).toBeGreaterThan(1);
    // F(s) → 0 as s → 0 for m ≥ 3 (Eells & Sampson 1964, numerics.md §4.3): the energy falls well below 3π².
    expect(s.energyFinal).toBeLessThan(0.6 * 3 * Math.PI * Math.PI);
    console.info(`S3 identity, symmetry none: left at t ≈ ${s.tFinal.toFixed(2)}, X = ${s.center}`);
  });

  it('a reflection-symmetric start stays symmetric: exactly with auto, to round-off with none (short time)', () => {
    // Source: the reflection class is invariant under the flow (numerics.md §1).
    const base: RunSpecInput = {
      domain: { kind: 'sphere', dim: 4 },
      target: { kind: 'ellipsoid', axisRatio: 1.3 },
      initial: { kind: 'perturbed', amplitude: 0.3, mode: 2 },
      grid: { points: 201 },
      time: { tMax: 0.5, maxStep: 0.05 },
    };
    const auto = createFlowRun(parseRunSpec({ ...base, symmetry: 'auto' }));
    advanceFlowRun(auto);
    expect(summarizeFlowRun(auto).symmetry).toBe('reflection');
    const pa = flowProfile(auto);
    const n = pa.r.length;
    for (let i = 0; i < n; i++) expect(Math.abs(pa.h[n - 1 - i]! - (Math.PI - pa.h[i]!))).toBeLessThan(1e-15);
    const none = createFlowRun(parseRunSpec({ ...base, symmetry: 'none' }));
    advanceFlowRun(none);
    expect(summarizeFlowRun(none).symmetry).toBe('none');
    const m = none.r.length;
    let asym = 0;
    for (let i = 0; i < m; i++) asym = Math.max(asym, Math.abs(none.h[m - 1 - i]! - (Math.PI - none.h[i]!)));
    expect(asym).toBeLessThan(1e-9);
    expect(Math.abs(summarizeFlowRun(none).center!)).toBeLessThan(1e-8);
  });

  it('non-symmetric data with symmetry auto runs on the whole sphere', () => {
    // Source: numerics.md §1: auto imposes the symmetry only when data and target have it.
    const run = createFlowRun(
      parseRunSpec({
        domain: { kind: 'sphere', dim: 3 },
        target: { kind: 'sphere' },
        initial: { kind: 'dilated', s: 0.8 },
        grid: { points: 60 },
        time: { tMax: 0.1 },
      }),
    );
    expect(run.model.symmetry).toBe('none');
    expect(summarizeFlowRun(run).center).not.toBe(0);
  });
});
