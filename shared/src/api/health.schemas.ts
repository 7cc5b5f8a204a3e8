/** One dependency's state as `GET /api/health` reports it. */
export interface DependencyHealth {
  status: 'up' | 'down';
  /** Round-trip time of the probe, when it answered. */
  latencyMs?: number;
  /** What went wrong, when it did not. */
  error?: string;
}

/** Response of `GET /api/health` (no auth). */
export interface HealthResponse {
  /** `ok` when PostgreSQL and Redis answer; `degraded` otherwise. */
  status: 'ok' | 'degraded';
  db: DependencyHealth;
  redis: DependencyHealth;
  workers: {
    /** Workers whose last heartbeat is recent. */
    alive: number;
    /** Workers that stopped heartbeating but have not been removed. */
    stale: number;
    /** Worker slots (cores) offered by the alive workers. */
    slots: number;
  };
  time: string;
}
