// A Kiln worker process: registers itself, heartbeats, and runs simulations from the
// queue in sandboxed worker threads (KILN_WORKER_SLOTS at once). Point any number of
// hosts at the same REDIS_URL and DATABASE_URL.
import { Redis } from 'ioredis';
import { createDatabase } from '@kiln/shared/db';
import { loadWorkerConfig } from './config/worker-config';
import { Heartbeat } from './heartbeat/heartbeat';
import { RunWorkerPool } from './pool/run-worker-pool';

const log = (message: string) => console.log(`[kiln worker ${process.pid}] ${message}`);

async function main(): Promise<void> {
  const config = loadWorkerConfig();
  const db = createDatabase({ connectionString: config.DATABASE_URL, max: 4, applicationName: 'kiln-worker' });
  const redis = new Redis(config.REDIS_URL, { maxRetriesPerRequest: null });
  redis.on('error', (error) => log(`redis: ${error.message}`));

  const startedAt = new Date();
  const identity = {
    id: `${config.KILN_WORKER_HOST}:${process.pid}:${startedAt.getTime()}`,
    host: config.KILN_WORKER_HOST,
    pid: process.pid,
    slots: config.KILN_WORKER_SLOTS,
    startedAt,
  };
  const heartbeat = new Heartbeat(db, identity, config.KILN_HEARTBEAT_SECONDS * 1000, (error) =>
    log(`heartbeat failed, will retry: ${error instanceof Error ? error.message : String(error)}`),
  );
  let pool: RunWorkerPool | undefined;

  // Installed before anything starts, so a signal during start-up also ends cleanly.
  let stopping = false;
  let started: Promise<void> = Promise.resolve();
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: shutting down (running jobs checkpoint and hand their runs back)`);
    await started.catch(() => undefined);
    await pool?.stop().catch((error: unknown) => log(`shutdown: ${error instanceof Error ? error.message : String(error)}`));
    await heartbeat.stop().catch(() => undefined);
    redis.disconnect();
    await db.destroy();
    process.exit(0);
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));

  started = (async () => {
    await redis.ping();
    await heartbeat.start();
    if (stopping) return;
    pool = new RunWorkerPool(config, identity.id, db, log);
    await pool.start();
    log(`ready on ${identity.host} with ${identity.slots} slot(s)`);
  })();
  await started;
}

main().catch((error: unknown) => {
  console.error(`[kiln worker] ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
