import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Role, type RunSpec } from '@kiln/shared';
import { createPerson, type TestPerson } from '../support/people';
import { waitFor } from '../support/ports';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { longBallSpec, referenceRun, startWorker, stopProcesses, withoutCpu, type WorkerProcess } from '../support/worker-harness';

const run = promisify(execFile);

// The whole path a postdoc relies on: sweep submitted through the API, admitted by
// the scheduler, executed by two worker processes, results in PostgreSQL.
describe('a sweep on the worker pool, end to end', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let api: TestApi;
  let researcher: TestPerson;
  let token: string;
  let studyId: string;
  const workers: WorkerProcess[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    redis = await startTestRedis();
    api = await startTestApi(database.url, { REDIS_URL: redis.url, KILN_SCHEDULER_TICK_MS: '150' });
    researcher = await createPerson(database.db, Role.Researcher);
    token = (await api.request('POST', '/api/auth/login', { body: { email: researcher.email, password: researcher.password } })).body.accessToken;
    studyId = (await api.request('POST', '/api/studies', { token, body: { name: 'End to end' } })).body.id;
    for (const host of ['host-a', 'host-b']) {
      workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host, checkpointSeconds: 1, lockSeconds: 3 }));
    }
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await api?.close();
    await redis?.stop();
    await database?.drop();
  });

  const runsOf = async (sweepId: string) =>
    (await api.request('GET', `/api/sweeps/${sweepId}/runs?pageSize=500&sort=index`, { token })).body.items as any[];

  async function waitUntilAllFinished(sweepId: string, timeoutMs: number) {
    return waitFor(
      `sweep ${sweepId} to finish`,
      async () => {
        const runs = await runsOf(sweepId);
        return runs.every((r) => ['finished', 'failed', 'cancelled'].includes(r.state)) ? runs : undefined;
      },
      timeoutMs,
    );
  }

  it('a 40-run sweep completes; each outcome and final energy equal what the flow command gives for the same spec', async () => {
    const base = {
      domain: { kind: 'ball', dim: 2, boundaryAngle: 0.5 * Math.PI },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      grid: { points: 60 },
      time: { tMax: 50, maxStep: 0.05 },
      stop: { tension: 1e-7, gradientBound: 1e5 },
    };
    const created = await api.request('POST', '/api/sweeps', {
      token,
      body: {
        studyId,
        name: 'boundary angles',
        base,
        axes: [
          { path: 'domain.boundaryAngle', range: { from: 0.4 * Math.PI, to: 1.6 * Math.PI, steps: 20 } },
          { path: 'grid.points', values: [50, 70] },
        ],
      },
    });
    expect(created.status).toBe(201);
    expect(created.body.runCount).toBe(40);
    const runs = await waitUntilAllFinished(created.body.id, 180_000);
    expect(runs.map((r) => r.state)).toEqual(Array(40).fill('finished'));
    // Both worker hosts took part.
    const hosts = await database.db.selectFrom('runs').innerJoin('workers', 'workers.id', 'runs.worker_id').select('workers.host').distinct().execute();
    expect(hosts.map((h) => h.host).sort()).toEqual(['host-a', 'host-b']);

    // The engine run directly (the code behind the flow command) for every run...
    for (const r of runs) {
      const reference = referenceRun(r.spec as RunSpec);
      expect(r.outcome, `run ${r.sweepIndex}`).toBe(reference.summary.outcome);
      expect(withoutCpu(r.summary)).toEqual(withoutCpu(reference.summary));
    }
    const outcomes = new Set(runs.map((r) => r.outcome));
    expect(outcomes.has('converged') && outcomes.has('blowup')).toBe(true);

    // The owner hears about it once (the reconcile round sends notices).
    const notice = await waitFor('the sweep-finished e-mail', () =>
      database.db.selectFrom('mail_outbox').selectAll().where('dedupe_key', '=', `sweep-finished:${created.body.id}`).executeTakeFirst(),
    );
    expect(notice.to_address).toBe(researcher.email);
    expect(notice.body_text).toMatch(/converged: \d+/);

    // ...and the flow command itself, as a person would call it, for a few of them.
    const dir = mkdtempSync(path.join(os.tmpdir(), 'kiln-flow-'));
    for (const r of [runs[0], runs[21], runs[39]]) {
      const file = path.join(dir, `${r.id}.json`);
      writeFileSync(file, JSON.stringify(r.spec));
      const { stdout } = await run('npx', ['tsx', 'shared/src/cli/flow-command.ts', file], { maxBuffer: 16 * 1024 * 1024 });
      const printed = JSON.parse(stdout);
      expect(printed.outcome).toBe(r.outcome);
      expect(printed.energyFinal).toBe(r.summary.energyFinal);
    }
  }, 240_000);

  it('notification settings: people switch e-mails off, and a finished sweep then sends none', async () => {
    const bad = await api.request('PUT', '/api/me/notifications', { token, body: { sweepFinished: 'no' } });
    expect(bad.status).toBe(400);
    const off = await api.request('PUT', '/api/me/notifications', { token, body: { sweepFinished: false } });
    expect(off.body).toEqual({ sweepFinished: false, runFailed: true, candidate: true, quotaNearlyUsed: true });
    const created = await api.request('POST', '/api/sweeps', {
      token,
      body: { studyId, name: 'quiet', base: { domain: { kind: 'ball', dim: 2, boundaryAngle: 1 }, target: { kind: 'sphere' }, initial: { kind: 'identity' }, grid: { points: 40 }, time: { tMax: 10, maxStep: 0.1 } }, axes: [] },
    });
    await waitUntilAllFinished(created.body.id, 60_000);
    await waitFor('the sweep to be marked notified', async () =>
      (await database.db.selectFrom('sweeps').select('notified_at').where('id', '=', created.body.id).executeTakeFirstOrThrow()).notified_at,
    );
    const mails = await database.db.selectFrom('mail_outbox').select('id').where('dedupe_key', '=', `sweep-finished:${created.body.id}`).execute();
    expect(mails).toHaveLength(0);
    await api.request('PUT', '/api/me/notifications', { token, body: { sweepFinished: true } });
  }, 120_000);

  it('Redis wiped mid-sweep: after reconciliation every run finishes exactly once, with the uninterrupted result', async () => {
    const created = await api.request('POST', '/api/sweeps', {
      token,
      body: { studyId, name: 'wiped', base: longBallSpec(20), axes: [{ path: 'domain.boundaryAngle', values: [0.5, 0.6, 0.7, 0.8].map((a) => a * Math.PI) }] },
    });
    expect(created.status).toBe(201);
    const sweepId = created.body.id;
    await waitFor('two runs running with a checkpoint', async () => {
      const running = (await runsOf(sweepId)).filter((r) => r.state === 'running');
      if (running.length < 2) return undefined;
      const checkpoints = await database.db.selectFrom('checkpoints').select('run_id').where('run_id', 'in', running.map((r) => r.id)).execute();
      return checkpoints.length >= 2;
    }, 60_000);

    const admin = new Redis(redis.url);
    await admin.flushall();
    admin.disconnect();

    const runs = await waitUntilAllFinished(sweepId, 180_000);
    expect(runs.map((r) => r.state)).toEqual(Array(4).fill('finished'));
    // The runs that were running when the queue vanished were admitted again by the reconciler.
    const attempts = await database.db.selectFrom('runs').select('attempt').where('sweep_id', '=', sweepId).execute();
    expect(Math.max(...attempts.map((a) => a.attempt))).toBeGreaterThan(1);
    for (const r of runs) {
      const reference = referenceRun(r.spec as RunSpec);
      expect(withoutCpu(r.summary)).toEqual(withoutCpu(reference.summary));
      const outcomeCheckpoints = await database.db
        .selectFrom('checkpoints')
        .select((eb) => eb.fn.countAll<number>().as('n'))
        .where('run_id', '=', r.id)
        .where('reason', '=', 'outcome')
        .executeTakeFirstOrThrow();
      expect(Number(outcomeCheckpoints.n), `run ${r.sweepIndex} ended more than once`).toBe(1);
      const seqs = (await database.db.selectFrom('checkpoints').select('seq').where('run_id', '=', r.id).orderBy('seq').execute()).map((c) => c.seq);
      expect(seqs).toEqual(seqs.map((_, i) => i + 1));
    }
  }, 240_000);
});
