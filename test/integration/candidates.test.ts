import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { advanceFlowRun, blowupEstimate, createFlowRun, parseRunSpec, Role, runDiagnostics, serializeCheckpoint } from '@kiln/shared';
import { createPerson, type TestPerson } from '../support/people';
import { waitFor } from '../support/ports';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { startWorker, stopProcesses, type WorkerProcess } from '../support/worker-harness';

const ball = (dim: number, alpha: number, gradientBound: number) => ({
  domain: { kind: 'ball', dim, boundaryAngle: alpha },
  target: { kind: 'sphere' },
  initial: { kind: 'identity' },
  grid: { points: 200 },
  time: { tMax: 50, maxStep: 1 },
  stop: { tension: 1e-8, gradientBound },
});

describe('blow-up candidates', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let api: TestApi;
  let owner: TestPerson, member: TestPerson, viewer: TestPerson, outsider: TestPerson;
  const tokens: Record<string, string> = {};
  let studyId: string;
  const runOf: Record<string, string> = {};
  const workers: WorkerProcess[] = [];
  const as = (p: TestPerson) => tokens[p.email];

  const submit = async (name: string, base: object) => {
    const sweep = await api.request('POST', '/api/sweeps', { token: as(owner), body: { studyId, name, base, axes: [] } });
    expect(sweep.status, sweep.text).toBe(201);
    return (await database.db.selectFrom('runs').select('id').where('sweep_id', '=', sweep.body.id).executeTakeFirstOrThrow()).id;
  };
  const finished = (runId: string) =>
    waitFor(`run ${runId} to end`, async () => {
      const run = (await api.request('GET', `/api/runs/${runId}`, { token: as(owner) })).body;
      return ['finished', 'failed'].includes(run.state) ? run : undefined;
    }, 120_000);
  const candidateOf = (runId: string) =>
    waitFor(`a candidate for run ${runId}`, async () => {
      const page = (await api.request('GET', `/api/candidates?studyId=${studyId}`, { token: as(owner) })).body;
      return page.items.find((c: { runId: string; foundWhileRunning: boolean }) => c.runId === runId);
    }, 60_000);

  beforeAll(async () => {
    database = await createTestDatabase();
    redis = await startTestRedis();
    api = await startTestApi(database.url, { REDIS_URL: redis.url, KILN_SCHEDULER_TICK_MS: '100' });
    owner = await createPerson(database.db, Role.Researcher);
    member = await createPerson(database.db, Role.Collaborator);
    viewer = await createPerson(database.db, Role.Collaborator);
    outsider = await createPerson(database.db, Role.Researcher);
    for (const p of [owner, member, viewer, outsider]) {
      tokens[p.email] = (await api.request('POST', '/api/auth/login', { body: { email: p.email, password: p.password } })).body.accessToken;
    }
    studyId = (await api.request('POST', '/api/studies', { token: as(owner), body: { name: 'Singularities' } })).body.id;
    await database.db.insertInto('study_members').values([
      { study_id: studyId, user_id: member.id, role: 'member' },
      { study_id: studyId, user_id: viewer.id, role: 'viewer' },
    ]).execute();
    for (const host of ['c-a', 'c-b']) workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host, checkpointSeconds: 1 }));
    runOf.b2 = await submit('B2 1.5π', ball(2, 1.5 * Math.PI, 1e8));
    runOf.b3 = await submit('B3 2π', ball(3, 2 * Math.PI, 1e10));
    runOf.converging = await submit('B2 0.9π', ball(2, 0.9 * Math.PI, 1e8));
    await Promise.all(Object.values(runOf).map(finished));
  }, 240_000);
  afterAll(async () => {
    await stopProcesses(workers);
    await api?.close();
    await redis?.stop();
    await database?.drop();
  });

  it('known singular cases become candidates, B³ classified self-similar with p within 5 % of ½; a converging run does not', async () => {
    // Source: type I blow-up, max|∇u| ~ C (T − t)^(−1/2), for 3 ≤ m ≤ 6 (Fan, Sci. China Ser. A 42, 1999;
    // Biernat & Bizoń, Nonlinearity 24, 2011) — numerics.md §4.5. Finite-time blow-up of B² → S² for
    // h₀ = α·r with α > π (Chang, Ding & Ye, J. Differential Geom. 36, 1992) — numerics.md §4.4.
    const b3 = await candidateOf(runOf.b3);
    expect(b3.kind).toBe('type-I');
    expect(Math.abs(b3.exponent - 0.5) / 0.5).toBeLessThan(0.05);
    expect(b3.evidence.pole).toBe('r = 0');
    const b2 = await candidateOf(runOf.b2);
    expect(['type-II', 'type-I']).toContain(b2.kind);
    expect(b2.kind).toBe('type-II'); // two dimensions have no type I blow-up (Raphaël & Schweyer, arXiv:1301.1859)
    const converging = await api.request('GET', `/api/runs/${runOf.converging}`, { token: as(owner) });
    expect(converging.body.outcome).toBe('converged');
    const all = (await api.request('GET', `/api/candidates?studyId=${studyId}`, { token: as(owner) })).body.items;
    expect(all.map((c: { runId: string }) => c.runId)).not.toContain(runOf.converging);
    // The owner was told once.
    const mails = await database.db.selectFrom('mail_outbox').select('dedupe_key').where('to_address', '=', owner.email).execute();
    expect(mails.filter((m) => m.dedupe_key.startsWith('candidate:'))).toHaveLength(2);
  });

  it('the fitted T̂ agrees with the time at which the gradient bound was hit, within the fit\'s uncertainty', async () => {
    // The uncertainty includes the fit's model error (the shift of T̂ within the window), which matters in
    // two dimensions, where the rate has a logarithmic correction (Raphaël & Schweyer, arXiv:1301.1859).
    for (const key of ['b2', 'b3']) {
      const candidate = await candidateOf(runOf[key]!);
      const run = (await api.request('GET', `/api/runs/${runOf[key]}`, { token: as(owner) })).body;
      expect(run.outcome).toBe('blowup');
      expect(candidate.T).toBeGreaterThanOrEqual(run.summary.tFinal - candidate.TUncertainty);
      expect(Math.abs(candidate.T - run.summary.tFinal), `${key}: T̂ = ${candidate.T} ± ${candidate.TUncertainty}, bound hit at ${run.summary.tFinal}`).toBeLessThanOrEqual(candidate.TUncertainty);
    }
  });

  it('the evidence plots: max|∇u| against T̂ − t, rescaled profiles, history', async () => {
    const candidate = await candidateOf(runOf.b3);
    const plots = (await api.request('GET', `/api/candidates/${candidate.id}/plots`, { token: as(member) })).body;
    expect(plots.gradientVsTimeToBlowup.length).toBeGreaterThan(10);
    expect(plots.history.length).toBeGreaterThan(10);
    for (const [dt, grad] of plots.gradientVsTimeToBlowup) {
      expect(dt).toBeGreaterThan(0);
      expect(grad).toBeGreaterThan(0);
    }
  });

  it('a run that fails numerically never stays a candidate', async () => {
    // As if it had been flagged while running, then ended numerics-failed.
    const { id } = await database.db
      .insertInto('runs')
      .values({ study_id: studyId, owner_id: owner.id, spec: JSON.stringify(ball(2, 1.5 * Math.PI, 1e8)), state: 'finished', outcome: 'numerics-failed' })
      .returning('id')
      .executeTakeFirstOrThrow();
    await database.db
      .insertInto('candidates')
      .values({ run_id: id, study_id: studyId, found_while_running: true, kind: 'type-II', confidence: 0.6, evidence: '{}' })
      .execute();
    await waitFor('the failed run to leave the candidates', async () => !(await database.db.selectFrom('candidates').select('id').where('run_id', '=', id).executeTakeFirst()), 30_000);
  });

  it('verdicts: members of the study may record one (audited); viewers may not; outsiders see nothing', async () => {
    const candidate = await candidateOf(runOf.b2);
    expect((await api.request('POST', `/api/candidates/${candidate.id}/verdict`, { token: as(outsider), body: { verdict: 'confirmed' } })).status).toBe(404);
    expect((await api.request('GET', `/api/candidates/${candidate.id}`, { token: as(outsider) })).status).toBe(404);
    expect((await api.request('POST', `/api/candidates/${candidate.id}/verdict`, { token: as(viewer), body: { verdict: 'confirmed' } })).status).toBe(403);
    expect((await api.request('POST', `/api/candidates/${candidate.id}/verdict`, { token: as(member), body: { verdict: 'maybe' } })).status).toBe(400);
    const done = await api.request('POST', `/api/candidates/${candidate.id}/verdict`, { token: as(member), body: { verdict: 'needs-finer-run', note: 'λ only followed to 1e-8' } });
    expect(done.status).toBe(200);
    expect(done.body).toMatchObject({ verdict: 'needs-finer-run', verdictNote: 'λ only followed to 1e-8', verdictBy: member.id });
    const audit = await database.db.selectFrom('audit_log').selectAll().where('action', '=', 'candidate.verdict').where('subject_id', '=', candidate.id).execute();
    expect(audit).toHaveLength(1);
    expect(audit[0]!.actor_id).toBe(member.id);
    const open = (await api.request('GET', `/api/candidates?studyId=${studyId}&verdict=none`, { token: as(owner) })).body.items;
    expect(open.map((c: { id: string }) => c.id)).not.toContain(candidate.id);
  });

  it('fork finer: a run with twice the grid from the checkpoint before the indicators fired, linked for comparison', async () => {
    const candidate = await candidateOf(runOf.b3);
    const fork = await api.request('POST', `/api/candidates/${candidate.id}/fork-finer`, { token: as(member) });
    expect(fork.status).toBe(201);
    expect(fork.body.spec.grid.points).toBe(400);
    expect(fork.body.parentCheckpointId).toBe(candidate.checkpointId);
    expect(fork.body.parentRunId).toBe(runOf.b3);
    const linked = (await api.request('GET', `/api/candidates/${candidate.id}`, { token: as(owner) })).body;
    expect(linked.finerRunId).toBe(fork.body.id);
    expect(linked.finer).toMatchObject({ runId: fork.body.id });
  });

  it('a run that has not ended is flagged as soon as its latest checkpoint shows the indicators', async () => {
    // A state in the middle of the B³ blow-up (numerics.md §4.5), computed here with the engine and stored
    // as the checkpoint of a paused run, as a worker would have left it.
    const spec = parseRunSpec(ball(3, 2 * Math.PI, 1e10));
    const engineRun = createFlowRun(spec);
    let fired = false;
    while (!fired) {
      const step = advanceFlowRun(engineRun, { maxSteps: 5 });
      expect(step.done, 'the run ended before the indicators fired').toBe(false);
      const estimate = blowupEstimate(engineRun);
      fired = estimate.kind === 'type-I' && estimate.confidence >= 0.5;
    }
    const bytes = Buffer.from(serializeCheckpoint(engineRun));
    const { id: runId } = await database.db
      .insertInto('runs')
      .values({ study_id: studyId, owner_id: owner.id, spec: JSON.stringify(spec), state: 'paused', pause_reason: 'request' })
      .returning('id')
      .executeTakeFirstOrThrow();
    const checkpoint = await database.db
      .insertInto('checkpoints')
      .values({ run_id: runId, seq: 1, step: engineRun.s.step, t: runDiagnostics(engineRun).t, points: engineRun.r.length, reason: 'pause', cpu_seconds: 1, size_bytes: bytes.length, sha256: createHash('sha256').update(bytes).digest('hex'), state: bytes })
      .returning('id')
      .executeTakeFirstOrThrow();
    const candidate = await candidateOf(runId);
    expect(candidate.foundWhileRunning).toBe(true);
    expect(candidate.runState).toBe('paused');
    expect(candidate.kind).toBe('type-I');
    expect(candidate.checkpointId).toBe(checkpoint.id);
  });
});
