import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_QUOTAS, Role } from '@kiln/shared';
import { createPerson, type TestPerson } from '../support/people';
import { waitFor } from '../support/ports';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { QUICK_SPHERE_SPEC } from '../support/specs';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { longBallSpec, referenceRun, startWorker, stopProcesses, withoutCpu, type WorkerProcess } from '../support/worker-harness';

/** A ball run of roughly half a second of CPU: long enough to overlap, short enough for a test. */
const halfSecondRun = {
  domain: { kind: 'ball', dim: 2, boundaryAngle: 2.5 },
  target: { kind: 'sphere' },
  initial: { kind: 'identity' },
  grid: { points: 1500, maxPoints: 3000 },
  time: { tMax: 50, maxStep: 0.05, tolerance: 1e-8 },
  stop: { tension: 1e-9 },
};

describe('quotas and fair sharing', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let api: TestApi;
  let admin: TestPerson, ada: TestPerson, ben: TestPerson, cleo: TestPerson;
  const tokens: Record<string, string> = {};
  const studies: Record<string, string> = {};
  const workers: WorkerProcess[] = [];

  const as = (p: TestPerson) => tokens[p.email];
  const running = async (ownerId: string) =>
    Number(
      (
        await database.db
          .selectFrom('runs')
          .select((eb) => eb.fn.countAll<number>().as('n'))
          .where('owner_id', '=', ownerId)
          .where((eb) => eb.or([eb('state', '=', 'running'), eb.and([eb('state', '=', 'queued'), eb('dispatched_at', 'is not', null)])]))
          .executeTakeFirstOrThrow()
      ).n,
    );
  const pending = async (ownerId: string) =>
    Number(
      (
        await database.db
          .selectFrom('runs')
          .select((eb) => eb.fn.countAll<number>().as('n'))
          .where('owner_id', '=', ownerId)
          .where('state', 'in', ['queued', 'waiting'])
          .where('dispatched_at', 'is', null)
          .executeTakeFirstOrThrow()
      ).n,
    );
  const unfinished = async (ownerId: string) =>
    Number(
      (
        await database.db
          .selectFrom('runs')
          .select((eb) => eb.fn.countAll<number>().as('n'))
          .where('owner_id', '=', ownerId)
          .where('state', 'not in', ['finished', 'failed', 'cancelled'])
          .executeTakeFirstOrThrow()
      ).n,
    );
  const submit = (person: TestPerson, name: string, count: number, base: object = halfSecondRun) =>
    api.request('POST', '/api/sweeps', {
      token: as(person),
      body: { studyId: studies[person.email], name, base, axes: [{ path: 'domain.boundaryAngle', range: { from: 2.3, to: 2.7, steps: count } }] },
    });

  beforeAll(async () => {
    database = await createTestDatabase();
    redis = await startTestRedis();
    api = await startTestApi(database.url, { REDIS_URL: redis.url, KILN_SCHEDULER_TICK_MS: '100' });
    admin = await createPerson(database.db, Role.Admin);
    ada = await createPerson(database.db, Role.Researcher, { name: 'Ada' });
    ben = await createPerson(database.db, Role.Researcher, { name: 'Ben' });
    cleo = await createPerson(database.db, Role.Researcher, { name: 'Cleo' });
    for (const p of [admin, ada, ben, cleo]) {
      tokens[p.email] = (await api.request('POST', '/api/auth/login', { body: { email: p.email, password: p.password } })).body.accessToken;
    }
    for (const p of [ada, ben, cleo]) studies[p.email] = (await api.request('POST', '/api/studies', { token: as(p), body: { name: `${p.name}'s study` } })).body.id;
    for (const host of ['q-a', 'q-b']) {
      workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host, slots: 2, checkpointSeconds: 60 }));
    }
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await api?.close();
    await redis?.stop();
    await database?.drop();
  });

  it('only admins read or change quotas and roles; every change is in the audit log with before and after', async () => {
    const quota = { slots: 2, cpuHoursPerMonth: 10, maxGridPoints: 5000, maxRunCpuSeconds: 60 };
    for (const person of [ada, ben]) {
      expect((await api.request('PUT', `/api/admin/quotas/${ada.id}`, { token: as(person), body: quota })).status).toBe(403);
      expect((await api.request('GET', '/api/admin/quotas', { token: as(person) })).status).toBe(403);
      expect((await api.request('PATCH', `/api/admin/users/${ben.id}`, { token: as(person), body: { role: 'admin' } })).status).toBe(403);
      expect((await api.request('GET', '/api/admin/audit', { token: as(person) })).status).toBe(403);
      expect((await api.request('GET', '/api/admin/usage', { token: as(person) })).status).toBe(403);
    }
    expect((await api.request('PUT', `/api/admin/quotas/${ada.id}`, { body: quota })).status).toBe(401);
    // Bad values change nothing.
    for (const bad of [{ ...quota, slots: -1 }, { ...quota, slots: 1.5 }, { ...quota, cpuHoursPerMonth: 'lots' }, { ...quota, maxGridPoints: 10_000_000 }, { slots: 2 }]) {
      const response = await api.request('PUT', `/api/admin/quotas/${ada.id}`, { token: as(admin), body: bad });
      expect(response.status).toBe(400);
    }
    const mine = await api.request('GET', '/api/quota', { token: as(ada) });
    expect(mine.body).toMatchObject({ ...DEFAULT_QUOTAS[Role.Researcher], custom: false });

    const set = await api.request('PUT', `/api/admin/quotas/${ada.id}`, { token: as(admin), body: quota });
    expect(set.status).toBe(200);
    expect(set.body).toMatchObject({ ...quota, custom: true });
    expect((await api.request('GET', '/api/quota', { token: as(ada) })).body).toMatchObject(quota);
    const role = await api.request('PATCH', `/api/admin/users/${cleo.id}`, { token: as(admin), body: { role: 'collaborator' } });
    expect(role.body.role).toBe('collaborator');
    await api.request('PATCH', `/api/admin/users/${cleo.id}`, { token: as(admin), body: { role: 'researcher' } });

    const audit = await api.request('GET', `/api/admin/audit?subjectId=${ada.id}&action=quota.set`, { token: as(admin) });
    expect(audit.body.items).toHaveLength(1);
    expect(audit.body.items[0]).toMatchObject({ actorId: admin.id, before: DEFAULT_QUOTAS[Role.Researcher], after: quota });
    const roles = await api.request('GET', `/api/admin/audit?subjectId=${cleo.id}`, { token: as(admin) });
    expect(roles.body.items.map((e: any) => [e.before.role, e.after.role])).toEqual([
      ['collaborator', 'researcher'],
      ['researcher', 'collaborator'],
    ]);
  });

  it('refuses at submission a run over the grid or CPU limit, naming the limit, and writes nothing', async () => {
    const tooFine = await api.request('POST', '/api/sweeps', {
      token: as(ada),
      body: { studyId: studies[ada.email], name: 'too fine', base: { ...QUICK_SPHERE_SPEC, grid: { points: 6000 } }, axes: [] },
    });
    expect(tooFine.status).toBe(422);
    expect(tooFine.body.message).toMatch(/limit of 5000 grid points/);
    const tooLong = await api.request('POST', '/api/sweeps', {
      token: as(ada),
      body: { studyId: studies[ada.email], name: 'too long', base: { ...QUICK_SPHERE_SPEC, grid: { points: 4000, maxPoints: 5000 }, time: { tMax: 1e5, maxStep: 1 } }, axes: [] },
    });
    expect(tooLong.status).toBe(422);
    expect(tooLong.body.message).toMatch(/limit of 60 CPU seconds per run/);
    const runs = await database.db.selectFrom('runs').select('id').where('owner_id', '=', ada.id).execute();
    expect(runs).toHaveLength(0);
    // A run admitted under an older, larger limit is refused on resume once the limit is lowered.
    const { id: runId } = await database.db
      .insertInto('runs')
      .values({ study_id: studies[ada.email], owner_id: ada.id, spec: JSON.stringify({ ...QUICK_SPHERE_SPEC, grid: { points: 6000, maxPoints: 6000 }, symmetry: 'auto', time: { ...QUICK_SPHERE_SPEC.time }, stop: { ...QUICK_SPHERE_SPEC.stop } }), state: 'paused', pause_reason: 'request' })
      .returning('id')
      .executeTakeFirstOrThrow();
    const resumed = await api.request('POST', `/api/runs/${runId}/resume`, { token: as(ada) });
    expect(resumed.status).toBe(422);
    expect(resumed.body.message).toMatch(/limit of 5000 grid points/);
    await database.db.deleteFrom('runs').where('id', '=', runId).execute();
  });

  it('many parallel submissions by one person never run more than their slots, over the whole sweep', async () => {
    // Ada: 2 slots (set above). Five sweeps submitted at once.
    const responses = await Promise.all([0, 1, 2, 3, 4].map((i) => submit(ada, `parallel ${i}`, 3)));
    expect(responses.map((r) => r.status)).toEqual([201, 201, 201, 201, 201]);
    let peak = 0;
    let sawWaitReason = false;
    await waitFor(
      "Ada's 15 runs to finish",
      async () => {
        peak = Math.max(peak, await running(ada.id));
        const waiting = await database.db.selectFrom('runs').select('wait_reason').where('owner_id', '=', ada.id).where('state', '=', 'waiting').execute();
        if (waiting.some((w) => w.wait_reason === 'waiting for quota: 2 of 2 slots in use')) sawWaitReason = true;
        return (await unfinished(ada.id)) === 0;
      },
      120_000,
    );
    expect(peak).toBe(2);
    expect(sawWaitReason).toBe(true);
  }, 150_000);

  it('two people with equal quotas share a saturated pool equally, within one slot', async () => {
    // Ben and Cleo: the researcher default (4 slots each); the pool has 4 slots in all.
    expect((await submit(ben, 'ben first', 10)).status).toBe(201);
    await waitFor('Ben to fill the pool', async () => (await running(ben.id)) === 4);
    expect((await submit(cleo, 'cleo second', 10)).status).toBe(201);
    // No pre-emption: Cleo gets slots as Ben's runs end. From then on, shares stay within one slot.
    await waitFor('Cleo to get her share', async () => (await running(cleo.id)) >= 2, 60_000);
    const gaps: number[] = [];
    await waitFor(
      'one of them to run out of waiting runs',
      async () => {
        const [b, c, pb, pc] = await Promise.all([running(ben.id), running(cleo.id), pending(ben.id), pending(cleo.id)]);
        if (pb === 0 || pc === 0) return true;
        if (b + c === 4) gaps.push(Math.abs(b - c));
        return false;
      },
      120_000,
    );
    expect(gaps.length).toBeGreaterThan(3);
    expect(Math.max(...gaps)).toBeLessThanOrEqual(1);
    await waitFor('both to finish', async () => (await unfinished(ben.id)) + (await unfinished(cleo.id)) === 0, 120_000);
  }, 240_000);

  it('a CPU-hour budget that runs out pauses the owner\'s run with a checkpoint and tells them; raising it resumes the run, bit for bit', async () => {
    const dana = await createPerson(database.db, Role.Researcher, { name: 'Dana' });
    tokens[dana.email] = (await api.request('POST', '/api/auth/login', { body: { email: dana.email, password: dana.password } })).body.accessToken;
    studies[dana.email] = (await api.request('POST', '/api/studies', { token: as(dana), body: { name: "Dana's study" } })).body.id;
    // 2 CPU-seconds a month: less than the run needs.
    const tiny = { slots: 2, cpuHoursPerMonth: 2 / 3600, maxGridPoints: 20_000, maxRunCpuSeconds: 3600 };
    expect((await api.request('PUT', `/api/admin/quotas/${dana.id}`, { token: as(admin), body: tiny })).status).toBe(200);
    const spec = longBallSpec(20);
    const created = await api.request('POST', '/api/sweeps', {
      token: as(dana),
      body: { studyId: studies[dana.email], name: 'budget', base: spec, axes: [{ path: 'domain.boundaryAngle', values: [0.9 * Math.PI] }] },
    });
    expect(created.status).toBe(201);
    const runId = (await database.db.selectFrom('runs').select('id').where('sweep_id', '=', created.body.id).executeTakeFirstOrThrow()).id;

    const paused = await waitFor('the run to pause for budget', async () => {
      const row = await database.db.selectFrom('runs').selectAll().where('id', '=', runId).executeTakeFirstOrThrow();
      return row.state === 'paused' ? row : undefined;
    }, 60_000);
    expect(paused.pause_reason).toBe('cpu-budget');
    expect(paused.cpu_seconds).toBeGreaterThanOrEqual(2);
    expect(paused.cpu_seconds).toBeLessThan(4);
    const checkpoint = await database.db.selectFrom('checkpoints').select('reason').where('run_id', '=', runId).orderBy('seq', 'desc').executeTakeFirstOrThrow();
    expect(checkpoint.reason).toBe('cpu-budget');
    const mail = await database.db.selectFrom('mail_outbox').selectAll().where('to_address', '=', dana.email).execute();
    expect(mail.map((m) => m.subject)).toEqual(['Your Kiln CPU-hours for this month are used up']);
    // A new submission waits and says why.
    await api.request('POST', '/api/sweeps', {
      token: as(dana),
      body: { studyId: studies[dana.email], name: 'waits', base: halfSecondRun, axes: [] },
    });
    await waitFor('the new run to wait for budget', async () => {
      const row = await database.db.selectFrom('runs').select('wait_reason').where('owner_id', '=', dana.id).where('state', '=', 'waiting').executeTakeFirst();
      return row?.wait_reason?.includes('monthly CPU-hours used up');
    });

    expect((await api.request('PUT', `/api/admin/quotas/${dana.id}`, { token: as(admin), body: { ...tiny, cpuHoursPerMonth: 10 } })).status).toBe(200);
    const finished = await waitFor('the run to finish after the raise', async () => {
      const row = await database.db.selectFrom('runs').selectAll().where('id', '=', runId).executeTakeFirstOrThrow();
      return row.state === 'finished' ? row : undefined;
    }, 90_000);
    expect(withoutCpu(finished.summary)).toEqual(withoutCpu(referenceRun(spec).summary));
    await waitFor('Dana\'s runs to finish', async () => (await unfinished(dana.id)) === 0, 60_000);
  }, 180_000);
});
