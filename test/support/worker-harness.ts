// Helpers for the worker pool's integration tests: real worker processes spawned from
// worker/dist/main.js, run rows inserted and jobs enqueued the way the scheduler does
// (docs/run-lifecycle.md, "Admission"), and the engine run directly as the reference.
import { spawn, type ChildProcess } from 'node:child_process';
import { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { sql, type Kysely } from 'kysely';
import { createRequire } from 'node:module';
import path from 'node:path';
import {
  CHANNELS,
  RUN_QUEUE,
  RunJobName,
  simulateRunJobId,
  type DiagnosticSample,
  type FlowSummary,
  type RunEvent,
  type RunSpecInput,
} from '@kiln/shared';
import type { Database } from '@kiln/shared/db';
import { freePort, portIsOpen, waitFor } from './ports';

export interface WorkerProcess {
  child: ChildProcess;
  pid: number;
  /** Everything the process printed so far. */
  output(): string;
  exited: Promise<number | null>;
  kill(signal: NodeJS.Signals): void;
}

/** Starts `node <entry>` (a worker, or the supervisor) with the given environment. */
export function spawnNode(entry: string, env: Record<string, string>): WorkerProcess {
  const child = spawn(process.execPath, [entry], { env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  child.stdout!.on('data', (chunk) => (output += chunk));
  child.stderr!.on('data', (chunk) => (output += chunk));
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  return {
    child,
    pid: child.pid!,
    output: () => output,
    exited,
    kill: (signal) => {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
    },
  };
}

export interface WorkerEnv {
  databaseUrl: string;
  redisUrl: string;
  checkpointSeconds?: number;
  lockSeconds?: number;
  slots?: number;
  host?: string;
}

export function workerEnv(options: WorkerEnv): Record<string, string> {
  return {
    DATABASE_URL: options.databaseUrl,
    REDIS_URL: options.redisUrl,
    KILN_WORKER_SLOTS: String(options.slots ?? 1),
    KILN_CHECKPOINT_SECONDS: String(options.checkpointSeconds ?? 60),
    KILN_JOB_LOCK_SECONDS: String(options.lockSeconds ?? 3),
    KILN_HEARTBEAT_SECONDS: '0.5',
    KILN_WORKER_HOST: options.host ?? 'test-host',
  };
}

/** Starts a worker process and waits until it has registered in `workers`. */
export async function startWorker(db: Kysely<Database>, options: WorkerEnv): Promise<WorkerProcess> {
  const worker = spawnNode('worker/dist/main.js', workerEnv(options));
  await waitFor(`worker ${worker.pid} to register`, async () => {
    if (worker.child.exitCode !== null) throw new Error(`worker exited early:\n${worker.output()}`);
    return /ready on/.test(worker.output()) && (await db.selectFrom('workers').select('id').where('pid', '=', worker.pid).executeTakeFirst());
  });
  return worker;
}

export async function stopProcesses(processes: WorkerProcess[]): Promise<void> {
  for (const p of processes) p.kill('SIGKILL');
  await Promise.all(processes.map((p) => p.exited));
}

/** A user and a study to own runs. */
export async function createOwnerAndStudy(db: Kysely<Database>): Promise<{ ownerId: string; studyId: string }> {
  const owner = await db
    .insertInto('users')
    .values({ email: `owner-${Math.random().toString(36).slice(2, 8)}@test.example`, name: 'Run owner', role: 'researcher', password_hash: 'x' })
    .returning('id')
    .executeTakeFirstOrThrow();
  const study = await db.insertInto('studies').values({ name: 'Worker tests', owner_id: owner.id }).returning('id').executeTakeFirstOrThrow();
  return { ownerId: owner.id, studyId: study.id };
}

/** Inserts a queued run with the normalized spec, as the sweeps API does. */
export async function insertRun(db: Kysely<Database>, owner: { ownerId: string; studyId: string }, spec: RunSpecInput): Promise<string> {
  const row = await db
    .insertInto('runs')
    .values({ study_id: owner.studyId, owner_id: owner.ownerId, spec: JSON.stringify(builtEngine.parseRunSpec(spec)) })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Admission as the scheduler does it: attempt + 1 and dispatched_at in PostgreSQL, then the job. */
export async function admitRun(db: Kysely<Database>, queue: Queue, runId: string): Promise<number> {
  const { attempt } = await db
    .updateTable('runs')
    .set((eb) => ({ attempt: eb('attempt', '+', 1), dispatched_at: sql<Date>`now()`, state: 'queued', wait_reason: null }))
    .where('id', '=', runId)
    .returning('attempt')
    .executeTakeFirstOrThrow();
  await queue.add(RunJobName.Simulate, { runId, attempt }, { jobId: simulateRunJobId({ runId, attempt }) });
  return attempt;
}

export function runQueue(redisUrl: string): Queue {
  return new Queue(RUN_QUEUE, { connection: { url: redisUrl, maxRetriesPerRequest: null } });
}

export async function runRow(db: Kysely<Database>, runId: string) {
  return db.selectFrom('runs').selectAll().where('id', '=', runId).executeTakeFirstOrThrow();
}

export function waitForRun(
  db: Kysely<Database>,
  runId: string,
  what: string,
  predicate: (row: Awaited<ReturnType<typeof runRow>>) => boolean,
  timeoutMs = 60_000,
) {
  return waitFor(what, async () => {
    const row = await runRow(db, runId);
    return predicate(row) ? row : undefined;
  }, timeoutMs);
}

export function waitForState(db: Kysely<Database>, runId: string, states: string[], timeoutMs = 60_000) {
  return waitForRun(db, runId, `run ${runId} to be ${states.join(' or ')}`, (row) => states.includes(row.state), timeoutMs);
}

/** The pid of the worker process holding the run (from `workers`). */
export async function holderPid(db: Kysely<Database>, runId: string): Promise<number | null> {
  const row = await db
    .selectFrom('runs')
    .innerJoin('workers', 'workers.id', 'runs.worker_id')
    .select('workers.pid')
    .where('runs.id', '=', runId)
    .executeTakeFirst();
  return row?.pid ?? null;
}

/**
 * The engine build the worker processes run (shared/dist, loaded by path): the
 * reference comes from the same code, so an engine edit not yet built cannot make
 * worker and reference differ. Build first (`npx tsc -b shared worker`; `npm test` does).
 */
export const builtEngine: typeof import('@kiln/shared') = createRequire(path.resolve('package.json'))('./shared/dist/index.js');

export interface Reference {
  summary: FlowSummary;
  samples: DiagnosticSample[];
}

/** The engine run directly, uninterrupted, to its outcome: what every worker result must equal. */
export function referenceRun(spec: RunSpecInput): Reference {
  const { createFlowRun, parseRunSpec: parse, advanceFlowRun, summarizeFlowRun, drainSamples } = builtEngine;
  const run = createFlowRun(parse(spec));
  advanceFlowRun(run);
  return { summary: summarizeFlowRun(run, 0), samples: drainSamples(run) };
}

/** A summary without its measured CPU seconds (the only field that differs between executions). */
export function withoutCpu(summary: unknown): Record<string, unknown> {
  const { cpuSeconds: _cpu, ...rest } = summary as Record<string, unknown>;
  return rest;
}

/** The run's metric rows as (step, energy, tension) in step order. */
export async function metricRows(db: Kysely<Database>, runId: string) {
  return db
    .selectFrom('run_metrics')
    .select(['step', 'energy', 'tension', 't'])
    .where('run_id', '=', runId)
    .orderBy('step')
    .execute();
}

export async function checkpointRows(db: Kysely<Database>, runId: string) {
  return db.selectFrom('checkpoints').selectAll().where('run_id', '=', runId).orderBy('seq').execute();
}

/**
 * A ball B² → S² run with h₀ = α·r on a fine grid with small steps: converges (or
 * reaches tMax) after a few seconds of CPU, long enough to checkpoint and interrupt.
 */
export function longBallSpec(tMax: number, alphaOverPi = 0.9): RunSpecInput {
  return {
    domain: { kind: 'ball', dim: 2, boundaryAngle: alphaOverPi * Math.PI },
    target: { kind: 'sphere' },
    initial: { kind: 'identity' },
    grid: { points: 1000 },
    time: { tMax, maxStep: 0.002, tolerance: 1e-8 },
    stop: { tension: 1e-10 },
  };
}

/** Fast specs (well under a second each) with different outcomes. */
export function quickSpecs(): RunSpecInput[] {
  const ball = (alphaOverPi: number, points: number, gradientBound = 1e8): RunSpecInput => ({
    domain: { kind: 'ball', dim: 2, boundaryAngle: alphaOverPi * Math.PI },
    target: { kind: 'sphere' },
    initial: { kind: 'identity' },
    grid: { points },
    time: { tMax: 50, maxStep: 0.05 },
    stop: { tension: 1e-8, gradientBound },
  });
  return [
    ball(0.9, 200),
    ball(0.8, 300),
    ball(0.5, 150),
    ball(1.1, 200, 1e5),
    {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'ellipsoid', axisRatio: 2 },
      initial: { kind: 'identity' },
      grid: { points: 80 },
      time: { tMax: 100, maxStep: 0.5 },
    },
    {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'ellipsoid', axisRatio: 5 },
      initial: { kind: 'identity' },
      grid: { points: 100 },
      time: { tMax: 100, maxStep: 1 },
      stop: { gradientBound: 1e4 },
    },
  ];
}

/** Collects the RunEvents workers publish on Redis. */
export async function collectRunEvents(redisUrl: string): Promise<{ events: RunEvent[]; close(): void }> {
  const subscriber = new Redis(redisUrl, { maxRetriesPerRequest: null });
  const events: RunEvent[] = [];
  subscriber.on('message', (_channel, text: string) => events.push(JSON.parse(text) as RunEvent));
  await subscriber.subscribe(CHANNELS.runEvents);
  return { events, close: () => subscriber.disconnect() };
}

export interface RestartableRedis {
  url: string;
  /** Kills the server (SIGKILL: no persistence, everything in it is lost). */
  kill(): Promise<void>;
  /** Starts an empty server on the same port. */
  start(): Promise<void>;
}

/** A private redis-server that a test can kill and start again on the same port. */
export async function startRestartableRedis(): Promise<RestartableRedis> {
  const port = await freePort();
  let child: ChildProcess | undefined;
  const start = async () => {
    child = spawn('redis-server', ['--bind', '127.0.0.1', '--port', String(port), '--save', '', '--appendonly', 'no'], { stdio: 'ignore' });
    await waitFor(`redis-server on ${port}`, () => portIsOpen(port));
  };
  const kill = async () => {
    const current = child;
    if (!current || current.exitCode !== null || current.signalCode !== null) return;
    const exited = new Promise((resolve) => current.once('exit', resolve));
    current.kill('SIGKILL');
    await exited;
  };
  await start();
  return { url: `redis://127.0.0.1:${port}`, kill, start };
}
