import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';

/** Fields that put a resting run back into the scheduler's hands. */
export const REQUEUE_FIELDS = {
  state: 'queued' as const,
  wait_reason: null,
  pause_reason: null,
  control_request: null,
  dispatched_at: null,
  worker_id: null,
  outcome: null,
  outcome_reason: null,
  summary: null,
  error: null,
  finished_at: null,
};

/**
 * Stops a run that no worker holds yet (queued or waiting) in one conditional
 * update; returns false when a worker claimed it meanwhile, so the caller asks
 * the holder instead.
 */
export async function stopUnclaimedRun(db: Kysely<Database>, runId: string, state: 'paused' | 'cancelled'): Promise<{ stopped: boolean; attempt: number }> {
  const row = await db
    .updateTable('runs')
    .set({ state, pause_reason: state === 'paused' ? 'request' : null, dispatched_at: null, wait_reason: null, control_request: null, updated_at: new Date() })
    .where('id', '=', runId)
    .where('state', 'in', ['queued', 'waiting'])
    .returning(['attempt'])
    .executeTakeFirst();
  return { stopped: Boolean(row), attempt: row?.attempt ?? 0 };
}
