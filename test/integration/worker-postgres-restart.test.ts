import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Queue } from 'bullmq';
import { sql, type Kysely } from 'kysely';
import { deserializeCheckpoint } from '@kiln/shared';
import { createDatabase, migrateToLatest, type Database } from '@kiln/shared/db';
import { MIGRATIONS_FOLDER } from '../../backend/src/database/migrations-folder';
import { startTestPostgres, type TestPostgres } from '../support/postgres-server';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { waitFor } from '../support/ports';
import {
  admitRun,
  checkpointRows,
  createOwnerAndStudy,
  insertRun,
  longBallSpec,
  metricRows,
  referenceRun,
  runQueue,
  startWorker,
  stopProcesses,
  waitForState,
  withoutCpu,
  type WorkerProcess,
} from '../support/worker-harness';

// PostgreSQL restarted while a run computes: the worker keeps the engine state in
// memory, retries its writes, and the run finishes as if nothing happened.
describe('worker through a PostgreSQL restart', () => {
  let postgres: TestPostgres;
  let redis: TestRedis;
  let db: Kysely<Database>;
  let queue: Queue;
  const workers: WorkerProcess[] = [];

  beforeAll(async () => {
    [postgres, redis] = await Promise.all([startTestPostgres(), startTestRedis()]);
    const admin = createDatabase({ connectionString: postgres.url('postgres'), max: 1 });
    await sql.raw('CREATE DATABASE kiln_worker_pg').execute(admin);
    await admin.destroy();
    db = createDatabase({ connectionString: postgres.url('kiln_worker_pg'), max: 2 });
    await migrateToLatest(db, MIGRATIONS_FOLDER);
    queue = runQueue(redis.url);
    for (const host of ['pg-a', 'pg-b']) {
      workers.push(
        await startWorker(db, { databaseUrl: postgres.url('kiln_worker_pg'), redisUrl: redis.url, host, checkpointSeconds: 1 }),
      );
    }
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await queue?.close();
    await db?.destroy();
    await redis?.stop();
    await postgres?.destroy();
  });

  it('retries its writes through the outage; the run finishes with the same result and every checkpoint verifies', async () => {
    const spec = longBallSpec(20);
    const owner = await createOwnerAndStudy(db);
    const runId = await insertRun(db, owner, spec);
    await admitRun(db, queue, runId);
    await waitFor('an interval checkpoint', async () => (await checkpointRows(db, runId)).some((c) => c.reason === 'interval'));

    await postgres.stop();
    const reference = referenceRun(spec); // computed while PostgreSQL is down (≈ 3 s)
    await new Promise((resolve) => setTimeout(resolve, 1_000));
    await postgres.start();

    const row = await waitForState(db, runId, ['finished', 'failed'], 90_000);
    expect(row.error).toBeNull();
    expect(row.state).toBe('finished');
    expect(withoutCpu(row.summary)).toEqual(withoutCpu(reference.summary));
    expect((row.summary as { energyFinal: number }).energyFinal).toBe(reference.summary.energyFinal);
    // The outage really hit the run's writes, and they were retried.
    const output = workers.map((w) => w.output()).join('');
    expect(output).toMatch(new RegExp(`run ${runId}: (flush|checkpoint \\(interval\\)|checkpoint \\(outcome\\)): .*retrying`));
    expect(output).toMatch(new RegExp(`run ${runId}: .* succeeded after \\d+ failed attempt`));
    // Both workers are still alive.
    for (const w of workers) expect(w.child.exitCode).toBeNull();

    const metrics = await metricRows(db, runId);
    expect(metrics.map((m) => m.step)).toEqual(reference.samples.map((s) => s.step));
    const checkpoints = await checkpointRows(db, runId);
    expect(checkpoints.map((c) => c.seq)).toEqual(checkpoints.map((_, i) => i + 1));
    for (const c of checkpoints) {
      expect(createHash('sha256').update(c.state).digest('hex')).toBe(c.sha256);
      expect(c.size_bytes).toBe(c.state.byteLength);
      expect(deserializeCheckpoint(new Uint8Array(c.state)).s.step).toBe(c.step);
    }
  });
});
