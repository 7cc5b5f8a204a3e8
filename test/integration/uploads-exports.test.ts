import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Role, type RunSpec } from '@kiln/shared';
import { createPerson, type TestPerson } from '../support/people';
import { waitFor } from '../support/ports';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { longBallSpec, referenceRun, startWorker, stopProcesses, withoutCpu, type WorkerProcess } from '../support/worker-harness';

/**
 * An independent reader of NumPy's .npy format (version 1.0, as NumPy's format
 * description defines it): magic, version, header length, dict header, C-order data.
 */
function readNpy(bytes: Uint8Array): { shape: number[]; data: number[] } {
  const magic = Array.from(bytes.slice(0, 6));
  if (magic.join() !== [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59].join()) throw new Error('not an .npy file');
  if (bytes[6] !== 1 || bytes[7] !== 0) throw new Error(`unsupported version ${bytes[6]}.${bytes[7]}`);
  const headerLength = bytes[8]! | (bytes[9]! << 8);
  const header = new TextDecoder('latin1').decode(bytes.slice(10, 10 + headerLength));
  if ((10 + headerLength) % 64 !== 0) throw new Error('header not aligned to 64 bytes');
  if (!/'descr':\s*'<f8'/.test(header) || !/'fortran_order':\s*False/.test(header)) throw new Error(`unexpected header ${header}`);
  const shape = header.match(/'shape':\s*\(([^)]*)\)/)![1]!.split(',').filter((s) => s.trim()).map((s) => Number(s));
  const view = new DataView(bytes.buffer, bytes.byteOffset + 10 + headerLength);
  const count = shape.reduce((a, b) => a * b, 1);
  const data = Array.from({ length: count }, (_, i) => view.getFloat64(i * 8, true));
  return { shape, data };
}

