import type { Redis } from 'ioredis';
import { CHANNELS, type RunEvent } from '@kiln/shared';

/**
 * Publishes a run's live events on Redis. Best effort: the live view is not the
 * truth (PostgreSQL is), so a publish never blocks or fails the run; while Redis is
 * away ioredis queues commands and sends them on reconnect, in order.
 */
export class RunEventsPublisher {
  constructor(
    private readonly redis: Redis,
    private readonly log: (message: string) => void,
  ) {}

  publish(event: RunEvent): void {
    this.redis.publish(CHANNELS.runEvents, JSON.stringify(event)).catch((error: unknown) => {
      this.log(`could not publish a ${event.type} event of run ${event.runId}: ${error instanceof Error ? error.message : String(error)}`);
    });
  }
}
