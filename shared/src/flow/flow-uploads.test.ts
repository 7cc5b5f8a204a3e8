import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import type { InitialProfile, TargetProfile } from '../uploads/profile-csv';
import { CHECKPOINT_VERSION, crc32, deserializeCheckpoint, serializeCheckpoint } from './checkpoint-format';
import { dilate } from './initial-data';
import { advanceFlowRun, createFlowRun, runTime, type FlowRun } from './flow-run';
import { forkFlowRun } from './fork-flow-run';
import { summarizeFlowRun } from './flow-summary';
import { ProfileTarget } from './profile-target';

const B = 1.5;

/** The ellipsoid as an uploaded table: f = sin h, z = b cos h on n equally spaced h (numerics.md §1, target table). */
function ellipsoidTable(n: number): TargetProfile {
  const h: number[] = [];
  const f: number[] = [];
  const z: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = i === n - 1 ? Math.PI : (i * Math.PI) / (n - 1);
    h.push(x);
    f.push(i === 0 || i === n - 1 ? 0 : Math.sin(x));
    z.push(B * Math.cos(x));
  }
  return { h, f, z };
}

/** A table of h₀(r) on n equally spaced r of the domain. */
function initialTable(domain: 'sphere' | 'ball', n: number, h0: (r: number) => number): InitialProfile {
  const length = domain === 'ball' ? 1 : Math.PI;
  const r: number[] = [];
  const h: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = i === n - 1 ? length : (i * length) / (n - 1);
    r.push(x);
    h.push(h0(x));
  }
  return { domain, r, h };
}

function bits(a: Float64Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('hex');
}

function maxDiff(a: Float64Array, b: Float64Array): number {
  expect(a.length).toBe(b.length);
  let d = 0;
  for (let i = 0; i < a.length; i++) d = Math.max(d, Math.abs(a[i]! - b[i]!));
  return d;
}

// S³ → ellipsoid b = 1.5 from h₀ = r: b is below b* = 2√2 (numerics.md §4.6, derived), so the
// flow converges to a steady state (the case steady-state.test.ts checks against odex).
const ellipsoidSpec = (points: number, over: Partial<RunSpecInput> = {}) =>
  parseRunSpec({
    domain: { kind: 'sphere', dim: 3 },
    target: { kind: 'ellipsoid', axisRatio: B },
    initial: { kind: 'identity' },
    grid: { points },
    time: { tMax: 500, maxStep: 5, tolerance: 1e-7 },
    stop: { tension: 1e-10 },
    ...over,
  });

function converge(run: FlowRun): FlowRun {
  advanceFlowRun(run);
  expect(summarizeFlowRun(run).outcome).toBe('converged');
  return run;
}

