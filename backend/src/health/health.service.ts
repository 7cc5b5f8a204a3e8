import { Inject, Injectable } from '@nestjs/common';
import { sql } from 'kysely';
import type { Redis } from 'ioredis';
import type { DependencyHealth, HealthResponse } from '@kiln/shared';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';
import { REDIS } from '../redis/redis.module';

/** A probe that has not answered within this time counts as down. */
const PROBE_TIMEOUT_MS = 1_500;

async function probe(check: () => Promise<unknown>): Promise<DependencyHealth> {
  const started = performance.now();
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      check(),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error(`no answer within ${PROBE_TIMEOUT_MS} ms`)), PROBE_TIMEOUT_MS);
      }),
    ]);
    return { status: 'up', latencyMs: Math.round((performance.now() - started) * 10) / 10 };
  } catch (error) {
    return { status: 'down', error: error instanceof Error ? error.message : String(error) };
  } finally {
    clearTimeout(timer);
  }
}

@Injectable()
export class HealthService {
  constructor(
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    @Inject(DB) private readonly db: Db,
    @Inject(REDIS) private readonly redis: Redis,
  ) {}

  async check(): Promise<HealthResponse> {
    const [db, redis] = await Promise.all([
      probe(() => sql`SELECT 1`.execute(this.db)),
      probe(() => this.pingRedis()),
    ]);
    const workers = db.status === 'up' ? await this.workerCounts().catch(() => ({ alive: 0, stale: 0, slots: 0 })) : { alive: 0, stale: 0, slots: 0 };
    return {
      status: db.status === 'up' && redis.status === 'up' ? 'ok' : 'degraded',
      db,
      redis,
      workers,
      time: new Date().toISOString(),
    };
  }

  /** Pings Redis, first waiting for a connection that is still being made. */
  private async pingRedis(): Promise<string> {
    if (this.redis.status !== 'ready') {
      await new Promise<void>((resolve, reject) => {
        const onReady = () => (clearTimeout(timer), resolve());
        const timer = setTimeout(() => {
          this.redis.off('ready', onReady);
          reject(new Error(`not connected (${this.redis.status})`));
        }, PROBE_TIMEOUT_MS);
        this.redis.once('ready', onReady);
      });
    }
    return this.redis.ping();
  }

  private async workerCounts(): Promise<HealthResponse['workers']> {
    const cutoff = new Date(Date.now() - this.config.KILN_WORKER_STALE_SECONDS * 1000);
    const row = await this.db
      .selectFrom('workers')
      .where('stopped_at', 'is', null)
      .select((eb) => [
        eb.fn.countAll<number>().filterWhere('last_heartbeat_at', '>=', cutoff).as('alive'),
        eb.fn.countAll<number>().filterWhere('last_heartbeat_at', '<', cutoff).as('stale'),
        eb.fn.sum<number>('slots').filterWhere('last_heartbeat_at', '>=', cutoff).as('slots'),
      ])
      .executeTakeFirstOrThrow();
    return { alive: Number(row.alive), stale: Number(row.stale), slots: Number(row.slots ?? 0) };
  }
}
