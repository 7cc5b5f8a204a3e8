import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Role, type RunSpec } from '@kiln/shared';
import { createPerson, type TestPerson } from '../support/people';
import { waitFor } from '../support/ports';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { referenceRun, startWorker, stopProcesses, withoutCpu, type WorkerProcess } from '../support/worker-harness';

// S³ → S³ from the non-symmetric perturbation h₀ = r + 0.2·sin r (numerics.md §4.7).
const perturbed = (flow: 'standard' | 'normalized', tMax: number) => ({
  domain: { kind: 'sphere', dim: 3 },
  target: { kind: 'sphere' },
  flow,
  initial: { kind: 'perturbed', amplitude: 0.2, mode: 1 },
  symmetry: 'none',
  grid: { points: 120 },
  time: { tMax, maxStep: 0.05 },
  stop: { tension: 1e-7, gradientBound: 1e6 },
});

describe('the normalized flow and Möbius diagnostics through the product', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let api: TestApi;
  let researcher: TestPerson;
  let token: string;
  let studyId: string;
  const workers: WorkerProcess[] = [];

  const runToEnd = async (base: object) => {
    const sweep = await api.request('POST', '/api/sweeps', { token, body: { studyId, name: 'mobius', base, axes: [] } });
    expect(sweep.status, sweep.text).toBe(201);
    const id = (await database.db.selectFrom('runs').select('id').where('sweep_id', '=', sweep.body.id).executeTakeFirstOrThrow()).id;
    return waitFor(`run ${id} to end`, async () => {
      const run = (await api.request('GET', `/api/runs/${id}`, { token })).body;
      return ['finished', 'failed'].includes(run.state) ? run : undefined;
    }, 120_000);
  };

  beforeAll(async () => {
    database = await createTestDatabase();
    redis = await startTestRedis();
    api = await startTestApi(database.url, { REDIS_URL: redis.url, KILN_SCHEDULER_TICK_MS: '100' });
    researcher = await createPerson(database.db, Role.Researcher);
    token = (await api.request('POST', '/api/auth/login', { body: { email: researcher.email, password: researcher.password } })).body.accessToken;
    studyId = (await api.request('POST', '/api/studies', { token, body: { name: 'Möbius' } })).body.id;
    workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host: 'm-a', checkpointSeconds: 1 }));
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await api?.close();
    await redis?.stop();
    await database?.drop();
  });

  it('a normalized run on a worker equals the engine run directly, with its re-centring recorded', async () => {
    const run = await runToEnd(perturbed('normalized', 20));
    expect(run.state, run.error).toBe('finished');
    expect(withoutCpu(run.summary)).toEqual(withoutCpu(referenceRun(run.spec as RunSpec).summary));
    expect(run.summary.recentre).toMatchObject({ s: expect.any(Number), centerBefore: expect.any(Number) });
    expect(run.summary.recentre.s).not.toBe(1);
    expect(typeof run.summary.sigmaInitial).toBe('number');
    // σ and the constraint's denominator are logged with every sample.
    const metrics = (await api.request('GET', `/api/runs/${run.id}/metrics`, { token })).body;
    expect(metrics.length).toBeGreaterThan(3);
    for (const sample of metrics) {
      expect(Number.isFinite(sample.sigma)).toBe(true);
      expect(Number.isFinite(sample.sigmaDenominator)).toBe(true);
      expect(Math.abs(sample.center)).toBeLessThan(1e-10);
    }
  });

  it("a checkpoint's Möbius energy profile, and the experimental jump to its maximiser recorded as a fork", async () => {
    const run = await runToEnd(perturbed('standard', 1));
    expect(run).toMatchObject({ outcome: 'time-limit', outcomeReason: 't-max' });
    // Resuming would stop at once: the API says to fork with a later end time instead.
    const resume = await api.request('POST', `/api/runs/${run.id}/resume`, { token });
    expect(resume.status).toBe(409);
    expect(resume.body.message).toMatch(/larger time\.tMax/);
    const checkpoints = (await api.request('GET', `/api/runs/${run.id}/checkpoints`, { token })).body;
    const last = checkpoints[checkpoints.length - 1];
    const profile = (await api.request('GET', `/api/checkpoints/${last.id}/dilation-profile`, { token })).body;
    expect(profile.profile.length).toBeGreaterThan(10);
    expect(profile.gap).toBeGreaterThanOrEqual(0);
    const f1 = profile.profile.find(([s]: [number, number]) => Math.abs(s - 1) < 1e-12)?.[1];
    if (f1 !== undefined) expect(profile.energyAtMax).toBeGreaterThanOrEqual(f1);

    const jump = await api.request('POST', `/api/checkpoints/${last.id}/jump-to-maximiser`, { token, body: { overrides: { time: { tMax: 2, maxStep: 0.05 } } } });
    expect(jump.status, jump.text).toBe(201);
    expect(jump.body).toMatchObject({ parentCheckpointId: last.id, parentRunId: run.id, origin: { kind: 'dilation-jump', experimental: true } });
    expect(jump.body.origin.sStar).toBeCloseTo(profile.sStar, 10);
    const ended = await waitFor('the jumped run to end', async () => {
      const r = (await api.request('GET', `/api/runs/${jump.body.id}`, { token })).body;
      return ['finished', 'failed'].includes(r.state) ? r : undefined;
    }, 120_000);
    expect(ended.state, ended.error).toBe('finished');
    const normalizedJump = await api.request('POST', `/api/checkpoints/${last.id}/jump-to-maximiser`, { token, body: { overrides: { flow: 'normalized' } } });
    expect(normalizedJump.status).toBe(400);
  });
});
