import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Queue } from 'bullmq';
import { deserializeCheckpoint } from '@kiln/shared';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { waitFor } from '../support/ports';
import {
  admitRun,
  checkpointRows,
  collectRunEvents,
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
  waitForState,
  withoutCpu,
  type Reference,
  type WorkerProcess,
} from '../support/worker-harness';

// A worker killed mid-run, and one stopped gracefully: the run is never lost and
// ends exactly as an uninterrupted run of the engine.
describe('worker crash and graceful shutdown', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let queue: Queue;
  let owner: { ownerId: string; studyId: string };
  let reference: Reference;
  const spec = longBallSpec(20);
  const workers: WorkerProcess[] = [];
  const start = async (host: string) => {
    const worker = await startWorker(database.db, {
      databaseUrl: database.url,
      redisUrl: redis.url,
      host,
      checkpointSeconds: 1,
      lockSeconds: 3,
    });
    workers.push(worker);
    return worker;
  };
  const byPid = (pid: number | null) => workers.find((w) => w.pid === pid);

  beforeAll(async () => {
    [database, redis] = await Promise.all([createTestDatabase(), startTestRedis()]);
    queue = runQueue(redis.url);
    owner = await createOwnerAndStudy(database.db);
    await Promise.all([start('crash-a'), start('crash-b')]);
    reference = referenceRun(spec);
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await queue?.close();
    await redis?.stop();
    await database?.drop();
  });

  it('SIGKILL mid-run: another worker continues from the last checkpoint and the result is bit-identical', async () => {
    const events = await collectRunEvents(redis.url);
    try {
      const runId = await insertRun(database.db, owner, spec);
      await admitRun(database.db, queue, runId);
      await waitFor('an interval checkpoint', async () =>
        (await checkpointRows(database.db, runId)).some((c) => c.reason === 'interval'),
      );
      const victim = byPid(await holderPid(database.db, runId))!;
      expect(victim).toBeDefined();
      victim.kill('SIGKILL');
      await victim.exited;
      const survivor = workers.find((w) => w !== victim && w.child.exitCode === null)!;
      const beforeTakeover = await checkpointRows(database.db, runId);

      const row = await waitForState(database.db, runId, ['finished', 'failed'], 60_000);
      expect(row.error).toBeNull();
      expect(row.state).toBe('finished');
      expect(await holderPid(database.db, runId)).toBe(survivor.pid);
      expect(row.lease).toBeGreaterThanOrEqual(2);
      // It resumed from the newest checkpoint written before the kill.
      expect(survivor.output()).toContain(`continuing from checkpoint ${beforeTakeover.at(-1)!.seq} `);
      expect(withoutCpu(row.summary)).toEqual(withoutCpu(reference.summary));
      expect((row.summary as { energyFinal: number }).energyFinal).toBe(reference.summary.energyFinal);

      // Nothing duplicated, nothing missing.
      const metrics = await metricRows(database.db, runId);
      expect(metrics.map((m) => m.step)).toEqual(reference.samples.map((s) => s.step));
      expect(metrics.map((m) => m.energy)).toEqual(reference.samples.map((s) => s.energy));
      const checkpoints = await checkpointRows(database.db, runId);
      expect(checkpoints.map((c) => c.seq)).toEqual(checkpoints.map((_, i) => i + 1));
      expect(checkpoints.filter((c) => c.reason === 'outcome')).toHaveLength(1);
      for (let i = 1; i < checkpoints.length; i++) expect(checkpoints[i]!.step).toBeGreaterThanOrEqual(checkpoints[i - 1]!.step);
      for (const c of checkpoints) expect(createHash('sha256').update(c.state).digest('hex')).toBe(c.sha256);
      await new Promise((resolve) => setTimeout(resolve, 300));
      const states = events.events.filter((e) => e.runId === runId && e.type === 'state');
      expect(states.filter((e) => e.type === 'state' && e.state === 'finished')).toHaveLength(1);
      expect(events.events.some((e) => e.runId === runId && e.type === 'progress')).toBe(true);
    } finally {
      events.close();
    }
  });

  it('SIGTERM: the run is checkpointed and handed back, the process exits 0, and re-admitted it finishes identically', async () => {
    await start('crash-c');
    const runId = await insertRun(database.db, owner, spec);
    await admitRun(database.db, queue, runId);
    await waitFor('progress of the run', async () => {
      const row = await runRow(database.db, runId);
      return row.state === 'running' && row.progress !== null && (row.progress as { step: number }).step > 500;
    });
    const holder = byPid(await holderPid(database.db, runId))!;
    const workerRow = await database.db.selectFrom('workers').select('id').where('pid', '=', holder.pid).executeTakeFirstOrThrow();
    holder.kill('SIGTERM');
    expect(await holder.exited).toBe(0);

    const handedBack = await runRow(database.db, runId);
    expect(handedBack).toMatchObject({ state: 'queued', dispatched_at: null, worker_id: null });
    const checkpoints = await checkpointRows(database.db, runId);
    const last = checkpoints.at(-1)!;
    expect(last.reason).toBe('shutdown');
    expect(last.step).toBeGreaterThan(0);
    expect(deserializeCheckpoint(new Uint8Array(last.state)).s.step).toBe(last.step);
    const stopped = await database.db.selectFrom('workers').select('stopped_at').where('id', '=', workerRow.id).executeTakeFirstOrThrow();
    expect(stopped.stopped_at).not.toBeNull();

    // The scheduler admits it again; it continues from the shutdown checkpoint elsewhere.
    await admitRun(database.db, queue, runId);
    const row = await waitForState(database.db, runId, ['finished', 'failed'], 60_000);
    expect(row.error).toBeNull();
    expect(withoutCpu(row.summary)).toEqual(withoutCpu(reference.summary));
    const metrics = await metricRows(database.db, runId);
    expect(metrics.map((m) => m.step)).toEqual(reference.samples.map((s) => s.step));
    const all = await checkpointRows(database.db, runId);
    expect(all.map((c) => c.seq)).toEqual(all.map((_, i) => i + 1));
  });
});
