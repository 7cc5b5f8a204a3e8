import { Global, Inject, Module, type OnApplicationShutdown } from '@nestjs/common';
import { Redis } from 'ioredis';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';

export const REDIS = Symbol('REDIS');

/**
 * A Redis client for probes and pub/sub. It does not queue commands while
 * disconnected, so a dead Redis makes callers fail fast instead of hanging.
 */
@Global()
@Module({
  providers: [
    {
      provide: REDIS,
      inject: [KILN_CONFIG],
      useFactory: (config: KilnConfig) => {
        const client = new Redis(config.REDIS_URL, {
          lazyConnect: false,
          enableOfflineQueue: false,
          maxRetriesPerRequest: 1,
          connectTimeout: 2_000,
          retryStrategy: (attempt) => Math.min(attempt * 250, 2_000),
        });
        client.on('error', () => undefined); // reported through /api/health instead
        return client;
      },
    },
  ],
  exports: [REDIS],
})
export class RedisModule implements OnApplicationShutdown {
  constructor(@Inject(REDIS) private readonly redis: Redis) {}

  onApplicationShutdown(): void {
    this.redis.disconnect();
  }
}
