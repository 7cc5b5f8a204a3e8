import { z } from 'zod';
import { RUN_SPEC_DEFAULTS, RUN_SPEC_LIMITS as L } from './run-spec.limits';

// The run specification of numerics.md §5 as ONE zod schema. Every message names
// the field by its dotted path and states what is allowed, so the API, the CLI and
// the UI can show it as is.

function fmt(x: number): string {
  if (x === Math.PI * 4) return '4π';
  return String(x);
}

/** A finite number in [min, max] (or (min, max] with `exclusiveMin`), one message for every failure. */
function boundedNumber(
  field: string,
  min: number,
  max: number,
  opts: { integer?: boolean; exclusiveMin?: boolean; symmetric?: boolean } = {},
) {
  const what = opts.integer ? 'an integer' : 'a finite number';
  const range = opts.symmetric
    ? `with |${field.split('.').pop()}| at most ${fmt(max)}`
    : opts.exclusiveMin
      ? `greater than ${fmt(min)} and at most ${fmt(max)}`
      : `from ${fmt(min)} to ${fmt(max)}`;
  const error = `${field} must be ${what} ${range}`;
  let s = z.number({ error });
  if (opts.integer) s = s.int({ error });
  s = opts.exclusiveMin ? s.gt(min, { error }) : s.gte(min, { error });
  return s.lte(max, { error });
}

/** Object-level messages: wrong type gets `typeMessage`, unknown keys are named. */
function objectError(field: string, typeMessage: string) {
  return (iss: { code?: string; keys?: string[] }) => {
    if (iss.code === 'unrecognized_keys') {
      const keys = (iss.keys ?? []).map((k) => (field ? `${field}.${k}` : k));
      return `unknown field${keys.length > 1 ? 's' : ''} ${keys.join(', ')}`;
    }
    return typeMessage;
  };
}

function kindError(field: string, kinds: readonly string[]): string {
  return `${field} must be one of ${kinds.map((k) => `"${k}"`).join(', ')}`;
}

const uploadId = (field: string) =>
  z
    .string({ error: `${field} must be a non-empty string of at most ${L.uploadIdMaxLength} characters` })
    .min(1, { error: `${field} must be a non-empty string of at most ${L.uploadIdMaxLength} characters` })
    .max(L.uploadIdMaxLength, { error: `${field} must be a non-empty string of at most ${L.uploadIdMaxLength} characters` });

export const DOMAIN_KINDS = ['sphere', 'ball'] as const;
export const TARGET_KINDS = ['sphere', 'ellipsoid', 'profile'] as const;
export const FLOW_KINDS = ['standard', 'normalized'] as const;
export const INITIAL_KINDS = ['identity', 'linear', 'dilated', 'perturbed', 'table'] as const;
export const SYMMETRY_MODES = ['auto', 'reflection', 'none'] as const;

const dim = boundedNumber('domain.dim', L.dimMin, L.dimMax, { integer: true });

const domainSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({ kind: z.literal('sphere'), dim }),
    z.strictObject({
      kind: z.literal('ball'),
      dim,
      boundaryAngle: boundedNumber('domain.boundaryAngle', -L.boundaryAngleMax, L.boundaryAngleMax, {
        symmetric: true,
      }),
    }),
  ],
  { error: kindError('domain.kind', DOMAIN_KINDS) },
);

const targetSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({ kind: z.literal('sphere') }),
    z.strictObject({
      kind: z.literal('ellipsoid'),
      axisRatio: boundedNumber('target.axisRatio', L.axisRatioMin, L.axisRatioMax),
    }),
    z.strictObject({ kind: z.literal('profile'), uploadId: uploadId('target.uploadId') }),
  ],
  { error: kindError('target.kind', TARGET_KINDS) },
);

const initialSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({ kind: z.literal('identity') }),
    z.strictObject({
      kind: z.literal('linear'),
      slope: boundedNumber('initial.slope', -L.slopeMax, L.slopeMax, { symmetric: true }),
    }),
    z.strictObject({
      kind: z.literal('dilated'),
      s: boundedNumber('initial.s', L.dilationMin, L.dilationMax),
    }),
    z.strictObject({
      kind: z.literal('perturbed'),
      amplitude: boundedNumber('initial.amplitude', -L.amplitudeMax, L.amplitudeMax, { symmetric: true }),
      mode: boundedNumber('initial.mode', L.modeMin, L.modeMax, { integer: true }),
    }),
    z.strictObject({ kind: z.literal('table'), uploadId: uploadId('initial.uploadId') }),
  ],
  { error: kindError('initial.kind', INITIAL_KINDS) },
);