describe('uploads and exports', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let api: TestApi;
  let alice: TestPerson, bruno: TestPerson;
  const tokens: Record<string, string> = {};
  const studies: Record<string, string> = {};
  const workers: WorkerProcess[] = [];

  const upload = async (person: TestPerson, kind: string, content: string | Uint8Array, filename = 'profile.csv') => {
    const form = new FormData();
    form.set('kind', kind);
    form.set('file', new Blob([content]), filename);
    const response = await fetch(`${api.baseUrl}/api/uploads`, { method: 'POST', headers: { authorization: `Bearer ${tokens[person.email]}` }, body: form });
    return { status: response.status, body: await response.json() };
  };
  const uploadCount = async () => Number((await database.db.selectFrom('uploads').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow()).n);
  const csv = (header: string, rows: number[][]) => [header, ...rows.map((r) => r.join(','))].join('\n');

  beforeAll(async () => {
    database = await createTestDatabase();
    redis = await startTestRedis();
    api = await startTestApi(database.url, { REDIS_URL: redis.url, KILN_SCHEDULER_TICK_MS: '150' });
    alice = await createPerson(database.db, Role.Researcher);
    bruno = await createPerson(database.db, Role.Researcher);
    for (const p of [alice, bruno]) {
      tokens[p.email] = (await api.request('POST', '/api/auth/login', { body: { email: p.email, password: p.password } })).body.accessToken;
      studies[p.email] = (await api.request('POST', '/api/studies', { token: tokens[p.email], body: { name: `study of ${p.email}` } })).body.id;
    }
    workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host: 'up-a', checkpointSeconds: 1 }));
  });
  afterAll(async () => {
    await stopProcesses(workers);
    await api?.close();
    await redis?.stop();
    await database?.drop();
  });

  describe('malformed uploads are refused with the problem named, and nothing is stored', () => {
    const ramp = (n: number) => Array.from({ length: n }, (_, i) => [(i / (n - 1)) * Math.PI, (i / (n - 1)) * Math.PI]);
    it.each([
      ['wrong columns', 'initial-profile', csv('x,y', ramp(5)), /header must be exactly "r,h"/],
      ['text in a number', 'initial-profile', csv('r,h', ramp(5)).replace('\n0.7853981633974483,', '\nabc,'), /row 3, column r: "abc" is not a finite number/],
      ['NaN', 'initial-profile', csv('r,h', ramp(5)).replace(/,3\.14159\d*$/, ',NaN'), /column h: "NaN" is not a finite number/],
      ['unsorted r', 'initial-profile', csv('r,h', [[0, 0], [1, 1], [0.5, 0.5], [Math.PI, Math.PI]]), /r must increase strictly/],
      ['a sphere profile that misses h(π) = π', 'initial-profile', csv('r,h', [[0, 0], [1, 1], [2, 2], [Math.PI, 3]]), /h must be π at r = π/],
      ['a target whose f does not vanish at a pole', 'target-profile', csv('h,f,z', [[0, 0.1, 1], [1, 1, 0], [Math.PI, 0, -1]]), /f must be 0 at the pole h = 0/],
      ['binary garbage as a profile', 'initial-profile', '\u0000\u0001\u0002garbage', /binary/],
      ['binary garbage as a checkpoint', 'checkpoint', '\u0000\u0001\u0002garbage', /not a readable Kiln checkpoint/],
      ['an unknown kind', 'spreadsheet', csv('r,h', ramp(5)), /kind must be one of/],
    ])('%s', async (_label, kind, content, message) => {
      const before = await uploadCount();
      const response = await upload(alice, kind, content);
      expect(response.status).toBe(400);
      const said = [response.body.message, ...response.body.details.map((d: { path: string; message: string }) => `${d.path}: ${d.message}`)].join('\n');
      expect(said).toMatch(message);
      expect(await uploadCount()).toBe(before);
    });

    it('a file over the size limit', async () => {
      const before = await uploadCount();
      const big = `r,h\n${'0.5,0.5\n'.repeat(300_000)}`;
      const response = await upload(alice, 'initial-profile', big);
      expect(response.status).toBe(400);
      expect(response.body.message).toMatch(/at most \d+ bytes/);
      expect(await uploadCount()).toBe(before);
    });

    it('no file at all, or no sign-in', async () => {
      const form = new FormData();
      form.set('kind', 'initial-profile');
      const noFile = await fetch(`${api.baseUrl}/api/uploads`, { method: 'POST', headers: { authorization: `Bearer ${tokens[alice.email]}` }, body: form });
      expect(noFile.status).toBe(400);
      const anonymous = await fetch(`${api.baseUrl}/api/uploads`, { method: 'POST', body: form });
      expect(anonymous.status).toBe(401);
    });
  });

  it('a valid initial profile and a valid target profile are stored with what the check learnt', async () => {
    const n = 50;
    const initial = await upload(alice, 'initial-profile', csv('r,h', Array.from({ length: n }, (_, i) => [(i / (n - 1)) * Math.PI, (i / (n - 1)) * Math.PI])));
    expect(initial.status).toBe(201);
    expect(initial.body.summary).toEqual({ rows: n, domain: 'sphere' });
    const b = 2;
    const target = await upload(alice, 'target-profile', csv('h,f,z', Array.from({ length: n }, (_, i) => {
      const h = (i / (n - 1)) * Math.PI;
      return [h, i === 0 || i === n - 1 ? 0 : Math.sin(h), b * Math.cos(h)];
    })));
    expect(target.status).toBe(201);
    expect(target.body.summary).toEqual({ rows: n });
    const listed = (await api.request('GET', '/api/uploads', { token: tokens[alice.email] })).body;
    expect(listed.find((u: { id: string }) => u.id === initial.body.id).summary).toEqual({ rows: n, domain: 'sphere' });
  });

  it('a sweep from an uploaded initial profile and an uploaded target profile runs to an outcome; someone else\'s upload is refused', async () => {
    const n = 200;
    const grid = Array.from({ length: n }, (_, i) => (i / (n - 1)) * Math.PI);
    const initial = await upload(alice, 'initial-profile', csv('r,h', grid.map((r) => [r, r])));
    const b = 1.5;
    const target = await upload(alice, 'target-profile', csv('h,f,z', grid.map((h, i) => [h, i === 0 || i === n - 1 ? 0 : Math.sin(h), b * Math.cos(h)])));
    const base = {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'profile', uploadId: target.body.id },
      initial: { kind: 'table', uploadId: initial.body.id },
      grid: { points: 80 },
      time: { tMax: 100, maxStep: 0.5 },
      stop: { tension: 1e-7 },
    };
    const stolen = await api.request('POST', '/api/sweeps', { token: tokens[bruno.email], body: { studyId: studies[bruno.email], name: 'not mine', base, axes: [] } });
    expect(stolen.status).toBe(400);
    expect(stolen.body.message).toMatch(/no upload of yours/);
    const sweep = await api.request('POST', '/api/sweeps', { token: tokens[alice.email], body: { studyId: studies[alice.email], name: 'uploaded', base, axes: [] } });
    expect(sweep.status, sweep.text).toBe(201);
    const runId = (await database.db.selectFrom('runs').select('id').where('sweep_id', '=', sweep.body.id).executeTakeFirstOrThrow()).id;
    const run = await waitFor('the uploaded run to end', async () => {
      const r = (await api.request('GET', `/api/runs/${runId}`, { token: tokens[alice.email] })).body;
      return ['finished', 'failed'].includes(r.state) ? r : undefined;
    }, 120_000);
    expect(run.state, run.error).toBe('finished');
    expect(run.outcome).toBe('converged');
  }, 180_000);

  it('exports: metrics as CSV, the profile as CSV and as .npy read back by an independent reader; a checkpoint exported, imported by another person and resumed is bit-identical to resuming the original', async () => {
    const spec = longBallSpec(20);
    const sweep = await api.request('POST', '/api/sweeps', {
      token: tokens[alice.email],
      body: { studyId: studies[alice.email], name: 'to share', base: spec, axes: [] },
    });
    const runId = (await database.db.selectFrom('runs').select('id').where('sweep_id', '=', sweep.body.id).executeTakeFirstOrThrow()).id;
    await waitFor('a checkpoint', async () => (await database.db.selectFrom('checkpoints').select('id').where('run_id', '=', runId).executeTakeFirst()) !== undefined, 60_000);
    await api.request('POST', `/api/runs/${runId}/pause`, { token: tokens[alice.email] });
    await waitFor('the pause', async () => (await api.request('GET', `/api/runs/${runId}`, { token: tokens[alice.email] })).body.state === 'paused', 30_000);

    const checkpoints = (await api.request('GET', `/api/runs/${runId}/checkpoints`, { token: tokens[alice.email] })).body;
    const last = checkpoints[checkpoints.length - 1];
    expect(last.reason).toBe('pause');

    // Metrics CSV = metrics JSON.
    const metricsJson = (await api.request('GET', `/api/runs/${runId}/metrics`, { token: tokens[alice.email] })).body;
    const metricsCsv = await (await fetch(`${api.baseUrl}/api/runs/${runId}/metrics.csv`, { headers: { authorization: `Bearer ${tokens[alice.email]}` } })).text();
    const lines = metricsCsv.trim().split('\r\n');
    expect(lines[0]).toBe('step,t,dt,energy,tension,gradMax,gradMaxAt,lambda,center,sigma,sigmaDenominator,points,newtonIterations');
    expect(lines).toHaveLength(metricsJson.length + 1);
    expect(Number(lines[1]!.split(',')[3])).toBe(metricsJson[0].energy);

    // Profile: JSON, CSV and .npy agree to the last bit.
    const profile = (await api.request('GET', `/api/checkpoints/${last.id}/profile`, { token: tokens[alice.email] })).body;
    const npyBytes = new Uint8Array(await (await fetch(`${api.baseUrl}/api/checkpoints/${last.id}/profile.npy`, { headers: { authorization: `Bearer ${tokens[alice.email]}` } })).arrayBuffer());
    const npy = readNpy(npyBytes);
    expect(npy.shape).toEqual([profile.r.length, 2]);
    for (let i = 0; i < profile.r.length; i++) {
      expect(npy.data[2 * i]).toBe(profile.r[i]);
      expect(npy.data[2 * i + 1]).toBe(profile.h[i]);
    }
    const profileCsv = await (await fetch(`${api.baseUrl}/api/checkpoints/${last.id}/profile.csv`, { headers: { authorization: `Bearer ${tokens[alice.email]}` } })).text();
    expect(profileCsv.trim().split('\r\n').slice(1).map((l) => l.split(',').map(Number))).toEqual(profile.r.map((r: number, i: number) => [r, profile.h[i]]));

    // Bruno may not read Alice's checkpoint through the API...
    expect((await fetch(`${api.baseUrl}/api/checkpoints/${last.id}/file`, { headers: { authorization: `Bearer ${tokens[bruno.email]}` } })).status).toBe(404);
    // ...but Alice can send him the file, and he resumes it in his own study.
    const file = new Uint8Array(await (await fetch(`${api.baseUrl}/api/checkpoints/${last.id}/file`, { headers: { authorization: `Bearer ${tokens[alice.email]}` } })).arrayBuffer());
    const uploaded = await upload(bruno, 'checkpoint', file, 'from-alice.kcp');
    expect(uploaded.status).toBe(201);
    const foreignStudy = await api.request('POST', `/api/uploads/${uploaded.body.id}/import`, { token: tokens[bruno.email], body: { studyId: studies[alice.email] } });
    expect(foreignStudy.status).toBe(404);
    const imported = await api.request('POST', `/api/uploads/${uploaded.body.id}/import`, { token: tokens[bruno.email], body: { studyId: studies[bruno.email] } });
    expect(imported.status).toBe(201);
    expect(imported.body.ownerId).toBe(bruno.id);

    await api.request('POST', `/api/runs/${runId}/resume`, { token: tokens[alice.email] });
    const done = async (id: string, token: string) =>
      waitFor(`run ${id} to finish`, async () => {
        const run = (await api.request('GET', `/api/runs/${id}`, { token })).body;
        return run.state === 'finished' ? run : undefined;
      }, 120_000);
    const original = await done(runId, tokens[alice.email]);
    const copy = await done(imported.body.id, tokens[bruno.email]);
    expect(withoutCpu(copy.summary)).toEqual(withoutCpu(original.summary));
    expect(withoutCpu(original.summary)).toEqual(withoutCpu(referenceRun(spec as RunSpec).summary));
  }, 240_000);
});
