import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { CHANNELS } from '@kiln/shared';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { waitFor } from '../support/ports';
import {
  admitRun,
  checkpointRows,
  createOwnerAndStudy,
  insertRun,
  longBallSpec,
  quickSpecs,
  referenceRun,
  runQueue,
  startRestartableRedis,
  startWorker,
  stopProcesses,
  waitForRun,
  waitForState,
  withoutCpu,
  type RestartableRedis,
  type WorkerProcess,
} from '../support/worker-harness';

// Redis lost and restarted empty while a run computes: the worker processes survive,
// the run (whose truth is in PostgreSQL) still finishes, and afterwards the workers
// take new jobs and hear control messages again.
describe('worker through a Redis restart', () => {
  let database: TestDatabase;
  let redis: RestartableRedis;
  let queue: Queue;
  const workers: WorkerProcess[] = [];

  beforeAll(async () => {
    [database, redis] = await Promise.all([createTestDatabase(), startRestartableRedis()]);
    queue = runQueue(redis.url);
    queue.on('error', () => undefined);
    for (const host of ['redis-a', 'redis-b']) {
      workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host, checkpointSeconds: 1 }));
    }
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await queue?.close();
    await redis?.kill();
    await database?.drop();
  });

  it('keeps running, finishes the run in flight identically, and serves new jobs and control afterwards', async () => {
    const owner = await createOwnerAndStudy(database.db);
    const spec = longBallSpec(20);
    const runId = await insertRun(database.db, owner, spec);
    await admitRun(database.db, queue, runId);
    await waitFor('an interval checkpoint', async () => (await checkpointRows(database.db, runId)).some((c) => c.reason === 'interval'));

    await redis.kill();
    const reference = referenceRun(spec); // while Redis is down (≈ 3 s)
    await redis.start();

    const row = await waitForState(database.db, runId, ['finished', 'failed'], 60_000);
    expect(row.error).toBeNull();
    expect(withoutCpu(row.summary)).toEqual(withoutCpu(reference.summary));
    for (const w of workers) expect(w.child.exitCode).toBeNull();

    // New work after the restart.
    const quick = quickSpecs()[0]!;
    const quickId = await insertRun(database.db, owner, quick);
    await admitRun(database.db, queue, quickId);
    const quickRow = await waitForState(database.db, quickId, ['finished', 'failed'], 30_000);
    expect(withoutCpu(quickRow.summary)).toEqual(withoutCpu(referenceRun(quick).summary));

    // The control channel was re-subscribed: a cancel reaches the holder through it.
    const longId = await insertRun(database.db, owner, spec);
    await admitRun(database.db, queue, longId);
    await waitForRun(database.db, longId, 'the run to be running', (r) => r.state === 'running' && r.progress !== null);
    const publisher = new Redis(redis.url);
    try {
      await database.db.updateTable('runs').set({ control_request: 'cancel' }).where('id', '=', longId).execute();
      await publisher.publish(CHANNELS.control, JSON.stringify({ runId: longId, request: 'cancel' }));
    } finally {
      publisher.disconnect();
    }
    await waitForState(database.db, longId, ['cancelled'], 10_000);
    expect(workers.map((w) => w.output()).join('')).toContain(`run ${longId}: cancel requested, signalled job`);
  });
});