const gridSchema = z.strictObject(
  {
    points: boundedNumber('grid.points', L.pointsMin, L.pointsMax, { integer: true }),
    maxPoints: boundedNumber('grid.maxPoints', L.pointsMin, L.refinedPointsMax, { integer: true }).optional(),
  },
  { error: objectError('grid', 'grid must be an object with points') },
);

const timeSchema = z.strictObject(
  {
    tMax: boundedNumber('time.tMax', 0, L.tMaxMax, { exclusiveMin: true }),
    maxStep: boundedNumber('time.maxStep', 0, L.tMaxMax, { exclusiveMin: true }).optional(),
    tolerance: boundedNumber('time.tolerance', L.toleranceMin, L.toleranceMax).optional(),
  },
  { error: objectError('time', 'time must be an object with tMax') },
);

const stopSchema = z.strictObject(
  {
    tension: boundedNumber('stop.tension', L.tensionMin, L.tensionMax).optional(),
    gradientBound: boundedNumber('stop.gradientBound', L.gradientBoundMin, L.gradientBoundMax).optional(),
  },
  { error: objectError('stop', 'stop must be an object') },
);

/** True when `initial` on the sphere satisfies h(π − r) = π − h(r) (numerics.md, "Reflection symmetry"). */
export function initialIsReflectionSymmetric(initial: z.infer<typeof initialSchema>): boolean | 'unknown' {
  switch (initial.kind) {
    case 'identity':
      return true;
    case 'dilated':
      // γ_s(π − r) = π − γ_s(r) only for s = 1.
      return initial.s === 1;
    case 'perturbed':
      // r + A sin(k r) is reflection-symmetric iff cos(kπ) = 1, i.e. k even (or A = 0).
      return initial.amplitude === 0 || initial.mode % 2 === 0;
    case 'linear':
      return false;
    case 'table':
      return 'unknown';
  }
}

/**
 * The run spec (numerics.md §5). Optional fields get the defaults of
 * {@link RUN_SPEC_DEFAULTS} through {@link withRunSpecDefaults} / {@link parseRunSpec}.
 */
export const runSpecSchema = z
  .strictObject(
    {
      domain: domainSchema,
      target: targetSchema,
      flow: z.enum(FLOW_KINDS, { error: kindError('flow', FLOW_KINDS) }).optional(),
      initial: initialSchema,
      symmetry: z.enum(SYMMETRY_MODES, { error: kindError('symmetry', SYMMETRY_MODES) }).optional(),
      grid: gridSchema,
      time: timeSchema,
      stop: stopSchema.optional(),
    },
    { error: objectError('', 'the run spec must be a JSON object') },
  )
  .superRefine((spec, ctx) => {
    const onBall = spec.domain.kind === 'ball';
    if (onBall && spec.flow === 'normalized') {
      ctx.addIssue({
        code: 'custom',
        path: ['flow'],
        message: 'flow "normalized" is defined only on the sphere domain (use "standard" on the ball)',
      });
    }
    if (onBall && spec.symmetry !== undefined && spec.symmetry !== 'none' && spec.symmetry !== 'auto') {
      ctx.addIssue({
        code: 'custom',
        path: ['symmetry'],
        message: 'symmetry "reflection" applies only to the sphere domain (use "auto" or "none" on the ball)',
      });
    }
    if (!onBall && spec.initial.kind === 'linear') {
      ctx.addIssue({
        code: 'custom',
        path: ['initial', 'kind'],
        message: 'initial.kind "linear" is defined only on the ball domain (h(π) = π fixes the sphere\'s end)',
      });
    }
    if (onBall && spec.initial.kind === 'dilated') {
      ctx.addIssue({
        code: 'custom',
        path: ['initial', 'kind'],
        message: 'initial.kind "dilated" (h₀ = γ_s(r)) is defined only on the sphere domain',
      });
    }
    if (!onBall && spec.symmetry === 'reflection' && initialIsReflectionSymmetric(spec.initial) === false) {
      ctx.addIssue({
        code: 'custom',
        path: ['symmetry'],
        message:
          'symmetry "reflection" needs reflection-symmetric initial data h(π − r) = π − h(r) (identity, dilated with s = 1, perturbed with an even mode)',
      });
    }
    if (spec.grid.maxPoints !== undefined && spec.grid.maxPoints < spec.grid.points) {
      ctx.addIssue({
        code: 'custom',
        path: ['grid', 'maxPoints'],
        message: `grid.maxPoints must be an integer from grid.points (${spec.grid.points}) to ${L.refinedPointsMax}`,
      });
    }
    if (spec.time.maxStep !== undefined && spec.time.maxStep > spec.time.tMax) {
      ctx.addIssue({
        code: 'custom',
        path: ['time', 'maxStep'],
        message: `time.maxStep must be greater than 0 and at most time.tMax (${spec.time.tMax})`,
      });
    }
  });

