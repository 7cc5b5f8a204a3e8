import { z } from 'zod';

// Job contracts between the API (producer) and the workers (style.md, item 7).
// The queue carries only ids: PostgreSQL holds the run, its spec and its results.

/** The one BullMQ queue of Kiln's simulations. */
export const RUN_QUEUE = 'kiln-runs';

export enum RunJobName {
  Simulate = 'simulate-run',
}

/** Payload of a `simulate-run` job: which run, and which admission of it. */
export const simulateRunPayloadSchema = z.strictObject({
  runId: z.string().uuid(),
  /** The run's `attempt` when it was admitted; a job whose attempt is stale is dropped. */
  attempt: z.number().int().min(1),
});
export type SimulateRunPayload = z.infer<typeof simulateRunPayloadSchema>;

/** BullMQ job id of an admission (no colon: BullMQ reserves it). */
export function simulateRunJobId({ runId, attempt }: SimulateRunPayload): string {
  return `run-${runId}-${attempt}`;
}

/** Redis pub/sub channels. */
export const CHANNELS = {
  /** `{ runId, request }`: a pause or cancel was written on the run row; the holder acts on it. */
  control: 'kiln:control',
  /** `RunEvent`s for the live view. */
  runEvents: 'kiln:run-events',
} as const;

export const controlMessageSchema = z.strictObject({
  runId: z.string().uuid(),
  request: z.enum(['pause', 'cancel']),
});
export type ControlMessage = z.infer<typeof controlMessageSchema>;
