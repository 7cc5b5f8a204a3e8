import { describe, expect, it } from 'vitest';
import { Solver } from 'odex';
import { parseRunSpec } from '../spec';
import { advanceFlowRun, createFlowRun, type FlowRun } from './flow-run';
import { summarizeFlowRun } from './flow-summary';

const M = 3;
const B = 1.5;

/**
 * Independent steady state: shooting for the co-rotational harmonic-map ODE
 *   h'' + (m−1) cot r h' + (ρ'/ρ) h'² − (m−1) f f'/(ρ² sin² r) = 0,   h(0) = 0, h(π/2) = π/2,
 * into the ellipsoid (f = sin h, ρ² = cos²h + b² sin²h), integrated with odex
 * (Gragg–Bulirsch–Stoer; Hairer & Wanner's ODEX) from r₀ = 1e-6 with h ≈ c·r.
 * Source: numerics.md §4.8 (odex from the registry) — no value of the engine is used.
 */
function shoot(c: number, nodes?: Float64Array): { end: number; values: Float64Array | null } {
  const solver = new Solver(2);
  solver.absoluteTolerance = 1e-13;
  solver.relativeTolerance = 1e-13;
  solver.maxSteps = 200_000;
  solver.denseOutput = !!nodes;
  const rhs = (r: number, y: number[]) => {
    const h = y[0]!;
    const p = y[1]!;
    const s = Math.sin(h);
    const P = Math.cos(h) ** 2 + B * B * s * s;
    const halfP1 = (B * B - 1) * s * Math.cos(h); // ρρ' = ½ dP/dh
    const sr = Math.sin(r);
    return [p, -(M - 1) * (Math.cos(r) / sr) * p - (halfP1 / P) * p * p + ((M - 1) * s * Math.cos(h)) / (P * sr * sr)];
  };
  const r0 = 1e-6;
  const values = nodes ? new Float64Array(nodes.length) : null;
  let k = 0;
  if (values && nodes) {
    while (k < nodes.length && nodes[k]! <= r0) {
      values[k] = c * nodes[k]!;
      k++;
    }
  }
  const out = solver.solve(rhs, r0, [c * r0, c], Math.PI / 2, (_n: number, x0: number, x1: number, y: number[], dense?: (i: number, x: number) => number) => {
    if (!values || !nodes || !dense) return;
    while (k < nodes.length && nodes[k]! <= x1) {
      values[k] = nodes[k]! === x1 ? y[0]! : dense(0, nodes[k]!);
      k++;
    }
  });
  if (values && nodes) while (k < nodes.length) values[k++] = out.y[0]!;
  return { end: out.y[0]!, values };
}

function shootingSlope(): number {
  // Scan for a sign change of h(π/2; c) − π/2, then bisect.
  let a = 0.05;
  let fa = shoot(a).end - Math.PI / 2;
  let b = a;
  let fb = fa;
  for (let c = 0.1; c <= 4; c += 0.05) {
    b = c;
    fb = shoot(c).end - Math.PI / 2;
    if (fa * fb <= 0) break;
    a = b;
    fa = fb;
  }
  expect(fa * fb).toBeLessThanOrEqual(0);
  for (let it = 0; it < 60; it++) {
    const mid = 0.5 * (a + b);
    const fm = shoot(mid).end - Math.PI / 2;
    if (fa * fm <= 0) {
      b = mid;
    } else {
      a = mid;
      fa = fm;
    }
  }
  return 0.5 * (a + b);
}

function steadyRun(points: number): FlowRun {
  const run = createFlowRun(
    parseRunSpec({
      domain: { kind: 'sphere', dim: M },
      target: { kind: 'ellipsoid', axisRatio: B },
      initial: { kind: 'identity' },
      grid: { points },
      time: { tMax: 500, maxStep: 5, tolerance: 1e-7 },
      stop: { tension: 1e-10 },
    }),
  );
  advanceFlowRun(run);
  return run;
}

describe('steady states (numerics.md §4.6, §4.8, §4.9)', () => {
  it('S³ → ellipsoid b = 1.5 (below b* = 2√2) converges; agrees with odex shooting; second order', () => {
    // Source: b* = 2√(m−1)/(m−2) = 2√2 for m = 3 (derived, numerics.md §4.6): b = 1.5 is well below,
    // so a steady state exists and the flow from h₀ = r converges to it.
    const c = shootingSlope();
    const errors: number[] = [];
    for (const points of [101, 201, 401]) {
      const run = steadyRun(points);
      const summary = summarizeFlowRun(run);
      expect(summary.outcome).toBe('converged');
      expect(summary.tensionFinal).toBeLessThanOrEqual(1e-10);
      expect(summary.symmetry).toBe('reflection');
      const ref = shoot(c, run.r).values!;
      let err = 0;
      for (let i = 0; i < run.r.length; i++) err = Math.max(err, Math.abs(run.h[i]! - ref[i]!));
      errors.push(err);
    }
    // Agreement to grid accuracy (numerics.md §4.8).
    expect(errors[2]!).toBeLessThan(1e-4);
    // Halving the spacing divides the error by about four (numerics.md §4.9); reference is odex, not the finest grid.
    const r1 = errors[0]! / errors[1]!;
    const r2 = errors[1]! / errors[2]!;
    for (const ratio of [r1, r2]) {
      expect(ratio).toBeGreaterThan(3.5);
      expect(ratio).toBeLessThan(4.5);
    }
    console.info(`odex steady state: slope c = ${c}, max errors ${errors.map((e) => e.toExponential(3)).join(', ')}, ratios ${r1.toFixed(2)}, ${r2.toFixed(2)}`);
  });
});
