// The queue and worker pool, measured (issue: sweeps on a worker pool). Run through
// `npm run bench:queue`, which starts PostgreSQL and Redis; uses the built dists.
import { spawn, type ChildProcess } from 'node:child_process';
import os from 'node:os';
import type { AddressInfo } from 'node:net';
import { performance } from 'node:perf_hooks';
import { createDatabase, migrateToLatest } from '@kiln/shared/db';
import { createFlowRun, advanceFlowRun, parseRunSpec, serializeCheckpoint, type RunSpecInput } from '@kiln/shared';
import { createApp } from '../../backend/dist/app.factory.js';
import { loadConfig } from '../../backend/dist/config/config.schema.js';
import { PasswordService } from '../../backend/dist/auth/password.service.js';
import { MIGRATIONS_FOLDER } from '../../backend/dist/database/migrations-folder.js';

const databaseUrl = process.env.DATABASE_URL!;
const redisUrl = process.env.REDIS_URL!;
const db = createDatabase({ connectionString: databaseUrl, max: 4 });
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function until<T>(probe: () => Promise<T | undefined | false>, timeoutMs = 600_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error('benchmark step timed out');
    await sleep(20);
  }
}

function startWorkers(count: number, checkpointSeconds: number): ChildProcess[] {
  return Array.from({ length: count }, (_, i) =>
    spawn(process.execPath, ['worker/dist/main.js'], {
      env: {
        ...process.env,
        DATABASE_URL: databaseUrl,
        REDIS_URL: redisUrl,
        KILN_WORKER_SLOTS: '1',
        KILN_CHECKPOINT_SECONDS: String(checkpointSeconds),
        KILN_HEARTBEAT_SECONDS: '0.5',
        KILN_WORKER_HOST: `bench-${i}`,
      },
      stdio: 'ignore',
    }),
  );
}

async function stopWorkers(children: ChildProcess[]): Promise<void> {
  await Promise.all(children.map((child) => new Promise((resolve) => (child.once('exit', resolve), child.kill('SIGTERM')))));
  await db.updateTable('workers').set({ stopped_at: new Date() }).where('stopped_at', 'is', null).execute();
}

async function aliveWorkers(): Promise<number> {
  const row = await db.selectFrom('workers').select((eb) => eb.fn.countAll<number>().as('n')).where('stopped_at', 'is', null).executeTakeFirstOrThrow();
  return Number(row.n);
}

