import { Inject, Injectable, type OnApplicationShutdown, type OnModuleInit } from '@nestjs/common';
import type { Redis } from 'ioredis';
import { Subject, type Observable } from 'rxjs';
import { CHANNELS, type ControlMessage, type RunEvent } from '@kiln/shared';
import { REDIS } from '../redis/redis.module';

/**
 * Redis pub/sub for runs: live events from the workers fanned out to SSE
 * clients, and control requests announced to the workers. Pub/sub is a live
 * feed only; PostgreSQL keeps the record.
 */
@Injectable()
export class RunEventsService implements OnModuleInit, OnApplicationShutdown {
  private readonly events = new Subject<RunEvent>();
  private subscriber: Redis | undefined;

  constructor(@Inject(REDIS) private readonly redis: Redis) {}

  onModuleInit(): void {
    // A subscribing connection can do nothing else, hence its own; it re-subscribes after reconnects.
    const subscriber = this.redis.duplicate({ enableOfflineQueue: true, maxRetriesPerRequest: null });
    subscriber.on('error', () => undefined);
    subscriber.on('message', (_channel, message) => {
      try {
        this.events.next(JSON.parse(message) as RunEvent);
      } catch {
        // A malformed message is dropped; the live view is best effort.
      }
    });
    void subscriber.subscribe(CHANNELS.runEvents).catch(() => undefined);
    this.subscriber = subscriber;
  }

  get stream(): Observable<RunEvent> {
    return this.events.asObservable();
  }

  /** Publishes an event; failures are ignored (PostgreSQL already has the change). */
  async publish(event: RunEvent): Promise<void> {
    await this.redis.publish(CHANNELS.runEvents, JSON.stringify(event)).catch(() => undefined);
  }

  async announceControl(message: ControlMessage): Promise<void> {
    await this.redis.publish(CHANNELS.control, JSON.stringify(message)).catch(() => undefined);
  }

  onApplicationShutdown(): void {
    this.subscriber?.disconnect();
    this.events.complete();
  }
}
