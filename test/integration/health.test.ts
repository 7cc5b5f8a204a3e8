import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

describe('GET /api/health', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let api: TestApi;

  beforeAll(async () => {
    database = await createTestDatabase();
    redis = await startTestRedis();
    api = await startTestApi(database.url, { REDIS_URL: redis.url, KILN_WORKER_STALE_SECONDS: '30' });
  });
  afterAll(async () => {
    await api?.close();
    await redis?.stop();
    await database?.drop();
  });

  it('answers without sign-in and reports PostgreSQL and Redis up', async () => {
    const response = await api.request('GET', '/api/health');
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ status: 'ok', db: { status: 'up' }, redis: { status: 'up' } });
    expect(response.body.workers).toEqual({ alive: 0, stale: 0, slots: 0 });
  });

  it('counts alive and stale workers from their heartbeats, and ignores stopped ones', async () => {
    const now = Date.now();
    const row = (id: string, ageSeconds: number, slots: number, stopped = false) => ({
      id,
      host: 'host-a',
      pid: 1,
      slots,
      started_at: new Date(now - 3_600_000),
      last_heartbeat_at: new Date(now - ageSeconds * 1000),
      stopped_at: stopped ? new Date(now) : null,
    });
    await database.db
      .insertInto('workers')
      .values([row('fresh-1', 2, 4), row('fresh-2', 10, 2), row('stale-1', 300, 8), row('gone-1', 1, 16, true)])
      .execute();
    const response = await api.request('GET', '/api/health');
    expect(response.body.workers).toEqual({ alive: 2, stale: 1, slots: 6 });
  });

  it('reports a stopped Redis as down within seconds instead of hanging', async () => {
    await redis.stop();
    const started = Date.now();
    const response = await api.request('GET', '/api/health');
    const elapsed = Date.now() - started;
    expect(response.status).toBe(200);
    expect(response.body.status).toBe('degraded');
    expect(response.body.redis.status).toBe('down');
    expect(response.body.redis.error).toEqual(expect.any(String));
    expect(response.body.db.status).toBe('up');
    expect(elapsed).toBeLessThan(5_000);
  });
});
