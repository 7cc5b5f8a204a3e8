import { Inject, Injectable, type OnApplicationShutdown } from '@nestjs/common';
import { Queue } from 'bullmq';
import { RUN_QUEUE, RunJobName, simulateRunJobId, simulateRunPayloadSchema, type SimulateRunPayload } from '@kiln/shared';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';

const READY_TIMEOUT_MS = 3_000;

/** The API's side of the BullMQ queue: it only adds jobs and looks them up. */
@Injectable()
export class RunQueue implements OnApplicationShutdown {
  readonly queue: Queue;

  constructor(@Inject(KILN_CONFIG) config: KilnConfig) {
    this.queue = new Queue(RUN_QUEUE, {
      // A producer should fail fast while Redis is away; the reconciler catches up later.
      connection: { url: config.REDIS_URL, enableOfflineQueue: false, maxRetriesPerRequest: 1 },
      defaultJobOptions: { removeOnComplete: { age: 3600, count: 10_000 }, removeOnFail: { age: 24 * 3600 } },
    });
    this.queue.on('error', () => undefined);
  }

  /** Waits for the Redis connection, failing after a few seconds instead of hanging. */
  private async ready(): Promise<void> {
    let timer: NodeJS.Timeout | undefined;
    try {
      await Promise.race([
        this.queue.waitUntilReady(),
        new Promise((_, reject) => {
          timer = setTimeout(() => reject(new Error('Redis is not reachable')), READY_TIMEOUT_MS);
        }),
      ]);
    } finally {
      clearTimeout(timer);
    }
  }

  async add(payloads: SimulateRunPayload[]): Promise<void> {
    if (payloads.length === 0) return;
    await this.ready();
    await this.queue.addBulk(
      payloads.map((payload) => ({
        name: RunJobName.Simulate,
        data: simulateRunPayloadSchema.parse(payload),
        opts: { jobId: simulateRunJobId(payload) },
      })),
    );
  }

  /** The BullMQ state of an admission's job, or 'missing'. */
  async jobState(payload: SimulateRunPayload): Promise<string> {
    await this.ready();
    const job = await this.queue.getJob(simulateRunJobId(payload));
    if (!job) return 'missing';
    return job.getState();
  }

  /** Removes a job that no worker has taken yet (cancelling a dispatched run). */
  async removeIfWaiting(payload: SimulateRunPayload): Promise<void> {
    const job = await this.queue.getJob(simulateRunJobId(payload));
    if (job && ['waiting', 'delayed', 'prioritized'].includes(await job.getState())) await job.remove().catch(() => undefined);
  }

  async onApplicationShutdown(): Promise<void> {
    await this.queue.close().catch(() => undefined);
  }
}
