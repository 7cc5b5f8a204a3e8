import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import {
  advanceFlowRun,
  createFlowRun,
  drainSamples,
  flowProfile,
  refreshDiagnostics,
  runDiagnostics,
} from './flow-run';
import { dilate, initialProfile } from './initial-data';
import { summarizeFlowRun } from './flow-summary';

const smooth: RunSpecInput = {
  domain: { kind: 'sphere', dim: 3 },
  target: { kind: 'ellipsoid', axisRatio: 1.2 },
  initial: { kind: 'perturbed', amplitude: 0.2, mode: 1 },
  grid: { points: 60 },
  time: { tMax: 5, maxStep: 0.05 },
};

describe('run lifecycle and outcomes (numerics.md §3)', () => {
  it('a Newton failure without gradient growth is numerics-failed, never blowup', () => {
    const run = createFlowRun(parseRunSpec(smooth));
    advanceFlowRun(run, { maxSteps: 3 });
    run.ws.attempt = () => {
      run.ws.lastOk = false;
      run.ws.lastError = Infinity;
      run.ws.lastIterations = 1;
      return false;
    };
    const res = advanceFlowRun(run);
    expect(res.outcome).toBe('numerics-failed');
    expect(res.reason).toBe('newton-failure');
    expect(summarizeFlowRun(run).blowup).toBeNull();
  });

  it('the same collapse after strong gradient growth is a blow-up (step collapse tied to growth)', () => {
    const run = createFlowRun(parseRunSpec(smooth));
    advanceFlowRun(run, { maxSteps: 3 });
    run.s.gradMaxInitial = run.gradMax / 1000; // as if max|∇u| had grown a thousandfold
    run.ws.attempt = () => {
      run.ws.lastOk = false;
      run.ws.lastError = Infinity;
      run.ws.lastIterations = 1;
      return false;
    };
    const res = advanceFlowRun(run);
    expect(res.outcome).toBe('blowup');
    expect(res.reason).toBe('step-collapse');
  });

  it('NaN in the state ends the run as numerics-failed', () => {
    const run = createFlowRun(parseRunSpec(smooth));
    run.h[10] = Number.NaN;
    refreshDiagnostics(run);
    const res = advanceFlowRun(run);
    expect(res.outcome).toBe('numerics-failed');
  });

  it('t_max ends the run with time-limit at exactly t_max; samples are collected and drained', () => {
    const run = createFlowRun(parseRunSpec({ ...smooth, time: { tMax: 0.3, maxStep: 0.01 } }));
    const res = advanceFlowRun(run);
    expect(res.outcome).toBe('time-limit');
    expect(runDiagnostics(run).t).toBe(0.3);
    const samples = drainSamples(run);
    expect(samples.length).toBeGreaterThan(1);
    expect(samples[0]!.step).toBe(0);
    expect(samples[samples.length - 1]!.step).toBe(run.s.step);
    for (const s of samples) {
      expect(s.center).not.toBeNull();
      expect(s.sigma).toBe(0);
      expect(s.lambda).toBeCloseTo(1 / s.gradMax, 12);
    }
    expect(drainSamples(run)).toEqual([]);
  });

  it('missing uploads are refused with a clear error', () => {
    // Uploads are inputs the engine cannot read itself: without them the error names the upload.
    expect(() => createFlowRun(parseRunSpec({ ...smooth, initial: { kind: 'table', uploadId: 'u1' } }))).toThrow(
      /needs the uploaded initial profile u1/,
    );
    expect(() => createFlowRun(parseRunSpec({ ...smooth, target: { kind: 'profile', uploadId: 'u1' } }))).toThrow(
      /needs the uploaded target profile u1/,
    );
  });

  it('initialProfile gives h₀ of the spec on the whole domain for previews', () => {
    // Source: the definitions of numerics.md §5 (h₀ = r, γ_s with tan(γ_s/2) = s·tan(r/2)).
    const p = initialProfile(parseRunSpec({ ...smooth, initial: { kind: 'dilated', s: 2 } }), 5);
    expect(Array.from(p.r)).toEqual([0, Math.PI / 4, Math.PI / 2, (3 * Math.PI) / 4, Math.PI]);
    expect(p.h[2]).toBeCloseTo(2 * Math.atan(2), 14);
    expect(p.h[4]).toBeCloseTo(Math.PI, 14);
    expect(dilate(1, 1.234)).toBeCloseTo(1.234, 14);
    const b = initialProfile(
      parseRunSpec({ ...smooth, domain: { kind: 'ball', dim: 3, boundaryAngle: 2 }, initial: { kind: 'identity' } }),
      3,
    );
    expect(Array.from(b.h)).toEqual([0, 1, 2]);
  });

  it('flowProfile mirrors the computed half under reflection symmetry', () => {
    const run = createFlowRun(parseRunSpec({ ...smooth, initial: { kind: 'identity' } }));
    expect(run.model.symmetry).toBe('reflection');
    const p = flowProfile(run);
    expect(p.r[0]).toBe(0);
    expect(p.r[p.r.length - 1]).toBe(Math.PI);
    expect(p.h[p.h.length - 1]).toBe(Math.PI);
    for (let i = 1; i < p.r.length; i++) expect(p.r[i]!).toBeGreaterThan(p.r[i - 1]!);
  });
});
