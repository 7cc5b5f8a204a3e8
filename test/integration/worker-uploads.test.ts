import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Queue } from 'bullmq';
import { createHash } from 'node:crypto';
import type { RunSpecInput } from '@kiln/shared';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import {
  admitRun,
  builtEngine,
  checkpointRows,
  createOwnerAndStudy,
  insertRun,
  runQueue,
  startWorker,
  stopProcesses,
  waitForState,
  withoutCpu,
  type WorkerProcess,
} from '../support/worker-harness';

// Issue 9 item 4: runs whose specs name uploads (initial.kind = "table", target.kind =
// "profile") run to an outcome on a real worker, which loads the parsed tables from
// `uploads` and hands them to the engine; the result equals the engine run directly
// with the same tables. The uploads are CSV text parsed by the same checks the API applies.

/** CSV text of rows of numbers under a header. */
function csv(header: string, rows: number[][]): string {
  return [header, ...rows.map((row) => row.map((x) => x.toPrecision(17)).join(','))].join('\n') + '\n';
}

// B² → S² with α = 2 < π: converges (Chang & Ding, 1991; numerics.md §4.4). A curved start.
const initialCsv = csv(
  'r,h',
  Array.from({ length: 41 }, (_, i) => {
    const r = i === 40 ? 1 : i / 40;
    return [r, 2 * r + 0.3 * Math.sin(Math.PI * r)];
  }),
);
// The ellipsoid b = 1.5 as a table (numerics.md §1); S³ → it from h₀ = r converges (§4.6: b < 2√2).
const targetCsv = csv(
  'h,f,z',
  Array.from({ length: 121 }, (_, i) => {
    const h = i === 120 ? Math.PI : (i * Math.PI) / 120;
    return [h, i === 0 || i === 120 ? 0 : Math.sin(h), 1.5 * Math.cos(h)];
  }),
);

describe('worker: runs from uploaded profiles', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let queue: Queue;
  const workers: WorkerProcess[] = [];

  beforeAll(async () => {
    [database, redis] = await Promise.all([createTestDatabase(), startTestRedis()]);
    queue = runQueue(redis.url);
    workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host: 'uploads-a' }));
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await queue?.close();
    await redis?.stop();
    await database?.drop();
  });

  /** Stores a checked profile as the uploads API does (parsed columns as JSON). */
  async function storeUpload(ownerId: string, kind: 'initial-profile' | 'target-profile', text: string): Promise<{ id: string; profile: unknown }> {
    const parsed = kind === 'initial-profile' ? builtEngine.parseInitialProfileCsv(text) : builtEngine.parseTargetProfileCsv(text);
    if (!parsed.ok) throw new Error(`test upload rejected: ${JSON.stringify(parsed.problems)}`);
    const row = await database.db
      .insertInto('uploads')
      .values({
        owner_id: ownerId,
        kind,
        filename: `${kind}.csv`,
        size_bytes: text.length,
        content: JSON.stringify(parsed.profile),
        bytes: null,
        sha256: createHash('sha256').update(text).digest('hex'),
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    return { id: row.id, profile: parsed.profile };
  }

  it('an uploaded initial profile and an uploaded target profile each run to the outcome the engine gives with the same tables', async () => {
    const owner = await createOwnerAndStudy(database.db);
    const initial = await storeUpload(owner.ownerId, 'initial-profile', initialCsv);
    const target = await storeUpload(owner.ownerId, 'target-profile', targetCsv);
    const cases: { spec: RunSpecInput; resources: Parameters<typeof builtEngine.createFlowRun>[1] }[] = [
      {
        spec: {
          domain: { kind: 'ball', dim: 2, boundaryAngle: 2 },
          target: { kind: 'sphere' },
          initial: { kind: 'table', uploadId: initial.id },
          grid: { points: 61 },
          time: { tMax: 50, maxStep: 1, tolerance: 1e-7 },
          stop: { tension: 1e-9 },
        },
        resources: { initialProfile: initial.profile as never },
      },
      {
        spec: {
          domain: { kind: 'sphere', dim: 3 },
          target: { kind: 'profile', uploadId: target.id },
          initial: { kind: 'identity' },
          grid: { points: 61 },
          time: { tMax: 500, maxStep: 5, tolerance: 1e-7 },
          stop: { tension: 1e-9 },
        },
        resources: { targetProfile: target.profile as never },
      },
    ];
    const runIds: string[] = [];
    for (const c of cases) runIds.push(await insertRun(database.db, owner, c.spec));
    for (const runId of runIds) await admitRun(database.db, queue, runId);

    for (const [i, runId] of runIds.entries()) {
      const row = await waitForState(database.db, runId, ['finished', 'failed'], 60_000);
      expect(row.error).toBeNull();
      expect(row.state).toBe('finished');
      // The engine run directly with the same tables: the worker's summary equals it.
      const { createFlowRun, parseRunSpec, advanceFlowRun, summarizeFlowRun } = builtEngine;
      const expected = createFlowRun(parseRunSpec(cases[i]!.spec), cases[i]!.resources);
      advanceFlowRun(expected);
      const reference = summarizeFlowRun(expected, 0);
      expect(reference.outcome).toBe('converged');
      expect(row.outcome).toBe('converged');
      expect(withoutCpu(row.summary)).toEqual(withoutCpu(reference));
      // The outcome checkpoint reads back without the upload (it is self-contained).
      const last = (await checkpointRows(database.db, runId)).at(-1)!;
      expect(builtEngine.deserializeCheckpoint(new Uint8Array(last.state)).s.step).toBe(reference.steps);
    }
  });

  it('a run naming an upload that does not exist fails with the upload named', async () => {
    const owner = await createOwnerAndStudy(database.db);
    const missing = '00000000-0000-4000-8000-000000000000';
    const runId = await insertRun(database.db, owner, {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'profile', uploadId: missing },
      initial: { kind: 'identity' },
      grid: { points: 41 },
      time: { tMax: 1 },
    });
    await admitRun(database.db, queue, runId);
    const row = await waitForState(database.db, runId, ['finished', 'failed'], 30_000);
    expect(row.state).toBe('failed');
    expect(row.error).toContain(`target-profile upload ${missing}`);
  });
});
