import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import { createFlowRun } from './flow-run';
import { dilate } from './initial-data';
import { dilationProfileMaximumOfRun, dilationProfileOfRun } from './dilation-profile';
import { functionSource, RecentreError, recentreOnGrid, undilate } from './mobius-dilations';
import { jumpToDilationMaximum } from './dilation-jump';
import { ForkError } from './fork-flow-run';

function sphereRun(dim: number, initial: RunSpecInput['initial'], points = 400) {
  return createFlowRun(
    parseRunSpec({
      domain: { kind: 'sphere', dim },
      target: { kind: 'sphere' },
      initial,
      symmetry: 'none',
      grid: { points },
      time: { tMax: 1 },
    }),
  );
}

describe('Möbius dilations (numerics.md §1)', () => {
  it('γ_s∘γ_{1/s} = id and tan(γ_s(r)/2) = s·tan(r/2)', () => {
    // Source: the definition of the dilations in numerics.md §1; γ_{1/s} inverts γ_s since tan(r/2) ↦ s·tan(r/2) does.
    let worst = 0;
    for (const s of [1e-3, 0.1, 0.5, 2, 10, 1e3]) {
      for (let k = 0; k <= 200; k++) {
        const r = (k * Math.PI) / 200;
        // Round-off: γ_{1/s} has slope up to max(s, 1/s), so an ulp of γ_s(r) may grow by that factor.
        const err = Math.max(Math.abs(dilate(1 / s, dilate(s, r)) - r), Math.abs(undilate(s, dilate(s, r)) - r));
        expect(err).toBeLessThanOrEqual(8 * Math.max(s, 1 / s) * Number.EPSILON * Math.PI);
        if (s <= 10 && s >= 0.1) worst = Math.max(worst, err);
        if (k > 0 && k < 200) {
          const rel = Math.abs(Math.tan(dilate(s, r) / 2) - s * Math.tan(r / 2)) / (s * Math.tan(r / 2));
          expect(rel).toBeLessThan(1e-10); // tan is ill-conditioned next to π: relative round-off grows there
        }
      }
    }
    expect(worst).toBeLessThan(1e-14);
    console.info(`max |γ_{1/s}(γ_s(r)) − r| = ${worst.toExponential(2)}`);
  });

  it('center of the dilated identity of S³: X = 6π ∫ cos r · sin²γ_s(r) dr; its derivative L matches finite differences', () => {
    // Source: derived as in numerics.md §4.3: γ_s is conformal with factor λ = sin γ_s / sin r = γ_s', so
    // e = (3/2)λ² and X = 4π ∫ cos r · (3/2)λ² · sin² r dr = 6π ∫ cos r sin²γ_s dr (Simpson's rule below).
    for (const s of [0.5, 2]) {
      const run = sphereRun(3, { kind: 'dilated', s });
      const n = 20000;
      let sum = 0;
      for (let k = 0; k <= n; k++) {
        const r = (k * Math.PI) / n;
        const w = k === 0 || k === n ? 1 : k % 2 === 1 ? 4 : 2;
        sum += w * Math.cos(r) * Math.sin(dilate(s, r)) ** 2;
      }
      const exact = (6 * Math.PI * sum * (Math.PI / n)) / 3;
      expect(Math.abs(run.center - exact)).toBeLessThan(1e-4 * Math.abs(exact));
      expect(Math.sign(run.center)).toBe(s > 1 ? 1 : -1);
      // L·v = d/dε X(h + εv) (internal consistency, central differences).
      const L = new Float64Array(run.h.length);
      const X0 = run.op.centerGradient(run.h, L);
      expect(X0).toBe(run.op.center(run.h));
      const v = new Float64Array(run.h.length);
      for (let i = 1; i < v.length - 1; i++) v[i] = Math.sin(3 * run.r[i]!) + 0.3 * Math.sin(run.r[i]!);
      const eps = 1e-6;
      const hp = run.h.map((x, i) => x + eps * v[i]!);
      const hm = run.h.map((x, i) => x - eps * v[i]!);
      const fd = (run.op.center(hp) - run.op.center(hm)) / (2 * eps);
      let dot = 0;
      for (let i = 0; i < v.length; i++) dot += L[i]! * v[i]!;
      expect(Math.abs(dot - fd)).toBeLessThan(1e-7 * Math.max(1, Math.abs(fd)));
    }
  });

  it('re-centring: X(h₀∘γ_s) = 0 to round-off at the returned s (h₀ = r + 0.2 sin r on S³)', () => {
    // Source: the definition of re-centring in numerics.md §1 (no outside value: the check is X = 0 itself).
    const run = sphereRun(3, { kind: 'perturbed', amplitude: 0.2, mode: 1 });
    const out = new Float64Array(run.h.length);
    const area = run.model.sphereArea;
    const res = recentreOnGrid(run.op, functionSource((r) => r + 0.2 * Math.sin(r)), out, area);
    expect(Math.abs(res.centerBefore)).toBeGreaterThan(1);
    expect(Math.abs(res.centerAfter)).toBeLessThan(1e-12 * res.energyAfter);
    expect(Math.abs(area * run.op.center(out))).toBeLessThan(1e-12 * res.energyAfter);
    // h₀ = r + 0.2 sin r moves energy toward r = 0 (X > 0): the centring dilation has s < 1.
    expect(res.s).toBeLessThan(1);
    console.info(
      `re-centring r + 0.2 sin r: s = ${res.s}, X ${res.centerBefore.toExponential(3)} → ${res.centerAfter.toExponential(2)}, ` +
        `D ${res.energyBefore.toFixed(6)} → ${res.energyAfter.toFixed(6)}, ${res.evaluations} evaluations`,
    );
    // The dilated identity γ_c is centred by s = 1/c (γ_c∘γ_{1/c} = id).
    const d = sphereRun(3, { kind: 'dilated', s: 3 });
    const back = recentreOnGrid(d.op, functionSource((r) => dilate(3, r)), out, area);
    expect(Math.abs(back.s - 1 / 3)).toBeLessThan(1e-10);
  });

  it('re-centring refuses when X keeps its sign over the searched range', () => {
    // Source: numerics.md §1 (refuse with a clear error when no s exists in the searched range).
    const d = sphereRun(3, { kind: 'dilated', s: 10 });
    const out = new Float64Array(d.h.length);
    expect(() => recentreOnGrid(d.op, functionSource((r) => dilate(10, r)), out, d.model.sphereArea, { sMin: 0.25, sMax: 4 })).toThrow(
      RecentreError,
    );
    expect(() => recentreOnGrid(d.op, functionSource((r) => dilate(10, r)), out, d.model.sphereArea, { sMin: 0.25, sMax: 4 })).toThrow(
      /keeps the sign/,
    );
  });
});

