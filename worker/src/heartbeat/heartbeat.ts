import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';

export interface WorkerIdentity {
  id: string;
  host: string;
  pid: number;
  slots: number;
  startedAt: Date;
}

/**
 * Keeps this worker's row in `workers` fresh so the admin pages and /api/health
 * see it. A failed beat (PostgreSQL restarting) is retried on the next tick.
 */
export class Heartbeat {
  private timer: NodeJS.Timeout | undefined;

  constructor(
    private readonly db: Kysely<Database>,
    private readonly identity: WorkerIdentity,
    private readonly intervalMs: number,
    private readonly onError: (error: unknown) => void = () => undefined,
  ) {}

  async start(): Promise<void> {
    await this.beat();
    this.timer = setInterval(() => void this.beat().catch(this.onError), this.intervalMs);
    this.timer.unref();
  }

  async beat(): Promise<void> {
    const now = new Date();
    const { id, host, pid, slots, startedAt } = this.identity;
    await this.db
      .insertInto('workers')
      .values({ id, host, pid, slots, started_at: startedAt, last_heartbeat_at: now, stopped_at: null })
      .onConflict((oc) => oc.column('id').doUpdateSet({ last_heartbeat_at: now, slots, stopped_at: null }))
      .execute();
  }

  /** Marks the worker as stopped, so it is not shown as stale. */
  async stop(): Promise<void> {
    clearInterval(this.timer);
    await this.db.updateTable('workers').set({ stopped_at: new Date() }).where('id', '=', this.identity.id).execute();
  }
}
