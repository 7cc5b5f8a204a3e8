import { z } from 'zod';
import { sweepAxesSchema } from '../sweeps/sweep-axes';
import { RUN_STATES } from './runs.schemas';

const uuid = (field: string) => z.string({ error: `${field} must be an id` }).uuid({ error: `${field} must be an id` });

const sweepName = z.string({ error: 'name is required' }).trim().min(1, { error: 'name is required' }).max(200, { error: 'name may have at most 200 characters' });
const sweepPriority = z.number({ error: 'priority must be an integer from -10 to 10' }).int({ error: 'priority must be an integer from -10 to 10' }).min(-10, { error: 'priority must be an integer from -10 to 10' }).max(10, { error: 'priority must be an integer from -10 to 10' });

/** Body of `POST /api/sweeps`. `base` is checked by the run-spec schema during expansion. */
export const createSweepRequestSchema = z.strictObject({
  studyId: uuid('studyId'),
  name: sweepName,
  base: z.unknown().refine((value) => typeof value === 'object' && value !== null && !Array.isArray(value), {
    message: 'base must be a run spec object',
  }),
  axes: sweepAxesSchema,
  priority: sweepPriority.default(0),
});
export type CreateSweepRequest = z.infer<typeof createSweepRequestSchema>;

/** Body of `POST /api/sweeps/preview`: the same as a sweep, the name optional. */
export const sweepPreviewRequestSchema = createSweepRequestSchema.extend({ name: sweepName.optional() });
export type SweepPreviewRequest = z.infer<typeof sweepPreviewRequestSchema>;

export interface QuotaPreview {
  /** Concurrent runs the user may have. */
  slots: number;
  /** Runs of the user in flight now. */
  slotsInUse: number;
  /** CPU-hours the user may still use this month; null when unlimited. */
  cpuHoursRemaining: number | null;
}

export interface SweepPreviewResponse {
  runCount: number;
  /** Rough prediction (see `estimateRunCpuSeconds`), for planning only. */
  estimatedCpuHours: number;
  quota: QuotaPreview;
  /** The first few expanded specs, for a person to check. */
  sample: { axisValues: Record<string, number> }[];
}

export interface Sweep {
  id: string;
  studyId: string;
  ownerId: string;
  name: string;
  baseSpec: unknown;
  axes: unknown;
  runCount: number;
  createdAt: string;
  /** Runs per state. */
  counts: Partial<Record<(typeof RUN_STATES)[number], number>>;
}

export const SWEEP_RUN_SORTS = ['index', 'created', 'state', 'outcome', 'cpu', 'energy'] as const;

/** Query of `GET /api/sweeps/:id/runs` (and the runs of a study). */
export const runListQuerySchema = z.strictObject({
  state: z.enum(RUN_STATES, { error: `state must be one of ${RUN_STATES.join(', ')}` }).optional(),
  outcome: z.enum(['converged', 'blowup', 'time-limit', 'numerics-failed', 'degenerate'], { error: 'outcome is not a known outcome' }).optional(),
  sort: z.enum(SWEEP_RUN_SORTS, { error: `sort must be one of ${SWEEP_RUN_SORTS.join(', ')}` }).default('index'),
  order: z.enum(['asc', 'desc'], { error: 'order must be asc or desc' }).default('asc'),
  page: z.coerce.number({ error: 'page must be a whole number from 1' }).int().min(1, { error: 'page must be a whole number from 1' }).default(1),
  pageSize: z.coerce.number({ error: 'pageSize must be from 1 to 500' }).int().min(1, { error: 'pageSize must be from 1 to 500' }).max(500, { error: 'pageSize must be from 1 to 500' }).default(50),
});
export type RunListQuery = z.infer<typeof runListQuerySchema>;

/** Query of `GET /api/runs`: runs the caller can see, across studies. */
export const runSearchQuerySchema = runListQuerySchema.extend({
  scope: z.enum(['mine', 'all'], { error: 'scope must be mine or all' }).default('mine'),
  studyId: uuid('studyId').optional(),
  sort: z.enum(SWEEP_RUN_SORTS, { error: `sort must be one of ${SWEEP_RUN_SORTS.join(', ')}` }).default('created'),
  order: z.enum(['asc', 'desc'], { error: 'order must be asc or desc' }).default('desc'),
});
export type RunSearchQuery = z.infer<typeof runSearchQuerySchema>;

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

/** Query of `GET /api/runs/:id/metrics`: samples after step `from`. */
export const metricsQuerySchema = z.strictObject({
  from: z.coerce.number({ error: 'from must be a step number' }).int().min(-1).default(-1),
  limit: z.coerce.number({ error: 'limit must be from 1 to 20000' }).int().min(1).max(20_000).default(5_000),
});
export type MetricsQuery = z.infer<typeof metricsQuerySchema>;

/** Body of `POST /api/checkpoints/:id/fork`: spec fields to change, e.g. `{ "grid": { "points": 800 } }`. */
export const forkRequestSchema = z.strictObject({
  overrides: z
    .record(z.string(), z.unknown(), { error: 'overrides must be an object of spec fields' })
    .default({}),
});
export type ForkRequest = z.infer<typeof forkRequestSchema>;

/** Path parameter that must be an id. */
export const idParamSchema = uuid('id');
