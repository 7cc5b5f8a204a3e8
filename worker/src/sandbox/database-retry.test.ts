import { describe, expect, it } from 'vitest';
import { isTransientDatabaseError, LeaseLostError, withDatabaseRetry } from './database-retry';

const quick = { initialMs: 1, capMs: 4, giveUpAfterMs: 200 };

describe('withDatabaseRetry', () => {
  it('retries connection failures until the database answers', async () => {
    let calls = 0;
    const logged: string[] = [];
    const result = await withDatabaseRetry(
      'flush',
      async () => {
        calls += 1;
        if (calls < 4) throw Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED' });
        return 'ok';
      },
      (m) => logged.push(m),
      quick,
    );
    expect(result).toBe('ok');
    expect(calls).toBe(4);
    expect(logged.at(-1)).toBe('flush: succeeded after 3 failed attempt(s)');
  });

  it('does not retry a lost lease or a constraint violation', async () => {
    for (const error of [new LeaseLostError('r', 3), Object.assign(new Error('duplicate key'), { code: '23505' })]) {
      let calls = 0;
      await expect(
        withDatabaseRetry('write', async () => {
          calls += 1;
          throw error;
        }, () => undefined, quick),
      ).rejects.toBe(error);
      expect(calls).toBe(1);
    }
  });

  it('gives up with a readable error after the policy window', async () => {
    await expect(
      withDatabaseRetry('checkpoint', async () => {
        throw new Error('Connection terminated unexpectedly');
      }, () => undefined, { initialMs: 20, capMs: 20, giveUpAfterMs: 100 }),
    ).rejects.toThrow(/checkpoint: PostgreSQL unavailable for \d+ s \(Connection terminated unexpectedly\)/);
  });

  it('classifies server shutdown and start-up codes as transient', () => {
    expect(isTransientDatabaseError(Object.assign(new Error('terminating connection'), { code: '57P01' }))).toBe(true);
    expect(isTransientDatabaseError(Object.assign(new Error('the database system is starting up'), { code: '57P03' }))).toBe(true);
    expect(isTransientDatabaseError(Object.assign(new Error('syntax error'), { code: '42601' }))).toBe(false);
  });
});
