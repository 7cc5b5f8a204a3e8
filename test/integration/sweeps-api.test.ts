import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Role, SWEEP_LIMITS } from '@kiln/shared';
import { createPerson, type TestPerson } from '../support/people';
import { QUICK_SPHERE_SPEC } from '../support/specs';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { testEnv } from '../support/test-env';

describe('sweeps and runs API', () => {
  let database: TestDatabase;
  let api: TestApi;
  let owner: TestPerson, outsider: TestPerson, collaborator: TestPerson, admin: TestPerson, viewer: TestPerson;
  const tokens = {} as Record<string, string>;
  let studyId: string;
  let otherStudyId: string;

  const as = (person: TestPerson) => tokens[person.email];
  const counts = async () => {
    const [sweeps, runs] = await Promise.all([
      database.db.selectFrom('sweeps').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow(),
      database.db.selectFrom('runs').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow(),
    ]);
    return { sweeps: Number(sweeps.n), runs: Number(runs.n) };
  };
  const sweepBody = (axes: unknown, extra: Record<string, unknown> = {}) => ({ studyId, name: 'axis ratios', base: QUICK_SPHERE_SPEC, axes, ...extra });

  beforeAll(async () => {
    database = await createTestDatabase();
    // No scheduler here: these tests look at what the API writes, not at admission.
    api = await startTestApi(database.url, { KILN_SCHEDULER: '0', REDIS_URL: `${testEnv.redisUrl}/3` });
    owner = await createPerson(database.db, Role.Researcher);
    outsider = await createPerson(database.db, Role.Researcher);
    collaborator = await createPerson(database.db, Role.Collaborator);
    viewer = await createPerson(database.db, Role.Collaborator);
    admin = await createPerson(database.db, Role.Admin);
    for (const person of [owner, outsider, collaborator, viewer, admin]) {
      const { body } = await api.request('POST', '/api/auth/login', { body: { email: person.email, password: person.password } });
      tokens[person.email] = body.accessToken;
    }
    const study = await api.request('POST', '/api/studies', { token: as(owner), body: { name: 'Ellipsoids', description: 'test' } });
    expect(study.status).toBe(201);
    studyId = study.body.id;
    await database.db.insertInto('study_members').values([
      { study_id: studyId, user_id: collaborator.id, role: 'member' },
      { study_id: studyId, user_id: viewer.id, role: 'viewer' },
    ]).execute();
    otherStudyId = (await api.request('POST', '/api/studies', { token: as(outsider), body: { name: 'Elsewhere' } })).body.id;
  });
  afterAll(async () => {
    await api?.close();
    await database?.drop();
  });

  it('previews run count and CPU estimate against the quota without writing anything', async () => {
    const before = await counts();
    const response = await api.request('POST', '/api/sweeps/preview', {
      token: as(owner),
      body: sweepBody([
        { path: 'target.axisRatio', values: [1.5, 2, 2.5] },
        { path: 'time.maxStep', range: { from: 1e-3, to: 1e-1, steps: 4, scale: 'log' } },
      ]),
    });
    expect(response.status, response.text).toBe(200);
    expect(response.body.runCount).toBe(12);
    expect(response.body.estimatedCpuHours).toBeGreaterThan(0);
    expect(response.body.quota).toMatchObject({ slots: expect.any(Number), slotsInUse: 0 });
    expect(await counts()).toEqual(before);
  });

  it('creates a sweep and its runs: the Cartesian product of the axes applied to the base spec', async () => {
    const response = await api.request('POST', '/api/sweeps', {
      token: as(owner),
      body: sweepBody([
        { path: 'target.axisRatio', values: [1.5, 3] },
        { path: 'grid.points', range: { from: 40, to: 80, steps: 3 } },
      ]),
    });
    expect(response.status).toBe(201);
    expect(response.body).toMatchObject({ runCount: 6, counts: { queued: 6 } });
    const page = await api.request('GET', `/api/sweeps/${response.body.id}/runs?sort=index`, { token: as(owner) });
    expect(page.body.total).toBe(6);
    const combos = page.body.items.map((run: any) => [run.spec.target.axisRatio, run.spec.grid.points]);
    expect(combos).toEqual([[1.5, 40], [1.5, 60], [1.5, 80], [3, 40], [3, 60], [3, 80]]);
    expect(page.body.items[0].axisValues).toEqual({ 'target.axisRatio': 1.5, 'grid.points': 40 });
    // The stored spec is the normalized one: defaults filled in.
    expect(page.body.items[0].spec.symmetry).toBe('auto');
  });

  it('accepts a 1,000-run sweep in well under 2 s', async () => {
    const started = performance.now();
    const response = await api.request('POST', '/api/sweeps', {
      token: as(owner),
      body: sweepBody([
        { path: 'target.axisRatio', range: { from: 0.5, to: 5, steps: 40 } },
        { path: 'stop.tension', range: { from: 1e-10, to: 1e-6, steps: 25, scale: 'log' } },
      ]),
    });
    const elapsed = performance.now() - started;
    expect(response.status).toBe(201);
    expect(response.body.runCount).toBe(1000);
    expect(elapsed).toBeLessThan(2000);
    const page = await api.request('GET', `/api/sweeps/${response.body.id}/runs?page=3&pageSize=100&sort=index&order=desc`, { token: as(owner) });
    expect(page.body.total).toBe(1000);
    expect(page.body.items).toHaveLength(100);
    expect(page.body.items[0].sweepIndex).toBe(799);
  });

  describe('bad sweeps get a 4xx naming the field, and nothing is written', () => {
    it.each([
      ['an axis over a non-numeric field', [{ path: 'flow', values: [1, 2] }], /path/],
      ['an axis over an unknown field', [{ path: 'target.colour', values: [1] }], /path/],
      ['a range with zero steps', [{ path: 'target.axisRatio', range: { from: 1, to: 2, steps: 0 } }], /steps/],
      ['a range with non-integer steps', [{ path: 'target.axisRatio', range: { from: 1, to: 2, steps: 2.5 } }], /steps/],
      ['a string where a number belongs', [{ path: 'target.axisRatio', values: ['NaN'] }], /number/],
      ['a log range through zero', [{ path: 'time.maxStep', range: { from: 0, to: 1, steps: 3, scale: 'log' } }], /log/],
      ['a value outside the spec limits', [{ path: 'grid.points', values: [100, 10_000_000] }], /grid\.points/],
      ['an axis that does not fit the base (sphere target has no axis ratio)', null, /axisRatio/],
    ])('%s', async (_label, axes, message) => {
      const before = await counts();
      const body =
        axes === null
          ? { ...sweepBody([{ path: 'target.axisRatio', values: [2] }]), base: { ...QUICK_SPHERE_SPEC, target: { kind: 'sphere' } } }
          : sweepBody(axes);
      const response = await api.request('POST', '/api/sweeps', { token: as(owner), body });
      expect(response.status).toBe(400);
      expect(response.body.error).toBe('bad_input');
      expect(JSON.stringify(response.body)).toMatch(message);
      expect(await counts()).toEqual(before);
    });

    it('a product over the size cap', async () => {
      const before = await counts();
      const axes = ['target.axisRatio', 'grid.points', 'stop.tension'].map((path, i) => ({
        path,
        range: { from: [1, 40, 1e-9][i], to: [3, 400, 1e-6][i], steps: 20 },
      }));
      const response = await api.request('POST', '/api/sweeps', { token: as(owner), body: sweepBody(axes) });
      expect(response.status).toBe(400);
      expect(response.body.message).toContain(`at most ${SWEEP_LIMITS.maxRuns}`);
      expect(await counts()).toEqual(before);
    });

    it('Infinity and NaN smuggled through JSON', async () => {
      const raw = JSON.stringify(sweepBody([{ path: 'target.axisRatio', values: [2] }])).replace('[2]', '[1e999]');
      const infinite = await api.request('POST', '/api/sweeps', { token: as(owner), rawBody: raw });
      expect(infinite.status).toBe(400);
      const nan = await api.request('POST', '/api/sweeps', { token: as(owner), rawBody: raw.replace('1e999', 'NaN') });
      expect(nan.status).toBe(400);
    });

    it("someone else's study is not found; a collaborator may not launch sweeps", async () => {
      const before = await counts();
      const foreign = await api.request('POST', '/api/sweeps', { token: as(owner), body: { ...sweepBody([]), studyId: otherStudyId } });
      expect(foreign.status).toBe(404);
      const byCollaborator = await api.request('POST', '/api/sweeps', { token: as(collaborator), body: sweepBody([]) });
      expect(byCollaborator.status).toBe(403);
      const badBase = await api.request('POST', '/api/sweeps', { token: as(owner), body: { ...sweepBody([]), base: { ...QUICK_SPHERE_SPEC, grid: { points: -5 } } } });
      expect(badBase.status).toBe(400);
      expect(badBase.body.details[0].path).toBe('base.grid.points');
      expect(await counts()).toEqual(before);
    });
  });

  describe('who sees and controls a run', () => {
    let runId: string;
    beforeAll(async () => {
      const sweep = await api.request('POST', '/api/sweeps', { token: as(owner), body: sweepBody([{ path: 'target.axisRatio', values: [2] }]) });
      runId = (await api.request('GET', `/api/sweeps/${sweep.body.id}/runs`, { token: as(owner) })).body.items[0].id;
    });

    it('study members and admins see it; an outsider gets 404 for the run, its metrics, checkpoints, controls and stream', async () => {
      for (const person of [owner, collaborator, viewer, admin]) {
        expect((await api.request('GET', `/api/runs/${runId}`, { token: as(person) })).status).toBe(200);
      }
      for (const [method, path] of [
        ['GET', `/api/runs/${runId}`],
        ['GET', `/api/runs/${runId}/metrics`],
        ['GET', `/api/runs/${runId}/checkpoints`],
        ['POST', `/api/runs/${runId}/pause`],
        ['POST', `/api/runs/${runId}/cancel`],
        ['POST', `/api/runs/${runId}/resume`],
        ['POST', `/api/runs/${runId}/events/ticket`],
      ]) {
        const response = await api.request(method, path, { token: as(outsider) });
        expect(response.status, `${method} ${path}`).toBe(404);
      }
      expect((await api.request('GET', '/api/runs/not-a-uuid', { token: as(owner) })).status).toBe(400);
    });

    it('a viewer may look but not control', async () => {
      const response = await api.request('POST', `/api/runs/${runId}/pause`, { token: as(viewer) });
      expect(response.status).toBe(403);
    });

    it('pausing a run no worker holds pauses it at once; resume puts it back in the queue; cancel cancels', async () => {
      const paused = await api.request('POST', `/api/runs/${runId}/pause`, { token: as(collaborator) });
      expect(paused.status).toBe(202);
      expect(paused.body.state).toBe('paused');
      const again = await api.request('POST', `/api/runs/${runId}/pause`, { token: as(owner) });
      expect(again.status).toBe(409);
      const resumed = await api.request('POST', `/api/runs/${runId}/resume`, { token: as(owner) });
      expect(resumed.body.state).toBe('queued');
      const cancelled = await api.request('POST', `/api/runs/${runId}/cancel`, { token: as(owner) });
      expect(cancelled.body.state).toBe('cancelled');
    });

    it('the live stream opens with a run-scoped ticket and refuses forged, foreign or missing ones', async () => {
      const { body } = await api.request('POST', `/api/runs/${runId}/events/ticket`, { token: as(collaborator) });
      const controller = new AbortController();
      const stream = await fetch(`${api.baseUrl}/api/runs/${runId}/events?ticket=${body.ticket}`, { signal: controller.signal });
      expect(stream.status).toBe(200);
      expect(stream.headers.get('content-type')).toContain('text/event-stream');
      let first = '';
      try {
        const reader = stream.body!.getReader();
        while (!first.includes('\n\n')) first += new TextDecoder().decode((await reader.read()).value);
      } finally {
        controller.abort();
      }
      expect(first).toContain('"type":"state"');
      expect(first).toContain(runId);

      const otherRun = (await database.db.selectFrom('runs').select('id').where('id', '!=', runId).executeTakeFirstOrThrow()).id;
      for (const url of [
        `/api/runs/${runId}/events?ticket=forged.ticket.value`,
        `/api/runs/${otherRun}/events?ticket=${body.ticket}`,
        `/api/runs/${runId}/events`,
        `/api/runs/${runId}/events?ticket=${tokens[collaborator.email]}`,
      ]) {
        const refused = await fetch(`${api.baseUrl}${url}`);
        expect(refused.status, url).toBe(401);
        await refused.body?.cancel();
      }
    });
  });

  it('fork overrides are validated like any spec; a bad override writes nothing', async () => {
    const run = await database.db.selectFrom('runs').select(['id']).where('owner_id', '=', owner.id).executeTakeFirstOrThrow();
    const checkpoint = await database.db
      .insertInto('checkpoints')
      .values({ run_id: run.id, seq: 1, step: 0, t: 0, points: 60, reason: 'start', cpu_seconds: 0, size_bytes: 1, sha256: 'x', state: Buffer.from([0]) })
      .returning('id')
      .executeTakeFirstOrThrow();
    const before = await counts();
    const bad = await api.request('POST', `/api/checkpoints/${checkpoint.id}/fork`, { token: as(owner), body: { overrides: { grid: { points: 'many' } } } });
    expect(bad.status).toBe(400);
    expect(bad.body.details[0].path).toBe('overrides.grid.points');
    const onBall = await api.request('POST', `/api/checkpoints/${checkpoint.id}/fork`, { token: as(owner), body: { overrides: { flow: 'normalized', domain: { kind: 'ball', dim: 2, boundaryAngle: 1 } } } });
    expect(onBall.status).toBe(400);
    expect(await counts()).toEqual(before);
    const outsiderFork = await api.request('POST', `/api/checkpoints/${checkpoint.id}/fork`, { token: as(outsider), body: { overrides: {} } });
    expect(outsiderFork.status).toBe(404);

    const good = await api.request('POST', `/api/checkpoints/${checkpoint.id}/fork`, { token: as(collaborator), body: { overrides: { grid: { points: 120 } } } });
    expect(good.status).toBe(201);
    expect(good.body).toMatchObject({ parentCheckpointId: checkpoint.id, parentRunId: run.id, ownerId: collaborator.id, state: 'queued' });
    expect(good.body.spec.grid.points).toBe(120);
  });
});