describe('Möbius energy profile F(s) = D(h∘γ_s) (numerics.md §1, §4.3)', () => {
  it('m = 2: F(s) is constant in s (conformal invariance of the Dirichlet energy)', () => {
    // Source: the Dirichlet energy is conformally invariant in dimension two — classical; numerics.md §4.3.
    const run = sphereRun(2, { kind: 'perturbed', amplitude: 0.3, mode: 1 });
    const sValues = [0.1, 0.3, 0.5, 1, 2, 3, 10];
    const F = dilationProfileOfRun(run, sValues);
    expect(F.map(([s]) => s)).toEqual(sValues);
    const F1 = F[3]![1];
    let worst = 0;
    for (const [, f] of F) worst = Math.max(worst, Math.abs(f - F1) / F1);
    expect(worst).toBeLessThan(2e-4);
    console.info(`m = 2, h₀ = r + 0.3 sin r: D = ${F1.toFixed(8)}, max |F(s) − F(1)|/F(1) over s ∈ [0.1, 10] = ${worst.toExponential(2)}`);
  });

  it('maximiser: for the dilated identity γ_{1/2} of S³, s* = 2 and the gap is 3π² − 12π²·(1/2)/(3/2)²', () => {
    // Source: F(s) = 12π² s/(1+s)² for the identity of S³ (derived, numerics.md §4.3), maximal at s = 1 with 3π²;
    // γ_{1/2}∘γ_s = γ_{s/2}, so the profile of γ_{1/2} peaks at s = 2.
    const run = sphereRun(3, { kind: 'dilated', s: 0.5 });
    const max = dilationProfileMaximumOfRun(run);
    const F1 = (12 * Math.PI ** 2 * 0.5) / 2.25;
    expect(Math.abs(max.sStar - 2)).toBeLessThan(2e-3);
    expect(Math.abs(max.energyAtMax - 3 * Math.PI ** 2)).toBeLessThan(1e-3);
    expect(Math.abs(max.gap - (3 * Math.PI ** 2 - F1))).toBeLessThan(2e-3);
    console.info(`γ_1/2 of S³: s* = ${max.sStar}, F(s*) = ${max.energyAtMax}, gap = ${max.gap} (exact ${3 * Math.PI ** 2 - F1})`);
  });
});

describe('jump to the maximiser (experimental)', () => {
  it('from the dilated identity γ_{1/2} of S³ the jump lands on the identity, with energy 3π²', () => {
    // Source: F(s) = 12π² s/(1+s)² for the identity of S³ (derived, numerics.md §4.3): γ_{1/2}∘γ_{s*} = id at s* = 2.
    const spec = parseRunSpec({
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'sphere' },
      initial: { kind: 'dilated', s: 0.5 },
      symmetry: 'none',
      grid: { points: 400 },
      time: { tMax: 1 },
    });
    const parent = createFlowRun(spec);
    const jump = jumpToDilationMaximum(parent, spec);
    expect(Math.abs(jump.sStar - 2)).toBeLessThan(2e-3);
    let dist = 0;
    for (let i = 0; i < jump.run.r.length; i++) dist = Math.max(dist, Math.abs(jump.run.h[i]! - jump.run.r[i]!));
    expect(dist).toBeLessThan(2e-3);
    expect(Math.abs(jump.run.energy - 3 * Math.PI ** 2)).toBeLessThan(2e-3);
    expect(() => jumpToDilationMaximum(parent, { ...spec, flow: 'normalized' })).toThrow(ForkError);
    console.info(`jump from γ_1/2: s* = ${jump.sStar}, max|h − r| = ${dist.toExponential(2)}, D = ${jump.run.energy}`);
  });
});
