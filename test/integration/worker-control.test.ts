import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Queue } from 'bullmq';
import { sql } from 'kysely';
import { Redis } from 'ioredis';
import { CHANNELS, type ControlMessage } from '@kiln/shared';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { waitFor } from '../support/ports';
import {
  admitRun,
  checkpointRows,
  createOwnerAndStudy,
  holderPid,
  insertRun,
  longBallSpec,
  metricRows,
  referenceRun,
  runQueue,
  runRow,
  startWorker,
  stopProcesses,
  waitForRun,
  waitForState,
  withoutCpu,
  type Reference,
  type WorkerProcess,
} from '../support/worker-harness';

// Pause, resume and cancel as the API does them: write control_request on the row,
// announce it on the control channel; resume = queued again with a new admission.
describe('worker control: pause, resume, cancel, corrupted checkpoints', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let publisher: Redis;
  let queue: Queue;
  let owner: { ownerId: string; studyId: string };
  let reference: Reference;
  const spec = longBallSpec(20);
  const workers: WorkerProcess[] = [];

  const request = async (runId: string, what: ControlMessage['request'], mustBeRunning = true) => {
    // As the API does: only a running run gets a request for its holder.
    const asked = await database.db
      .updateTable('runs')
      .set({ control_request: what })
      .where('id', '=', runId)
      .where('state', '=', 'running')
      .executeTakeFirst();
    if (mustBeRunning) expect(Number(asked.numUpdatedRows), `run ${runId} was no longer running when asked to ${what}`).toBe(1);
    await publisher.publish(CHANNELS.control, JSON.stringify({ runId, request: what } satisfies ControlMessage));
    return performance.now();
  };
  const runningPast = (runId: string, step: number) =>
    waitForRun(database.db, runId, `run ${runId} past step ${step}`, (row) => row.state === 'running' && ((row.progress as { step: number } | null)?.step ?? 0) > step);
  const expectIdenticalToReference = async (runId: string) => {
    const row = await waitForState(database.db, runId, ['finished', 'failed'], 60_000);
    expect(row.error).toBeNull();
    expect(row.state).toBe('finished');
    expect(withoutCpu(row.summary)).toEqual(withoutCpu(reference.summary));
    expect((row.summary as { energyFinal: number }).energyFinal).toBe(reference.summary.energyFinal);
    const metrics = await metricRows(database.db, runId);
    expect(metrics.map((m) => m.step)).toEqual(reference.samples.map((s) => s.step));
    expect(metrics.map((m) => m.energy)).toEqual(reference.samples.map((s) => s.energy));
  };

  beforeAll(async () => {
    [database, redis] = await Promise.all([createTestDatabase(), startTestRedis()]);
    queue = runQueue(redis.url);
    publisher = new Redis(redis.url);
    owner = await createOwnerAndStudy(database.db);
    for (const host of ['control-a', 'control-b']) {
      workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host, checkpointSeconds: 1 }));
    }
    reference = referenceRun(spec);
  });
  afterAll(async () => {
    await stopProcesses(workers);
    publisher?.disconnect();
    await queue?.close();
    await redis?.stop();
    await database?.drop();
  });

  it('pause checkpoints and stops within a second or two; resume continues bit-identically', async () => {
    const runId = await insertRun(database.db, owner, spec);
    await admitRun(database.db, queue, runId);
    await runningPast(runId, 2000);
    const asked = await request(runId, 'pause');
    const paused = await waitForState(database.db, runId, ['paused', 'finished', 'failed'], 10_000);
    expect(performance.now() - asked).toBeLessThan(2_000);
    expect(paused).toMatchObject({ state: 'paused', dispatched_at: null, control_request: null, outcome: null });
    const checkpoints = await checkpointRows(database.db, runId);
    expect(checkpoints.at(-1)!.reason).toBe('pause');
    // The request went through the holder's control channel.
    expect(workers.map((w) => w.output()).join('')).toContain(`run ${runId}: pause requested`);

    // Resume: queued again and admitted with the next attempt.
    await admitRun(database.db, queue, runId);
    await expectIdenticalToReference(runId);
  });

  it('cancel stops the run within ~2 s and frees its slot for the next job', async () => {
    const [a, b, c] = [
      await insertRun(database.db, owner, spec),
      await insertRun(database.db, owner, spec),
      await insertRun(database.db, owner, spec),
    ];
    await admitRun(database.db, queue, a);
    await admitRun(database.db, queue, b);
    await runningPast(a, 200);
    await runningPast(b, 200);
    await admitRun(database.db, queue, c);
    // Both slots are busy: c waits in the queue.
    await new Promise((resolve) => setTimeout(resolve, 500));
    expect((await runRow(database.db, c)).state).toBe('queued');
    const aHolder = await holderPid(database.db, a);

    const asked = await request(a, 'cancel');
    const cancelled = await waitForState(database.db, a, ['cancelled', 'finished', 'failed'], 10_000);
    expect(performance.now() - asked).toBeLessThan(2_000);
    expect(cancelled).toMatchObject({ state: 'cancelled', dispatched_at: null, control_request: null });
    expect((await checkpointRows(database.db, a)).at(-1)!.reason).toBe('cancel');
    // The freed slot takes the waiting run.
    await waitForState(database.db, c, ['running', 'finished'], 5_000);
    expect(await holderPid(database.db, c)).toBe(aHolder);

    // Clean up: the other two stop too (or have finished meanwhile).
    await request(b, 'cancel', false);
    await request(c, 'cancel', false);
    await waitForState(database.db, b, ['cancelled', 'finished']);
    await waitForState(database.db, c, ['cancelled', 'finished']);
  });

  it('a corrupted latest checkpoint is skipped on load; the run continues from the one before and finishes identically', async () => {
    const runId = await insertRun(database.db, owner, spec);
    await admitRun(database.db, queue, runId);
    await waitFor('an interval checkpoint', async () =>
      (await checkpointRows(database.db, runId)).some((c) => c.reason === 'interval'),
    );
    await request(runId, 'pause');
    await waitForState(database.db, runId, ['paused']);
    const checkpoints = await checkpointRows(database.db, runId);
    const latest = checkpoints.at(-1)!;
    const previous = checkpoints.at(-2)!;
    expect(latest.reason).toBe('pause');
    // Flip one byte inside the solution arrays.
    await database.db
      .updateTable('checkpoints')
      .set({ state: sql`set_byte(state, length(state) - 100, (get_byte(state, length(state) - 100) + 1) % 256)` })
      .where('id', '=', latest.id)
      .execute();

    await admitRun(database.db, queue, runId);
    await expectIdenticalToReference(runId);
    const output = workers.map((w) => w.output()).join('');
    expect(output).toContain(`run ${runId}: skipping checkpoint ${latest.seq}: checkpoint ${latest.seq} is corrupted`);
    expect(output).toContain(`run ${runId}: continuing from checkpoint ${previous.seq} `);
  });

  it('resume from an earlier checkpoint continues from that one (recorded as a start checkpoint) and finishes identically', async () => {
    const runId = await insertRun(database.db, owner, spec);
    await admitRun(database.db, queue, runId);
    await waitFor('an interval checkpoint', async () =>
      (await checkpointRows(database.db, runId)).some((c) => c.reason === 'interval'),
    );
    await request(runId, 'pause');
    await waitForState(database.db, runId, ['paused']);
    const chosen = (await checkpointRows(database.db, runId)).find((c) => c.reason === 'interval')!;

    // POST /api/checkpoints/:id/resume as the API does it, then admission.
    await database.db
      .updateTable('runs')
      .set({ state: 'queued', resume_checkpoint_id: chosen.id, dispatched_at: null })
      .where('id', '=', runId)
      .execute();
    await admitRun(database.db, queue, runId);
    await expectIdenticalToReference(runId);
    const row = await runRow(database.db, runId);
    expect(row.resume_checkpoint_id).toBeNull();
    const checkpoints = await checkpointRows(database.db, runId);
    const start = checkpoints.find((c) => c.reason === 'start')!;
    expect(start).toMatchObject({ step: chosen.step, sha256: chosen.sha256 });
    // Everything after the start checkpoint was computed from the chosen one.
    expect(checkpoints.filter((c) => c.seq > start.seq).every((c) => c.step > chosen.step)).toBe(true);
    expect(checkpoints.map((c) => c.seq)).toEqual(checkpoints.map((_, i) => i + 1));
  });

  it('a worker whose lease was taken over stops at its next write and writes nothing more', async () => {
    const runId = await insertRun(database.db, owner, spec);
    const attempt = await admitRun(database.db, queue, runId);
    await runningPast(runId, 500);
    // Another worker claims a newer admission of the run (what a reconciler's re-admission leads to).
    await database.db
      .updateTable('runs')
      .set((eb) => ({ lease: eb('lease', '+', 1), attempt: eb('attempt', '+', 1), worker_id: 'someone-else' }))
      .where('id', '=', runId)
      .execute();
    const takenOver = await runRow(database.db, runId);
    const job = (await queue.getJob(`run-${runId}-${attempt}`))!;
    await expect.poll(async () => (await queue.getJob(job.id!))?.returnvalue, { timeout: 5_000 }).toMatchObject({ runId, status: 'superseded' });
    const checkpoints = (await checkpointRows(database.db, runId)).length;
    const metrics = (await metricRows(database.db, runId)).length;
    await new Promise((resolve) => setTimeout(resolve, 1_500));
    expect((await checkpointRows(database.db, runId)).length).toBe(checkpoints);
    expect((await metricRows(database.db, runId)).length).toBe(metrics);
    const row = await runRow(database.db, runId);
    expect(row).toMatchObject({ state: 'running', worker_id: 'someone-else', lease: takenOver.lease, cpu_seconds: takenOver.cpu_seconds });
    expect(workers.map((w) => w.output()).join('')).toContain(`run ${runId}: lease ${takenOver.lease - 1} was taken over by another worker`);
  });
});