describe('uploaded target profiles (numerics.md §1, target kind "profile")', () => {
  it('the splines of a sampled ellipsoid reproduce P = ρ², Q = f² and their derivatives, also past the poles', () => {
    // Source: the closed forms of numerics.md §1 for the ellipsoid (f = sin h, z = b cos h,
    // ρ² = cos²h + b² sin²h), written out here independently of the engine's EllipsoidTarget;
    // the spline error bounds (O(Δ⁴) for f, z; O(Δ³) for f', z'; O(Δ) for f''') are de Boor's.
    const target = ProfileTarget.fromTable(ellipsoidTable(400));
    expect(target.reflectionSymmetric).toBe(true);
    expect(target.equatorRho).toBeCloseTo(B, 7);
    const out = new Float64Array(6);
    let worst = [0, 0, 0, 0, 0, 0];
    const k = B * B - 1;
    for (let i = 0; i <= 1000; i++) {
      const h = -1 + (i * (Math.PI + 2)) / 1000; // [−1, π + 1]: reflected about both poles
      target.evaluate(h, out);
      const s = Math.sin(h);
      const c = Math.cos(h);
      const exact = [1 + k * s * s, 2 * k * s * c, 2 * k * (c * c - s * s), s * s, 2 * s * c, 2 * (c * c - s * s)];
      worst = worst.map((w, j) => Math.max(w, Math.abs(out[j]! - exact[j]!)));
      expect(Math.abs(target.f(h) - s)).toBeLessThan(1e-9);
      expect(Math.abs(target.rhoSquared(h) - exact[0]!)).toBeLessThan(1e-6);
    }
    expect(worst[0]).toBeLessThan(1e-6); // P (from f', z': third order)
    expect(worst[1]).toBeLessThan(1e-3); // P' (from f'', z'': second order)
    expect(worst[2]).toBeLessThan(0.1); // P'' (uses f''', piecewise constant: first order)
    expect(worst[3]).toBeLessThan(1e-9); // Q = f²
    expect(worst[4]).toBeLessThan(1e-6);
    expect(worst[5]).toBeLessThan(1e-3);
    // Near a pole f ≈ f'(0)·h: the spline's f/h tends to 1 there.
    expect(Math.abs(target.f(1e-6) / 1e-6 - 1)).toBeLessThan(1e-6);
    console.info(`spline ellipsoid (400 knots): max errors P ${worst[0]!.toExponential(1)}, P' ${worst[1]!.toExponential(1)}, P'' ${worst[2]!.toExponential(1)}, Q ${worst[3]!.toExponential(1)}`);
  });

  it('an uploaded ellipsoid profile gives the built-in ellipsoid\'s steady state and energy within grid accuracy', () => {
    // Source: numerics.md §4.6 (b = 1.5 < b* = 2√2: a steady state exists); grid accuracy is
    // measured by halving the spacing (numerics.md §4.9).
    const table = ellipsoidTable(400);
    const uploaded = converge(createFlowRun(ellipsoidSpec(101, { target: { kind: 'profile', uploadId: 'u-ellipsoid' } }), { targetProfile: table }));
    const builtIn = converge(createFlowRun(ellipsoidSpec(101)));
    const finer = converge(createFlowRun(ellipsoidSpec(201)));
    expect(summarizeFlowRun(uploaded).symmetry).toBe('reflection');
    const gridAccuracy = Math.abs(builtIn.energy - finer.energy);
    const energyDiff = Math.abs(uploaded.energy - builtIn.energy);
    const profileDiff = maxDiff(uploaded.h, builtIn.h);
    expect(energyDiff).toBeLessThan(0.01 * gridAccuracy);
    // Profile: the grid error of h at 101 points is ~1e-4 (steady-state.test.ts); the spline's is far below.
    expect(profileDiff).toBeLessThan(1e-6);
    console.info(
      `uploaded ellipsoid: D = ${uploaded.energy} vs built-in ${builtIn.energy} (|ΔD| = ${energyDiff.toExponential(2)}; grid accuracy |D₁₀₁ − D₂₀₁| = ${gridAccuracy.toExponential(2)}), max|Δh| = ${profileDiff.toExponential(2)}`,
    );
  });

  it('a profile-target run resumes bit-identically from its checkpoint without the upload; forks keep the target', () => {
    const spec = ellipsoidSpec(61, { target: { kind: 'profile', uploadId: 'u-ellipsoid' }, symmetry: 'none', time: { tMax: 1, maxStep: 0.05 } });
    const straight = createFlowRun(spec, { targetProfile: ellipsoidTable(120) });
    advanceFlowRun(straight);
    const first = createFlowRun(spec, { targetProfile: ellipsoidTable(120) });
    advanceFlowRun(first, { maxSteps: 15 });
    const bytes = serializeCheckpoint(first);
    expect(new DataView(bytes.buffer).getUint32(8, true)).toBe(CHECKPOINT_VERSION);
    expect(new DataView(bytes.buffer).getUint32(24, true)).toBe(6);
    const resumed = deserializeCheckpoint(bytes.slice());
    expect(Buffer.from(serializeCheckpoint(resumed)).equals(Buffer.from(bytes))).toBe(true);
    advanceFlowRun(resumed);
    expect(resumed.s.step).toBe(straight.s.step);
    expect(bits(resumed.h)).toBe(bits(straight.h));
    expect(bits(resumed.history)).toBe(bits(straight.history));
    expect(JSON.stringify(summarizeFlowRun(resumed))).toBe(JSON.stringify(summarizeFlowRun(straight)));
    // A fork needs no upload either: the parent's knots come along.
    const fork = forkFlowRun(deserializeCheckpoint(bytes), parseRunSpec({ ...spec, grid: { points: 121 } }));
    expect(fork.model.target.kind).toBe('profile');
    expect(runTime(fork)).toBe(runTime(first));
  });

  it('checkpoints of format version 1 (no knots) are still read', () => {
    const run = createFlowRun(ellipsoidSpec(41, { time: { tMax: 1 } }));
    advanceFlowRun(run, { maxSteps: 5 });
    const v3 = serializeCheckpoint(run);
    // A version-1 buffer of a run without a profile target differs from version 3 only in the version field and
    // the 5 scalars version 3 added after the first 26 (docs/checkpoint-format.md).
    const v3view = new DataView(v3.buffer);
    const scalarsAt = 32 + Math.ceil(v3view.getUint32(16, true) / 8) * 8;
    const cut = scalarsAt + 8 * 26;
    const v1 = new Uint8Array(v3.length - 40);
    v1.set(v3.subarray(0, cut));
    v1.set(v3.subarray(cut + 40, v3.length - 8), cut);
    const view = new DataView(v1.buffer);
    view.setUint32(8, 1, true);
    view.setUint32(20, 26, true);
    view.setUint32(v1.length - 8, v1.length - 8, true);
    view.setUint32(v1.length - 4, crc32(v1, 0, v1.length - 8), true);
    const back = deserializeCheckpoint(v1);
    expect(bits(back.h)).toBe(bits(run.h));
    expect(back.s.step).toBe(run.s.step);
    expect(back.s.recentreS).toBe(1);
    expect(back.s.sigmaInitial).toBe(0);
  });

  it('a profile target without its upload, or with a broken table, is refused with the problem named', () => {
    const spec = ellipsoidSpec(41, { target: { kind: 'profile', uploadId: 'u-7' } });
    expect(() => createFlowRun(spec)).toThrow(/uploaded target profile u-7/);
    const bad = ellipsoidTable(50);
    bad.f[10] = -0.1;
    expect(() => createFlowRun(spec, { targetProfile: bad })).toThrow(/f must be positive between the poles \(row 11\)/);
  });

});

