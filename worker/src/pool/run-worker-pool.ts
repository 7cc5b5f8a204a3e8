import path from 'node:path';
import { Redis } from 'ioredis';
import { Worker, type Job } from 'bullmq';
import { CHANNELS, RUN_QUEUE, controlMessageSchema, type SimulateRunPayload } from '@kiln/shared';
import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';
import type { WorkerConfig } from '../config/worker-config';
import { AbortReason } from '../sandbox/abort-reason';

/** The compiled sandboxed processor, next to this file's folder in dist/. */
export const PROCESSOR_FILE = path.join(__dirname, '..', 'sandbox', 'simulate-run.processor.js');

/** Finished jobs kept in Redis for inspection (PostgreSQL keeps the results). */
const KEEP_COMPLETED = { age: 24 * 3_600, count: 5_000 };
const KEEP_FAILED = { age: 7 * 24 * 3_600, count: 5_000 };

/**
 * This process's share of the pool: one BullMQ Worker with `KILN_WORKER_SLOTS`
 * sandboxed worker threads, and the control channel that reaches the runs it holds.
 */
export class RunWorkerPool {
  private readonly worker: Worker<SimulateRunPayload>;
  private readonly subscriber: Redis;
  /** runId → job id of the runs this process holds, for pause and cancel. */
  private readonly held = new Map<string, string>();
  private stopping: Promise<void> | undefined;

  constructor(
    config: WorkerConfig,
    workerId: string,
    private readonly db: Kysely<Database>,
    private readonly log: (message: string) => void,
  ) {
    const lockMs = config.KILN_JOB_LOCK_SECONDS * 1000;
    this.worker = new Worker<SimulateRunPayload>(RUN_QUEUE, PROCESSOR_FILE, {
      connection: new Redis(config.REDIS_URL, { maxRetriesPerRequest: null }),
      concurrency: config.KILN_WORKER_SLOTS,
      useWorkerThreads: true,
      workerThreadsOptions: { env: { ...process.env, KILN_WORKER_ID: workerId } },
      lockDuration: lockMs,
      stalledInterval: lockMs,
      // Re-execution is cheap (it resumes from the last checkpoint), and a run must
      // survive many worker losses over days.
      maxStalledCount: 100,
      removeOnComplete: KEEP_COMPLETED,
      removeOnFail: KEEP_FAILED,
      autorun: false,
    });
    this.worker.on('error', (error) => log(`queue: ${error.message}`));
    this.worker.on('active', (job: Job<SimulateRunPayload>) => {
      if (job.id && job.data?.runId) this.held.set(job.data.runId, job.id);
    });
    const release = (job: Job<SimulateRunPayload> | undefined) => {
      if (job?.data?.runId && this.held.get(job.data.runId) === job.id) this.held.delete(job.data.runId);
    };
    this.worker.on('completed', (job) => release(job));
    this.worker.on('failed', (job, error) => {
      release(job);
      log(`job ${job?.id ?? '?'} failed: ${error.message}`);
    });
    // Fencing keeps a run safe if another worker took it over; the lost job's own
    // writes are refused at its next flush, so only log here.
    this.worker.on('stalled', (jobId) => log(`job ${jobId} stalled (its worker stopped renewing the lock); it goes back to the queue`));
    this.worker.on('lockRenewalFailed', (jobIds) => log(`could not renew the lock of job(s) ${jobIds.join(', ')}`));

    this.subscriber = new Redis(config.REDIS_URL, { maxRetriesPerRequest: null });
    this.subscriber.on('error', (error) => log(`control channel: ${error.message}`));
    this.subscriber.on('message', (_channel, text: string) => void this.onControl(text));
  }

  async start(): Promise<void> {
    await this.subscriber.subscribe(CHANNELS.control);
    void this.worker.run().catch((error: unknown) => this.log(`worker stopped: ${error instanceof Error ? error.message : String(error)}`));
  }

  /**
   * Pause or cancel announced by the API: abort the held job's signal so its loop
   * re-reads the row. A job's signal aborts only once, and graceful shutdown needs
   * it too, so it is aborted only when the row really carries a request (the API
   * writes the row before it publishes).
   */
  private async onControl(text: string): Promise<void> {
    let message;
    try {
      message = controlMessageSchema.parse(JSON.parse(text));
    } catch {
      this.log(`ignored a malformed control message: ${text.slice(0, 200)}`);
      return;
    }
    const jobId = this.held.get(message.runId);
    if (!jobId || this.stopping) return;
    const row = await this.db
      .selectFrom('runs')
      .select('control_request')
      .where('id', '=', message.runId)
      .executeTakeFirst()
      .catch(() => undefined);
    // Unreadable (PostgreSQL away): the run's own once-a-second flush will see the request.
    if (!row?.control_request) return;
    if (this.held.get(message.runId) === jobId && this.worker.cancelJob(jobId, AbortReason.Control)) {
      this.log(`run ${message.runId}: ${message.request} requested, signalled job ${jobId}`);
    }
  }

  /**
   * Graceful shutdown: take no new jobs, make every running job checkpoint and hand
   * its run back, wait for them, close. Jobs that were being fetched while stopping
   * are signalled as they become active.
   */
  stop(): Promise<void> {
    this.stopping ??= (async () => {
      this.worker.on('active', () => setImmediate(() => this.worker.cancelAllJobs(AbortReason.Shutdown)));
      await this.worker.pause(true);
      this.worker.cancelAllJobs(AbortReason.Shutdown);
      // A job picked up in the same instant may be tracked a moment later.
      const again = setInterval(() => this.worker.cancelAllJobs(AbortReason.Shutdown), 100);
      try {
        await this.worker.close();
      } finally {
        clearInterval(again);
      }
      this.subscriber.disconnect();
    })();
    return this.stopping;
  }
}
