import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { waitFor } from '../support/ports';
import { spawnNode, workerEnv, type WorkerProcess } from '../support/worker-harness';

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

describe('worker supervisor', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let supervisor: WorkerProcess | undefined;

  beforeAll(async () => {
    [database, redis] = await Promise.all([createTestDatabase(), startTestRedis()]);
  });
  afterAll(async () => {
    if (supervisor) {
      supervisor.kill('SIGKILL');
      await supervisor.exited;
    }
    // Children of a killed supervisor would outlive it; never leave them behind.
    const rows = await database.db.selectFrom('workers').select('pid').execute();
    for (const { pid } of rows) if (alive(pid)) process.kill(pid, 'SIGKILL');
    await redis?.stop();
    await database?.drop();
  });

  it('runs KILN_WORKER_PROCESSES workers, restarts one that is killed, and stops them all on SIGTERM', async () => {
    supervisor = spawnNode('worker/dist/supervisor.js', {
      ...workerEnv({ databaseUrl: database.url, redisUrl: redis.url, host: 'supervised' }),
      KILN_WORKER_PROCESSES: '2',
    });
    const live = () =>
      database.db.selectFrom('workers').select(['id', 'pid']).where('stopped_at', 'is', null).where('host', '=', 'supervised').execute();
    const first = await waitFor('two worker processes', async () => {
      const rows = (await live()).filter((r) => alive(r.pid));
      return rows.length === 2 ? rows : undefined;
    });
    expect(first.map((r) => r.pid)).not.toContain(supervisor.pid);

    const victim = first[0]!.pid;
    process.kill(victim, 'SIGKILL');
    const replacement = await waitFor('a replacement worker process', async () => {
      const rows = (await live()).filter((r) => alive(r.pid) && !first.some((f) => f.pid === r.pid));
      return rows[0];
    });
    expect(alive(victim)).toBe(false);
    expect(supervisor.output()).toMatch(new RegExp(`worker process ${victim} died \\(signal SIGKILL\\); restarting`));

    supervisor.kill('SIGTERM');
    expect(await supervisor.exited).toBe(0);
    supervisor = undefined;
    for (const pid of [first[1]!.pid, replacement.pid]) {
      expect(alive(pid)).toBe(false);
      const row = await database.db.selectFrom('workers').select('stopped_at').where('pid', '=', pid).executeTakeFirstOrThrow();
      expect(row.stopped_at).not.toBeNull();
    }
  });
});
