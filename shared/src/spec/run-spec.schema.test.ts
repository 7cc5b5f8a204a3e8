import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseRunSpec, RunSpecError, safeParseRunSpec, withRunSpecDefaults, runSpecSchema } from './run-spec.schema';
import { RUN_SPEC_DEFAULTS, RUN_SPEC_LIMITS } from './run-spec.limits';

// The example of numerics.md §5, verbatim.
const example = {
  domain: { kind: 'sphere', dim: 3 },
  target: { kind: 'ellipsoid', axisRatio: 2.5 },
  flow: 'standard',
  initial: { kind: 'identity' },
  grid: { points: 400 },
  time: { tMax: 50, maxStep: 0.01, tolerance: 1e-6 },
  stop: { tension: 1e-8, gradientBound: 1e8 },
};

function withPath(path: string, value: unknown): Record<string, unknown> {
  const copy = JSON.parse(JSON.stringify(example)) as Record<string, unknown>;
  const keys = path.split('.');
  let o = copy as Record<string, unknown>;
  for (const k of keys.slice(0, -1)) o = o[k] as Record<string, unknown>;
  o[keys[keys.length - 1]!] = value;
  return copy;
}

function firstError(input: unknown): { path: string; message: string } {
  const r = safeParseRunSpec(input);
  if (r.success) throw new Error('expected the spec to be rejected');
  return r.issues[0]!;
}

describe('run spec schema (numerics.md §5)', () => {
  it('accepts the example of numerics.md §5 and fills defaults', () => {
    const spec = parseRunSpec(example);
    expect(spec.symmetry).toBe('auto');
    expect(spec.grid.maxPoints).toBeGreaterThanOrEqual(spec.grid.points);
    expect(spec.time.tolerance).toBe(1e-6);
  });

  it('fills every default of a minimal spec', () => {
    const spec = parseRunSpec({
      domain: { kind: 'ball', dim: 2, boundaryAngle: 1 },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      grid: { points: 100 },
      time: { tMax: 2 },
    });
    expect(spec.flow).toBe('standard');
    expect(spec.time.tolerance).toBe(RUN_SPEC_DEFAULTS.tolerance);
    expect(spec.time.maxStep).toBe(2 * RUN_SPEC_DEFAULTS.maxStepFraction);
    expect(spec.stop).toEqual({ tension: RUN_SPEC_DEFAULTS.tension, gradientBound: RUN_SPEC_DEFAULTS.gradientBound });
    // Normalizing twice changes nothing (the API and UI show the normalized form).
    expect(withRunSpecDefaults(runSpecSchema.parse(spec))).toEqual(spec);
  });

  const bad: [string, unknown, string, RegExp][] = [
    ['NaN points', withPath('grid.points', Number.NaN), 'grid.points', /integer from 20 to 20000/],
    ['Infinity tMax', withPath('time.tMax', Number.POSITIVE_INFINITY), 'time.tMax', /finite number/],
    ['negative points', withPath('grid.points', -5), 'grid.points', /from 20 to 20000/],
    ['huge grid', withPath('grid.points', 10_000_000), 'grid.points', /from 20 to 20000/],
    ['fractional points', withPath('grid.points', 100.5), 'grid.points', /integer/],
    ['string points', withPath('grid.points', '400'), 'grid.points', /integer/],
    ['unknown domain kind', withPath('domain', { kind: 'torus', dim: 3 }), 'domain.kind', /"sphere", "ball"/],
    ['unknown target kind', withPath('target', { kind: 'cube' }), 'target.kind', /"sphere", "ellipsoid", "profile"/],
    ['unknown initial kind', withPath('initial', { kind: 'random' }), 'initial.kind', /"identity"/],
    ['unknown flow', withPath('flow', 'mean-curvature'), 'flow', /"standard", "normalized"/],
    ['dim too large', withPath('domain.dim', 13), 'domain.dim', /integer from 2 to 12/],
    ['negative axis ratio', withPath('target.axisRatio', -1), 'target.axisRatio', /from 0.01 to 100/],
    ['tMax above cap', withPath('time.tMax', 1e9), 'time.tMax', /at most 1000000/],
    ['tolerance too loose', withPath('time.tolerance', 0.5), 'time.tolerance', /from 1e-12 to 0.01/],
    ['negative maxStep', withPath('time.maxStep', -0.1), 'time.maxStep', /greater than 0/],
    ['gradient bound too small', withPath('stop.gradientBound', 1), 'stop.gradientBound', /from 10 to/],
    ['ball without boundaryAngle', withPath('domain', { kind: 'ball', dim: 3 }), 'domain.boundaryAngle', /boundaryAngle/],
    [
      'normalized flow on the ball',
      { ...withPath('domain', { kind: 'ball', dim: 3, boundaryAngle: 1 }), flow: 'normalized' },
      'flow',
      /only on the sphere/,
    ],
    ['unknown field', { ...example, colour: 'red' }, '(spec)', /unknown field colour/],
    ['not an object', 42, '(spec)', /JSON object/],
    [
      'reflection with non-symmetric data',
      { ...example, initial: { kind: 'dilated', s: 2 }, symmetry: 'reflection' },
      'symmetry',
      /reflection-symmetric/,
    ],
    ['perturbed with a non-integer mode', withPath('initial', { kind: 'perturbed', amplitude: 0.1, mode: 1.5 }), 'initial.mode', /integer from 1 to 64/],
    ['refinement cap above limit', withPath('grid.maxPoints', 1e6), 'grid.maxPoints', /to 50000/],
  ];
  for (const [name, input, path, message] of bad) {
    it(`rejects ${name}, naming ${path}`, () => {
      const e = firstError(input);
      expect(e.path).toBe(path);
      expect(e.message).toMatch(message);
    });
  }

  it('throws RunSpecError whose message names the field', () => {
    expect(() => parseRunSpec(withPath('grid.points', 0))).toThrow(RunSpecError);
    expect(() => parseRunSpec(withPath('grid.points', 0))).toThrow(/grid\.points/);
  });

  it('rejects every non-finite or out-of-range number at any numeric field (property-based)', () => {
    const fields: [string, number, number][] = [
      ['grid.points', RUN_SPEC_LIMITS.pointsMin, RUN_SPEC_LIMITS.pointsMax],
      ['time.tMax', 0, RUN_SPEC_LIMITS.tMaxMax],
      ['time.tolerance', RUN_SPEC_LIMITS.toleranceMin, RUN_SPEC_LIMITS.toleranceMax],
      ['stop.gradientBound', RUN_SPEC_LIMITS.gradientBoundMin, RUN_SPEC_LIMITS.gradientBoundMax],
      ['target.axisRatio', RUN_SPEC_LIMITS.axisRatioMin, RUN_SPEC_LIMITS.axisRatioMax],
      ['domain.dim', RUN_SPEC_LIMITS.dimMin, RUN_SPEC_LIMITS.dimMax],
    ];
    const badNumber = fc.oneof(
      fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, -1, -1e300, 1e300),
      fc.double({ noNaN: true, min: -1e12, max: -1e-300 }),
    );
    const badValue = fc.oneof(badNumber, fc.string(), fc.constant(null), fc.boolean(), fc.array(fc.integer()));
    fc.assert(
      fc.property(fc.constantFrom(...fields), badValue, ([field, min, max], value) => {
        if (typeof value === 'number' && value >= min && value <= max && value > 0) return; // in range: not bad
        const e = firstError(withPath(field, value));
        expect(e.path).toBe(field);
        expect(e.message.startsWith(field)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