/** The spec as a client may send it (optional fields may be missing). */
export type RunSpecInput = z.input<typeof runSpecSchema>;
type Parsed = z.output<typeof runSpecSchema>;

/** The normalized run spec: every optional field filled with its default. */
export interface RunSpec {
  domain: Parsed['domain'];
  target: Parsed['target'];
  flow: (typeof FLOW_KINDS)[number];
  initial: Parsed['initial'];
  /** Requested symmetry mode; the mode actually used is reported by the engine. */
  symmetry: (typeof SYMMETRY_MODES)[number];
  grid: { points: number; maxPoints: number };
  time: { tMax: number; maxStep: number; tolerance: number };
  stop: { tension: number; gradientBound: number };
}

export type DomainSpec = RunSpec['domain'];
export type TargetSpec = RunSpec['target'];
export type InitialSpec = RunSpec['initial'];
export type SymmetryMode = RunSpec['symmetry'];
export type FlowKind = RunSpec['flow'];

/** Fills the defaults of an already validated spec (the API and the UI show this normalized form). */
export function withRunSpecDefaults(spec: Parsed): RunSpec {
  const D = RUN_SPEC_DEFAULTS;
  const points = spec.grid.points;
  const maxPoints =
    spec.grid.maxPoints ??
    Math.min(L.refinedPointsMax, Math.max(D.maxPointsFactor * points, points + D.maxPointsExtra));
  return {
    domain: { ...spec.domain },
    target: { ...spec.target },
    flow: spec.flow ?? D.flow,
    initial: { ...spec.initial },
    symmetry: spec.symmetry ?? D.symmetry,
    grid: { points, maxPoints },
    time: {
      tMax: spec.time.tMax,
      maxStep: spec.time.maxStep ?? spec.time.tMax * D.maxStepFraction,
      tolerance: spec.time.tolerance ?? D.tolerance,
    },
    stop: {
      tension: spec.stop?.tension ?? D.tension,
      gradientBound: spec.stop?.gradientBound ?? D.gradientBound,
    },
  };
}

export type RunSpecParseResult =
  | { success: true; spec: RunSpec }
  | { success: false; error: z.ZodError; message: string; issues: { path: string; message: string }[] };

/** Validates unknown input (parsed JSON) and fills defaults. Never throws. */
export function safeParseRunSpec(input: unknown): RunSpecParseResult {
  const result = runSpecSchema.safeParse(input);
  if (result.success) return { success: true, spec: withRunSpecDefaults(result.data) };
  const issues = result.error.issues.map((i) => ({
    path: i.path.map(String).join('.') || '(spec)',
    message: i.message,
  }));
  const first = issues[0];
  const message = first
    ? `${first.path}: ${first.message}${issues.length > 1 ? ` (and ${issues.length - 1} more)` : ''}`
    : 'invalid run spec';
  return { success: false, error: result.error, message, issues };
}

/** Error thrown by {@link parseRunSpec}; `message` names the first bad field. */
export class RunSpecError extends Error {
  constructor(
    message: string,
    readonly issues: { path: string; message: string }[],
  ) {
    super(message);
    this.name = 'RunSpecError';
  }
}

/** Validates unknown input and fills defaults; throws {@link RunSpecError} naming the field. */
export function parseRunSpec(input: unknown): RunSpec {
  const r = safeParseRunSpec(input);
  if (!r.success) throw new RunSpecError(r.message, r.issues);
  return r.spec;
}
