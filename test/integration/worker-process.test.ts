import { spawn } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { waitFor } from '../support/ports';
import { testEnv } from '../support/test-env';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

describe('worker process', () => {
  let database: TestDatabase;
  beforeAll(async () => {
    database = await createTestDatabase();
  });
  afterAll(async () => {
    await database?.drop();
  });

  it('registers with host, pid and slots, heartbeats, and marks itself stopped on SIGTERM', async () => {
    const child = spawn(process.execPath, ['worker/dist/main.js'], {
      env: {
        ...process.env,
        DATABASE_URL: database.url,
        REDIS_URL: testEnv.redisUrl,
        KILN_WORKER_SLOTS: '3',
        KILN_HEARTBEAT_SECONDS: '0.5',
        KILN_WORKER_HOST: 'test-host-7',
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    child.stdout.on('data', (chunk) => (output += chunk));
    child.stderr.on('data', (chunk) => (output += chunk));
    try {
      const first = await waitFor('the worker row', () =>
        database.db.selectFrom('workers').selectAll().where('pid', '=', child.pid!).executeTakeFirst(),
      );
      expect(first).toMatchObject({ host: 'test-host-7', slots: 3, stopped_at: null });
      const later = await waitFor('a later heartbeat', async () => {
        const row = await database.db.selectFrom('workers').selectAll().where('id', '=', first.id).executeTakeFirstOrThrow();
        return row.last_heartbeat_at > first.last_heartbeat_at ? row : undefined;
      });
      expect(later.last_heartbeat_at.getTime()).toBeGreaterThan(first.last_heartbeat_at.getTime());

      const exited = new Promise<number | null>((resolve) => child.once('exit', resolve));
      child.kill('SIGTERM');
      expect(await exited).toBe(0);
      const stopped = await database.db.selectFrom('workers').selectAll().where('id', '=', first.id).executeTakeFirstOrThrow();
      expect(stopped.stopped_at).not.toBeNull();
    } finally {
      if (child.exitCode === null) child.kill('SIGKILL');
    }
  }, 30_000);

  it('refuses to start with a clear message when the configuration is bad', async () => {
    const child = spawn(process.execPath, ['worker/dist/main.js'], {
      env: { PATH: process.env.PATH, DATABASE_URL: 'mysql://nope', REDIS_URL: testEnv.redisUrl },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stderr = '';
    child.stderr.on('data', (chunk) => (stderr += chunk));
    const code = await new Promise<number | null>((resolve) => child.once('exit', resolve));
    expect(code).not.toBe(0);
    expect(stderr).toMatch(/DATABASE_URL/);
  });
});