async function main(): Promise<void> {
  await migrateToLatest(db, MIGRATIONS_FOLDER);
  const app = await createApp(
    loadConfig({ DATABASE_URL: databaseUrl, REDIS_URL: redisUrl, JWT_SECRET: 'bench-secret-bench-secret-bench-secret!', KILN_SCHEDULER_TICK_MS: '50', KILN_WORKER_STALE_SECONDS: '5' }),
    { logger: false },
  );
  await app.listen(0, '127.0.0.1');
  const base = `http://127.0.0.1:${(app.getHttpServer().address() as AddressInfo).port}`;
  const password = 'bench-password';
  await db.insertInto('users').values({ email: 'bench@kiln.example', name: 'Bench', role: 'researcher', password_hash: await new PasswordService().hash(password) }).execute();
  const call = async (method: string, path: string, body?: unknown, token?: string) => {
    const response = await fetch(`${base}${path}`, {
      method,
      headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return response.json() as Promise<any>;
  };
  const token = (await call('POST', '/api/auth/login', { email: 'bench@kiln.example', password })).accessToken as string;
  const studyId = (await call('POST', '/api/studies', { name: 'Bench' }, token)).id as string;
  const quick: RunSpecInput = {
    domain: { kind: 'ball', dim: 2, boundaryAngle: 0.9 * Math.PI },
    target: { kind: 'sphere' },
    initial: { kind: 'identity' },
    grid: { points: 300 },
    time: { tMax: 50, maxStep: 0.05 },
    stop: { tension: 1e-8 },
  };
  const sweep = (name: string, baseSpec: RunSpecInput, axes: unknown[]) => call('POST', '/api/sweeps', { studyId, name, base: baseSpec, axes }, token);
  const finished = (sweepId: string, n: number) =>
    until(async () => {
      const row = await db.selectFrom('runs').select((eb) => eb.fn.countAll<number>().as('n')).where('sweep_id', '=', sweepId).where('state', '=', 'finished').executeTakeFirstOrThrow();
      return Number(row.n) === n;
    });

  console.log(`Kiln queue benchmark — ${os.cpus().length} cores (${os.cpus()[0]?.model ?? 'unknown CPU'}), Node ${process.version}\n`);

  // 1. Submission of a 1,000-run sweep (no workers: admission has nothing to do).
  const submit: number[] = [];
  for (let i = 0; i < 5; i++) {
    const t0 = performance.now();
    const s = await sweep(`submit-${i}`, quick, [
      { path: 'domain.boundaryAngle', range: { from: 0.1, to: 3, steps: 40 } },
      { path: 'stop.tension', range: { from: 1e-10, to: 1e-6, steps: 25, scale: 'log' } },
    ]);
    submit.push(performance.now() - t0);
    if (s.runCount !== 1000) throw new Error(JSON.stringify(s));
  }
  // The scheduler is updating the same rows (wait reasons): retry if the two deadlock.
  for (let tries = 0; ; tries++) {
    try {
      await db.updateTable('runs').set({ state: 'cancelled' }).where('state', 'in', ['queued', 'waiting']).execute();
      break;
    } catch (error) {
      if (tries > 5) throw error;
    }
  }
  console.log(`1,000-run sweep submission (POST /api/sweeps, validated and written in one transaction): median ${median(submit).toFixed(0)} ms of 5 (min ${Math.min(...submit).toFixed(0)}, max ${Math.max(...submit).toFixed(0)})`);

  // 2. Submit-to-first-step latency with an idle worker.
  let workers = startWorkers(1, 60);
  await until(async () => (await aliveWorkers()) === 1);
  const latency: number[] = [];
  for (let i = 0; i < 7; i++) {
    const t0 = performance.now();
    const s = await sweep(`latency-${i}`, quick, [{ path: 'grid.points', values: [300] }]);
    await until(async () => db.selectFrom('run_metrics').innerJoin('runs', 'runs.id', 'run_metrics.run_id').select('run_metrics.step').where('runs.sweep_id', '=', s.id).executeTakeFirst());
    latency.push(performance.now() - t0);
    await finished(s.id, 1);
  }
  console.log(`submit-to-first-step latency, idle worker (first metric row in PostgreSQL, scheduler tick 50 ms): median ${median(latency).toFixed(0)} ms of 7 (min ${Math.min(...latency).toFixed(0)}, max ${Math.max(...latency).toFixed(0)})`);

  // 3. Checkpoint overhead: one longer run, checkpoint every second vs only at the end.
  const long: RunSpecInput = { ...quick, grid: { points: 2000 }, time: { tMax: 20, maxStep: 0.002, tolerance: 1e-8 }, stop: { tension: 1e-10 } };
  const cpuFor = async (label: string) => {
    const s = await sweep(label, long, [{ path: 'grid.points', values: [2000] }]);
    await finished(s.id, 1);
    const row = await db.selectFrom('runs').select(['id', 'cpu_seconds', 'started_at', 'finished_at']).where('sweep_id', '=', s.id).executeTakeFirstOrThrow();
    const checkpoints = await db.selectFrom('checkpoints').select(['size_bytes']).where('run_id', '=', row.id).execute();
    return { wall: (row.finished_at!.getTime() - row.started_at!.getTime()) / 1000, cpu: row.cpu_seconds, checkpoints: checkpoints.length, bytes: checkpoints[0]?.size_bytes ?? 0 };
  };
  await stopWorkers(workers);
  workers = startWorkers(1, 86_400);
  await until(async () => (await aliveWorkers()) === 1);
  const rare = await cpuFor('checkpoint-rare');
  await stopWorkers(workers);
  workers = startWorkers(1, 1);
  await until(async () => (await aliveWorkers()) === 1);
  const often = await cpuFor('checkpoint-often');
  await stopWorkers(workers);
  // The cost of one checkpoint, isolated: serialize the state and write it.
  const engineRun = createFlowRun(parseRunSpec(long));
  advanceFlowRun(engineRun, { maxSteps: 200 });
  const perCheckpoint: number[] = [];
  for (let i = 0; i < 20; i++) {
    const t0 = performance.now();
    const bytes = serializeCheckpoint(engineRun);
    await db.insertInto('mail_messages').values({ envelope_from: 'x', envelope_to: ['x'], subject: 'x', raw: Buffer.from(bytes).toString('base64') }).execute();
    perCheckpoint.push(performance.now() - t0);
  }
  const oneCheckpointMs = median(perCheckpoint);
  console.log(
    `checkpoint overhead (2,000-point run): every 1 s → ${often.checkpoints} checkpoints, wall ${often.wall.toFixed(2)} s; at the end only → ${rare.checkpoints}, wall ${rare.wall.toFixed(2)} s; ` +
      `difference ${(((often.wall - rare.wall) / rare.wall) * 100).toFixed(1)} % (noise included)`,
  );
  console.log(
    `  one checkpoint (${(often.bytes / 1024).toFixed(0)} KiB: serialize + INSERT) ≈ ${oneCheckpointMs.toFixed(2)} ms → share of run time at the default 60 s interval ≈ ${((oneCheckpointMs / 60_000) * 100).toFixed(4)} %, at 1 s ≈ ${((oneCheckpointMs / 1000) * 100).toFixed(2)} %`,
  );

  // 4. Throughput of short runs (under a second of CPU each): one worker process vs two on this machine.
  const short: RunSpecInput = { ...quick, grid: { points: 3000 }, time: { tMax: 50, maxStep: 0.05, tolerance: 1e-8 }, stop: { tension: 1e-9 } };
  const throughput = async (processes: number) => {
    workers = startWorkers(processes, 60);
    await until(async () => (await aliveWorkers()) === processes);
    const t0 = performance.now();
    const s = await sweep(`throughput-${processes}`, short, [{ path: 'domain.boundaryAngle', range: { from: 0.2 * Math.PI, to: 0.9 * Math.PI, steps: 24 } }]);
    await finished(s.id, 24);
    const seconds = (performance.now() - t0) / 1000;
    await stopWorkers(workers);
    return 24 / seconds;
  };
  const one = await throughput(1);
  const two = await throughput(2);
  console.log(`throughput of 24 short runs (3,000 points, ≈0.5–1 s CPU each): 1 worker process ${one.toFixed(2)} runs/s, 2 worker processes ${two.toFixed(2)} runs/s → ratio ${(two / one).toFixed(2)}× (target ≥ 1.8×)`);

  await app.close();
  await db.destroy();
}

main().catch(async (error) => {
  console.error(error);
  process.exit(1);
});
