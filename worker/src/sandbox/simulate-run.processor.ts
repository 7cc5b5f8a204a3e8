// The sandboxed processor of `simulate-run` jobs: BullMQ loads this compiled file in a
// worker thread (useWorkerThreads), so the CPU-bound engine never starves the main
// process's lock renewal. No dependency injection here: the thread builds its own
// small PostgreSQL pool and Redis publisher once and reuses them for every job it runs.
import { threadId } from 'node:worker_threads';
import { Redis } from 'ioredis';
import { UnrecoverableError, type SandboxedJob } from 'bullmq';
import type { Kysely } from 'kysely';
import { RunJobName, simulateRunPayloadSchema, describeZodError } from '@kiln/shared';
import { createDatabase, type Database } from '@kiln/shared/db';
import { loadWorkerConfig, type WorkerConfig } from '../config/worker-config';
import { RunEventsPublisher } from './run-events.publisher';
import { RunStore } from './run-store';
import { DEFAULT_FLUSH_MS, DEFAULT_SLICE_MS, RunExecution, type ExecutionResult } from './run-execution';

const log = (message: string) => console.log(`[kiln worker ${process.pid} thread ${threadId}] ${message}`);

interface ThreadResources {
  config: WorkerConfig;
  workerId: string;
  db: Kysely<Database>;
  events: RunEventsPublisher;
}

let resources: ThreadResources | undefined;

function threadResources(): ThreadResources {
  if (resources) return resources;
  const config = loadWorkerConfig();
  const db = createDatabase({ connectionString: config.DATABASE_URL, max: 2, applicationName: 'kiln-worker-sandbox' });
  const redis = new Redis(config.REDIS_URL, { maxRetriesPerRequest: null });
  redis.on('error', (error) => log(`redis publisher: ${error.message}`));
  resources = {
    config,
    // The main process passes its identity (workers.id) to its threads.
    workerId: process.env.KILN_WORKER_ID ?? `${config.KILN_WORKER_HOST}:${process.pid}`,
    db,
    events: new RunEventsPublisher(redis, log),
  };
  return resources;
}

export default async function simulateRunProcessor(
  job: SandboxedJob,
  _token?: string,
  signal?: AbortSignal,
): Promise<ExecutionResult> {
  if (job.name !== RunJobName.Simulate) {
    throw new UnrecoverableError(`no processor for job "${job.name}" on this queue (expected "${RunJobName.Simulate}")`);
  }
  const parsed = simulateRunPayloadSchema.safeParse(job.data);
  if (!parsed.success) throw new UnrecoverableError(`invalid ${RunJobName.Simulate} payload: ${describeZodError(parsed.error)}`);
  const { config, workerId, db, events } = threadResources();
  const store = new RunStore(db, parsed.data.runId, log);
  const execution = new RunExecution(
    store,
    events,
    { workerId, checkpointSeconds: config.KILN_CHECKPOINT_SECONDS, sliceMs: DEFAULT_SLICE_MS, flushMs: DEFAULT_FLUSH_MS },
    log,
    signal,
  );
  return execution.execute(parsed.data.attempt);
}
