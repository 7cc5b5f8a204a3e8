// Keeps KILN_WORKER_PROCESSES worker processes (dist/main.js) running on this machine:
// restarts one that dies, after a short backoff that grows while it keeps dying
// quickly; on SIGTERM or SIGINT forwards the signal to every worker (each checkpoints
// and hands its runs back) and exits once all have exited.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { loadSupervisorConfig } from './config/supervisor-config';

const log = (message: string) => console.log(`[kiln supervisor ${process.pid}] ${message}`);

const WORKER_ENTRY = path.join(__dirname, 'main.js');
/** First restart delay; doubles while a worker dies within STABLE_MS of starting. */
const BACKOFF_INITIAL_MS = 500;
const BACKOFF_MAX_MS = 30_000;
const STABLE_MS = 30_000;

interface Slot {
  index: number;
  child: ChildProcess | null;
  startedAt: number;
  backoffMs: number;
  timer: NodeJS.Timeout | null;
}

function main(): void {
  const { KILN_WORKER_PROCESSES: count } = loadSupervisorConfig();
  let stopping = false;
  let failures = 0;
  const slots: Slot[] = Array.from({ length: count }, (_, index) => ({
    index,
    child: null,
    startedAt: 0,
    backoffMs: BACKOFF_INITIAL_MS,
    timer: null,
  }));

  const finishIfDone = () => {
    if (stopping && slots.every((slot) => slot.child === null)) {
      log(`all worker processes have exited`);
      process.exit(failures > 0 ? 1 : 0);
    }
  };

  const startWorker = (slot: Slot) => {
    slot.timer = null;
    if (stopping) return;
    const child = spawn(process.execPath, [WORKER_ENTRY], { env: process.env, stdio: 'inherit' });
    slot.child = child;
    slot.startedAt = Date.now();
    log(`worker process ${slot.index + 1}/${count} started (pid ${child.pid})`);
    child.once('exit', (code, signal) => {
      slot.child = null;
      const how = signal ? `signal ${signal}` : `code ${code}`;
      if (stopping) {
        if (code !== 0) failures += 1;
        log(`worker process ${child.pid} exited (${how})`);
        finishIfDone();
        return;
      }
      // A worker that lived a while gets a quick restart; one that keeps dying backs off.
      if (Date.now() - slot.startedAt >= STABLE_MS) slot.backoffMs = BACKOFF_INITIAL_MS;
      const delay = slot.backoffMs;
      slot.backoffMs = Math.min(BACKOFF_MAX_MS, slot.backoffMs * 2);
      log(`worker process ${child.pid} died (${how}); restarting in ${(delay / 1000).toFixed(1)} s`);
      slot.timer = setTimeout(() => startWorker(slot), delay);
    });
  };

  const shutdown = (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: stopping ${slots.filter((s) => s.child).length} worker process(es)`);
    for (const slot of slots) {
      if (slot.timer) clearTimeout(slot.timer);
      slot.timer = null;
      slot.child?.kill(signal);
    }
    finishIfDone();
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));

  for (const slot of slots) startWorker(slot);
}

try {
  main();
} catch (error) {
  console.error(`[kiln supervisor] ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
}