describe('uploaded initial profiles (numerics.md §5, initial kind "table")', () => {
  it('a table sampling h₀ = r runs as initial.kind "identity" (S³ → ellipsoid b = 1.5)', () => {
    // Source: numerics.md §5 (identity: h₀ = r). Steffen interpolation is exact for linear data,
    // so the starting profiles agree to round-off, and so do the runs.
    const table = initialTable('sphere', 200, (r) => r);
    const fromTable = createFlowRun(ellipsoidSpec(101, { initial: { kind: 'table', uploadId: 'u-id' } }), { initialProfile: table });
    const identity = createFlowRun(ellipsoidSpec(101));
    expect(fromTable.model.symmetry).toBe('reflection');
    expect(maxDiff(fromTable.h, identity.h)).toBeLessThan(1e-14);
    // Its checkpoint resumes without the table, bit for bit (and keeps the half-domain symmetry).
    advanceFlowRun(fromTable, { maxSteps: 10 });
    const resumed = deserializeCheckpoint(serializeCheckpoint(fromTable));
    expect(resumed.model.symmetry).toBe('reflection');
    converge(resumed);
    converge(fromTable);
    expect(bits(resumed.h)).toBe(bits(fromTable.h));
    expect(resumed.s.step).toBe(fromTable.s.step);
    converge(identity);
    const hDiff = maxDiff(fromTable.h, identity.h);
    expect(hDiff).toBeLessThan(1e-9);
    expect(Math.abs(fromTable.energy - identity.energy)).toBeLessThan(1e-10);
    console.info(`table h₀ = r vs identity: steady state max|Δh| = ${hDiff.toExponential(2)}`);
  });

  it('a table of a curved h₀ starts within interpolation accuracy (third order) of the closed form', () => {
    // Source: numerics.md §1 (γ_s with tan(γ_s/2) = s·tan(r/2)); Steffen, Astron. Astrophys. 239 (1990).
    const s = 2;
    const errors: number[] = [];
    for (const n of [100, 200]) {
      const table = initialTable('sphere', n, (r) => 2 * Math.atan2(s * Math.sin(r / 2), Math.cos(r / 2)));
      const run = createFlowRun(ellipsoidSpec(201, { target: { kind: 'sphere' }, initial: { kind: 'table', uploadId: 'u' } }), { initialProfile: table });
      expect(run.model.symmetry).toBe('none'); // γ₂ is not reflection-symmetric
      let err = 0;
      for (let i = 0; i < run.r.length; i++) err = Math.max(err, Math.abs(run.h[i]! - dilate(s, run.r[i]!)));
      errors.push(err);
    }
    expect(errors[1]!).toBeLessThan(1e-5);
    expect(errors[0]! / errors[1]!).toBeGreaterThan(6); // third order: halving the spacing gives ≈ 8×
    console.info(`table of γ₂: interpolation errors ${errors.map((e) => e.toExponential(2)).join(', ')}`);
  });

  it('a ball table ending at the boundary angle runs as initial.kind "identity" (B² → S², α = 2)', () => {
    // Source: numerics.md §5 (identity on the ball: h₀ = α·r); §4.4 (α < π converges).
    const ball = (initial: RunSpecInput['initial']) =>
      parseRunSpec({
        domain: { kind: 'ball', dim: 2, boundaryAngle: 2 },
        target: { kind: 'sphere' },
        initial,
        grid: { points: 61 },
        time: { tMax: 50, maxStep: 1, tolerance: 1e-7 },
        stop: { tension: 1e-10 },
      });
    const fromTable = converge(createFlowRun(ball({ kind: 'table', uploadId: 'u' }), { initialProfile: initialTable('ball', 30, (r) => 2 * r) }));
    const identity = converge(createFlowRun(ball({ kind: 'identity' })));
    expect(maxDiff(fromTable.h, identity.h)).toBeLessThan(1e-9);
    // Refusals name the mismatch.
    expect(() => createFlowRun(ball({ kind: 'table', uploadId: 'u' }), { initialProfile: initialTable('ball', 30, (r) => 2.1 * r) })).toThrow(
      /ends at h\(1\) = 2\.1.*domain\.boundaryAngle is 2/,
    );
    expect(() => createFlowRun(ball({ kind: 'table', uploadId: 'u' }), { initialProfile: initialTable('sphere', 30, (r) => r) })).toThrow(
      /spans the sphere .* but domain\.kind is "ball"/,
    );
    expect(() => createFlowRun(ellipsoidSpec(41, { initial: { kind: 'table', uploadId: 'u' } }), { initialProfile: initialTable('ball', 30, (r) => 2 * r) })).toThrow(
      /spans the ball .* but domain\.kind is "sphere"/,
    );
    expect(() => createFlowRun(ball({ kind: 'table', uploadId: 'u-9' }))).toThrow(/uploaded initial profile u-9/);
  });
});
