// Retrying writes through a PostgreSQL outage. A run in flight keeps its engine state
// in memory and waits for the database instead of giving up: an operator restarting
// PostgreSQL must not turn hours of computing into a failed run.

/** Thrown by a fenced write that touched no row: another worker holds the run now. */
export class LeaseLostError extends Error {
  constructor(runId: string, lease: number) {
    super(`run ${runId}: lease ${lease} was taken over by another worker`);
    this.name = 'LeaseLostError';
  }
}

export interface RetryPolicy {
  /** First wait after a failure (default 250 ms); doubles up to `capMs`. */
  initialMs: number;
  /** Longest single wait (default 5 s). */
  capMs: number;
  /** Give up after retrying this long (default 10 min; at least 2 min by design). */
  giveUpAfterMs: number;
}

export const DEFAULT_RETRY_POLICY: RetryPolicy = { initialMs: 250, capMs: 5_000, giveUpAfterMs: 10 * 60_000 };

/**
 * Errors worth retrying: the database could not be reached or went away. Errors with
 * an SQLSTATE of data (22), integrity (23) or syntax/access (42) classes are bugs or
 * conflicts that a retry would only repeat, and a lost lease is final.
 */
export function isTransientDatabaseError(error: unknown): boolean {
  if (error instanceof LeaseLostError) return false;
  const code = (error as { code?: unknown } | null)?.code;
  if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) {
    return !/^(22|23|42|0A|XX)/.test(code);
  }
  return true;
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/** Runs `operation` until it succeeds, a non-transient error occurs, or the policy gives up. */
export async function withDatabaseRetry<T>(
  what: string,
  operation: () => Promise<T>,
  log: (message: string) => void,
  policy: RetryPolicy = DEFAULT_RETRY_POLICY,
): Promise<T> {
  const started = Date.now();
  let wait = policy.initialMs;
  let failures = 0;
  for (;;) {
    try {
      const result = await operation();
      if (failures > 0) log(`${what}: succeeded after ${failures} failed attempt(s)`);
      return result;
    } catch (error) {
      if (!isTransientDatabaseError(error)) throw error;
      failures += 1;
      const message = error instanceof Error ? error.message : String(error);
      if (Date.now() - started + wait > policy.giveUpAfterMs) {
        throw new Error(`${what}: PostgreSQL unavailable for ${Math.round((Date.now() - started) / 1000)} s (${message})`);
      }
      if (failures === 1 || failures % 10 === 0) log(`${what}: ${message}; retrying`);
      await sleep(wait);
      wait = Math.min(policy.capMs, wait * 2);
    }
  }
}
