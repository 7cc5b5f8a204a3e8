import { z } from 'zod';
import { safeParseRunSpec, type RunSpec } from '../spec';
import type { ErrorDetail } from '../api/errors';

// A sweep is the Cartesian product of its axes applied to a base spec
// (architecture.md, "The API surface"). Each axis names a numeric spec field by
// its dotted path and gives values or a linear/log range.

/** Numeric fields of the run spec a sweep may vary. */
export const SWEEPABLE_PATHS = [
  'domain.dim',
  'domain.boundaryAngle',
  'target.axisRatio',
  'initial.slope',
  'initial.s',
  'initial.amplitude',
  'initial.mode',
  'grid.points',
  'grid.maxPoints',
  'time.tMax',
  'time.maxStep',
  'time.tolerance',
  'stop.tension',
  'stop.gradientBound',
] as const;
export type SweepablePath = (typeof SWEEPABLE_PATHS)[number];

export const SWEEP_LIMITS = {
  /** Largest number of runs one sweep may create. */
  maxRuns: 5_000,
  /** Largest number of axes. */
  maxAxes: 6,
  /** Values per axis. */
  maxValuesPerAxis: 1_000,
} as const;

const finite = (field: string) =>
  z.number({ error: `${field} must be a finite number` }).refine(Number.isFinite, { message: `${field} must be a finite number` });

const rangeSchema = z
  .strictObject({
    from: finite('range.from'),
    to: finite('range.to'),
    steps: z
      .number({ error: `range.steps must be an integer from 1 to ${SWEEP_LIMITS.maxValuesPerAxis}` })
      .int({ error: `range.steps must be an integer from 1 to ${SWEEP_LIMITS.maxValuesPerAxis}` })
      .min(1, { error: `range.steps must be an integer from 1 to ${SWEEP_LIMITS.maxValuesPerAxis}` })
      .max(SWEEP_LIMITS.maxValuesPerAxis, { error: `range.steps must be an integer from 1 to ${SWEEP_LIMITS.maxValuesPerAxis}` }),
    scale: z.enum(['linear', 'log'], { error: 'range.scale must be "linear" or "log"' }).default('linear'),
  })
  .refine((range) => range.scale !== 'log' || (range.from > 0 && range.to > 0), {
    message: 'a log range needs from > 0 and to > 0',
    path: ['from'],
  })
  .refine((range) => range.steps === 1 || range.from !== range.to, {
    message: 'a range with more than one step needs from ≠ to',
    path: ['to'],
  });

export const sweepAxisSchema = z
  .strictObject(
    {
      path: z.enum(SWEEPABLE_PATHS, { error: `path must be one of ${SWEEPABLE_PATHS.join(', ')}` }),
      values: z
        .array(finite('each value'), { error: 'values must be a list of numbers' })
        .min(1, { error: 'values must list at least one number' })
        .max(SWEEP_LIMITS.maxValuesPerAxis, { error: `values may list at most ${SWEEP_LIMITS.maxValuesPerAxis} numbers` })
        .optional(),
      range: rangeSchema.optional(),
    },
    { error: 'each axis must be an object with a path and either values or a range' },
  )
  .refine((axis) => (axis.values === undefined) !== (axis.range === undefined), {
    message: 'each axis needs either values or a range (not both)',
  });
export type SweepAxis = z.infer<typeof sweepAxisSchema>;

export const sweepAxesSchema = z
  .array(sweepAxisSchema, { error: 'axes must be a list' })
  .max(SWEEP_LIMITS.maxAxes, { error: `a sweep may have at most ${SWEEP_LIMITS.maxAxes} axes` })
  .refine((axes) => new Set(axes.map((axis) => axis.path)).size === axes.length, { message: 'each path may appear in one axis only' });

/** The values of one axis, in order (a range's ends included). */
export function axisValues(axis: SweepAxis): number[] {
  if (axis.values) return [...axis.values];
  const { from, to, steps, scale } = axis.range!;
  if (steps === 1) return [from];
  const out: number[] = [];
  for (let i = 0; i < steps; i++) {
    const f = i / (steps - 1);
    out.push(scale === 'log' ? Math.exp(Math.log(from) + f * (Math.log(to) - Math.log(from))) : from + f * (to - from));
  }
  // Land exactly on the ends a person typed, free of round-off.
  out[0] = from;
  out[steps - 1] = to;
  return out;
}

/** Number of runs of a sweep, without expanding it. */
export function sweepRunCount(axes: SweepAxis[]): number {
  return axes.reduce((count, axis) => count * (axis.values ? axis.values.length : axis.range!.steps), 1);
}

function setPath(target: Record<string, any>, path: string, value: number): void {
  const [head, field] = path.split('.');
  if (typeof target[head] !== 'object' || target[head] === null) target[head] = {};
  target[head][field] = value;
}

export interface ExpandedRun {
  index: number;
  axisValues: Record<string, number>;
  spec: RunSpec;
}

export type SweepExpansion =
  | { ok: true; runs: ExpandedRun[] }
  | { ok: false; message: string; details: ErrorDetail[] };

/**
 * Applies every combination of axis values to the base spec and validates each
 * resulting spec with the one run-spec schema. Fails on the first bad run,
 * naming it and the field, so nothing is written for a sweep with a bad run.
 */
export function expandSweep(base: unknown, axes: SweepAxis[]): SweepExpansion {
  const total = sweepRunCount(axes);
  if (total > SWEEP_LIMITS.maxRuns) {
    return {
      ok: false,
      message: `this sweep would create ${total} runs; at most ${SWEEP_LIMITS.maxRuns} are allowed`,
      details: [{ path: 'axes', message: `${total} runs exceed the cap of ${SWEEP_LIMITS.maxRuns}` }],
    };
  }
  const baseCheck = safeParseRunSpec(base);
  if (!baseCheck.success) {
    return { ok: false, message: `base: ${baseCheck.message}`, details: baseCheck.issues.map((i) => ({ path: `base.${i.path}`, message: i.message })) };
  }
  const values = axes.map(axisValues);
  const runs: ExpandedRun[] = [];
  const counters = axes.map(() => 0);
  for (let index = 0; index < total; index++) {
    const spec = structuredClone(base) as Record<string, any>;
    const chosen: Record<string, number> = {};
    axes.forEach((axis, a) => {
      const value = values[a][counters[a]];
      setPath(spec, axis.path, value);
      chosen[axis.path] = value;
    });
    const parsed = safeParseRunSpec(spec);
    if (!parsed.success) {
      const where = Object.entries(chosen).map(([path, value]) => `${path} = ${value}`).join(', ');
      return {
        ok: false,
        message: `run ${index + 1} (${where}): ${parsed.message}`,
        details: parsed.issues.map((issue) => ({ path: `axes → ${issue.path}`, message: `${issue.message} (run ${index + 1}: ${where})` })),
      };
    }
    runs.push({ index, axisValues: chosen, spec: parsed.spec });
    // Odometer: the last axis varies fastest.
    for (let a = axes.length - 1; a >= 0; a--) {
      counters[a]++;
      if (counters[a] < values[a].length) break;
      counters[a] = 0;
    }
  }
  return { ok: true, runs };
}
