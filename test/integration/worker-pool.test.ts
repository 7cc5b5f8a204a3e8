import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Queue } from 'bullmq';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import {
  admitRun,
  builtEngine,
  checkpointRows,
  createOwnerAndStudy,
  insertRun,
  metricRows,
  quickSpecs,
  referenceRun,
  runQueue,
  startWorker,
  stopProcesses,
  waitForState,
  withoutCpu,
  type WorkerProcess,
} from '../support/worker-harness';
import { createHash } from 'node:crypto';
import { deserializeCheckpoint, type FlowRun, type RunSpec } from '@kiln/shared';

// Runs on two real worker processes (each one slot) against real PostgreSQL and a
// private Redis; the test plays the scheduler.
describe('worker pool: runs complete on two worker processes', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let queue: Queue;
  const workers: WorkerProcess[] = [];

  beforeAll(async () => {
    [database, redis] = await Promise.all([createTestDatabase(), startTestRedis()]);
    queue = runQueue(redis.url);
    for (const host of ['pool-a', 'pool-b']) {
      workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host }));
    }
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await queue?.close();
    await redis?.stop();
    await database?.drop();
  });

  it('each run ends with the outcome, energy and summary the engine gives for its spec, bit for bit', async () => {
    const owner = await createOwnerAndStudy(database.db);
    const specs = quickSpecs();
    const runIds: string[] = [];
    for (const spec of specs) runIds.push(await insertRun(database.db, owner, spec));
    for (const runId of runIds) await admitRun(database.db, queue, runId);

    const references = specs.map(referenceRun);
    const holders = new Set<string>();
    for (const [i, runId] of runIds.entries()) {
      const row = await waitForState(database.db, runId, ['finished', 'failed'], 60_000);
      const reference = references[i]!;
      expect(row.error).toBeNull();
      expect(row.state).toBe('finished');
      expect(row.outcome).toBe(reference.summary.outcome);
      expect(row.outcome_reason).toBe(reference.summary.reason);
      const summary = row.summary as Record<string, unknown>;
      expect(summary.energyFinal).toBe(reference.summary.energyFinal);
      expect(withoutCpu(summary)).toEqual(withoutCpu(reference.summary));
      expect(summary.cpuSeconds as number).toBeGreaterThan(0);
      expect(row.cpu_seconds).toBe(summary.cpuSeconds);
      expect(row.dispatched_at).toBeNull();
      expect(row.finished_at).not.toBeNull();
      holders.add(row.worker_id!);

      // The metric series is the engine's sample series, step for step.
      const metrics = await metricRows(database.db, runId);
      expect(metrics.map((m) => m.step)).toEqual(reference.samples.map((s) => s.step));
      expect(metrics.map((m) => m.energy)).toEqual(reference.samples.map((s) => s.energy));
      expect((row.progress as { step: number }).step).toBe(reference.summary.steps);

      // Finished with an outcome checkpoint whose bytes match their SHA-256 and read back.
      const checkpoints = await checkpointRows(database.db, runId);
      const last = checkpoints.at(-1)!;
      expect(last.reason).toBe('outcome');
      expect(createHash('sha256').update(last.state).digest('hex')).toBe(last.sha256);
      expect(deserializeCheckpoint(new Uint8Array(last.state)).s.step).toBe(reference.summary.steps);
    }
    // Both processes took work.
    expect(holders.size).toBe(2);
  });

  it('drops a job whose attempt is stale without touching the run', async () => {
    const owner = await createOwnerAndStudy(database.db);
    const runId = await insertRun(database.db, owner, quickSpecs()[0]!);
    const attempt = await admitRun(database.db, queue, runId);
    await waitForState(database.db, runId, ['finished']);
    const before = await database.db.selectFrom('runs').selectAll().where('id', '=', runId).executeTakeFirstOrThrow();
    // A leftover job of the same admission (as after a Redis restore) must not run it again.
    const job = await queue.add('simulate-run', { runId, attempt }, { jobId: `run-${runId}-${attempt}-again` });
    await expect.poll(async () => (await job.getState()), { timeout: 20_000 }).toBe('completed');
    const after = await database.db.selectFrom('runs').selectAll().where('id', '=', runId).executeTakeFirstOrThrow();
    expect(after.lease).toBe(before.lease);
    expect(after.state).toBe('finished');
    expect((await queue.getJob(job.id!))?.returnvalue).toMatchObject({ runId, status: 'stale' });
  });

  it('a fork starts from its parent checkpoint carried onto its own spec (or fails saying the engine cannot fork yet)', async () => {
    const owner = await createOwnerAndStudy(database.db);
    const parentSpec = quickSpecs()[0]!;
    const parentId = await insertRun(database.db, owner, parentSpec);
    await admitRun(database.db, queue, parentId);
    await waitForState(database.db, parentId, ['finished']);
    const parentCheckpoint = (await checkpointRows(database.db, parentId)).at(-1)!;

    // The fork: same study, a finer grid and a tighter tension threshold, recorded with its parent.
    const forkInput = { ...parentSpec, grid: { points: 300 }, stop: { tension: 1e-10, gradientBound: 1e8 } };
    const forkId = await insertRun(database.db, owner, forkInput);
    await database.db.updateTable('runs').set({ parent_checkpoint_id: parentCheckpoint.id }).where('id', '=', forkId).execute();
    await admitRun(database.db, queue, forkId);
    const row = await waitForState(database.db, forkId, ['finished', 'failed']);

    const fork = (builtEngine as unknown as { forkFlowRun?: (parent: FlowRun, spec: RunSpec) => FlowRun }).forkFlowRun;
    if (typeof fork === 'function') {
      const parent = builtEngine.deserializeCheckpoint(new Uint8Array(parentCheckpoint.state));
      const expected = fork(parent, builtEngine.parseRunSpec(forkInput));
      builtEngine.advanceFlowRun(expected);
      expect(row.error).toBeNull();
      expect(withoutCpu(row.summary)).toEqual(withoutCpu(builtEngine.summarizeFlowRun(expected, 0)));
    } else {
      expect(row.state).toBe('failed');
      expect(row.error).toMatch(/forking is not available in this engine build yet/);
    }
    expect(row.parent_checkpoint_id).toBe(parentCheckpoint.id);
  });
});
