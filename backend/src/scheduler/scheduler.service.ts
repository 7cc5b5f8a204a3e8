import { Inject, Injectable, Logger, type OnApplicationBootstrap, type OnApplicationShutdown } from '@nestjs/common';
import { sql } from 'kysely';
import { Client } from 'pg';
import type { RunEvent } from '@kiln/shared';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';
import { RunEventsService } from '../queue/run-events.service';
import { RunQueue } from '../queue/run-queue';
import { CandidateScannerService } from '../candidates/candidate-scanner.service';
import { NotificationsService } from '../notifications/notifications.service';
import { QuotasService } from '../quotas/quotas.service';
import { planAdmission } from './admission-plan';

/** PostgreSQL advisory lock key held by the one active scheduler ('KILN'). */
const SCHEDULER_LOCK_KEY = 0x4b494c4e;
/** The reconciler runs every this many ticks. */
const RECONCILE_EVERY_TICKS = 10;
/** An admitted run's job may take this long to appear in the queue before it counts as lost. */
const DISPATCH_GRACE_MS = 5_000;
/** A run re-admitted this many times is marked failed instead of looping forever. */
export const MAX_ADMISSIONS = 25;

/**
 * Moves queued runs into the BullMQ queue, fairly and within each owner's slot
 * cap, and re-admits runs whose job the queue lost. One instance is active at a
 * time across all API replicas, through a session advisory lock.
 */
@Injectable()
export class SchedulerService implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger('scheduler');
  private lockClient: Client | undefined;
  private timer: NodeJS.Timeout | undefined;
  private ticks = 0;
  private busy = false;

  constructor(
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    @Inject(DB) private readonly db: Db,
    private readonly queue: RunQueue,
    private readonly events: RunEventsService,
    private readonly quotas: QuotasService,
    private readonly notifications: NotificationsService,
    private readonly candidates: CandidateScannerService,
  ) {}

  onApplicationBootstrap(): void {
    if (this.config.KILN_SCHEDULER !== '1') return;
    this.timer = setInterval(() => void this.tick(), this.config.KILN_SCHEDULER_TICK_MS);
    this.timer.unref();
    void this.tick();
  }

  async onApplicationShutdown(): Promise<void> {
    clearInterval(this.timer);
    while (this.busy) await new Promise((resolve) => setTimeout(resolve, 20));
    await this.lockClient?.end().catch(() => undefined);
    this.lockClient = undefined;
  }

  get isLeader(): boolean {
    return this.lockClient !== undefined;
  }

  /** One round: admit, and every few rounds reconcile. Errors are logged and retried next round. */
  async tick(): Promise<void> {
    if (this.busy) return;
    this.busy = true;
    try {
      if (!(await this.ensureLeadership())) return;
      if (this.ticks++ % RECONCILE_EVERY_TICKS === 0) await this.housekeeping();
      await this.admit();
    } catch (error) {
      this.logger.warn(`scheduler round failed, will retry: ${error instanceof Error ? error.message : String(error)}`);
    } finally {
      this.busy = false;
    }
  }

  /** The slower duties of the active scheduler; one failing does not stop the others or admission. */
  private async housekeeping(): Promise<void> {
    const duties: [string, () => Promise<unknown>][] = [
      ['reconcile the queue', () => this.reconcile()],
      ['resume runs paused for budget', () => this.quotas.resumeBudgetPausedRuns()],
      ['send notifications', () => this.notifications.sendDue()],
      ['look for blow-up candidates', () => this.candidates.scan()],
    ];
    for (const [what, duty] of duties) {
      await duty().catch((error: unknown) => this.logger.warn(`could not ${what}, will retry: ${error instanceof Error ? error.message : String(error)}`));
    }
  }

  private async ensureLeadership(): Promise<boolean> {
    if (this.lockClient) return true;
    const client = new Client({ connectionString: this.config.DATABASE_URL, application_name: 'kiln-scheduler' });
    client.on('error', () => {
      // The lock dies with its connection (PostgreSQL restarted): try to take it again next round.
      if (this.lockClient === client) this.lockClient = undefined;
      void client.end().catch(() => undefined);
    });
    try {
      await client.connect();
      const { rows } = await client.query<{ locked: boolean }>('SELECT pg_try_advisory_lock($1) AS locked', [SCHEDULER_LOCK_KEY]);
      if (rows[0]?.locked) {
        this.lockClient = client;
        this.logger.log('this API instance now runs the scheduler');
        return true;
      }
    } catch {
      // PostgreSQL unreachable: nothing to schedule against.
    }
    await client.end().catch(() => undefined);
    return false;
  }

  /** Admits as many waiting runs as the pool has free slots, fairly. */
  async admit(): Promise<void> {
    const cutoff = new Date(Date.now() - this.config.KILN_WORKER_STALE_SECONDS * 1000);
    const pool = await this.db
      .selectFrom('workers')
      .select((eb) => eb.fn.sum<number>('slots').as('slots'))
      .where('stopped_at', 'is', null)
      .where('last_heartbeat_at', '>=', cutoff)
      .executeTakeFirstOrThrow();
    const poolSlots = Number(pool.slots ?? 0);
    const inFlightRows = await this.db
      .selectFrom('runs')
      .select(['owner_id', (eb) => eb.fn.countAll<number>().as('n')])
      .where((eb) => eb.or([eb('state', '=', 'running'), eb.and([eb('state', '=', 'queued'), eb('dispatched_at', 'is not', null)])]))
      .groupBy('owner_id')
      .execute();
    const inFlight = new Map(inFlightRows.map((row) => [row.owner_id, Number(row.n)]));
    const totalInFlight = [...inFlight.values()].reduce((a, b) => a + b, 0);
    const candidates = await this.db
      .selectFrom('runs')
      .select(['id', 'owner_id', 'state', 'wait_reason'])
      .where('state', 'in', ['queued', 'waiting'])
      .where('dispatched_at', 'is', null)
      .orderBy('priority', 'desc')
      .orderBy('created_at')
      .orderBy('id')
      .limit(5_000)
      .execute();
    if (candidates.length === 0) return;

    const owners = [...new Set(candidates.map((row) => row.owner_id))];
    const usage = await this.quotas.monthUsage();
    const quotas = new Map(await Promise.all(owners.map(async (owner) => [owner, await this.quotas.effective(owner)] as const)));
    const plan = planAdmission({
      freeSlots: Math.max(0, poolSlots - totalInFlight),
      poolSlots,
      inFlight,
      slotCap: (owner) => quotas.get(owner)?.slots ?? 0,
      blockedReason: (owner) => {
        const quota = quotas.get(owner);
        if (!quota) return undefined;
        const usedHours = (usage.get(owner) ?? 0) / 3600;
        return usedHours >= quota.cpuHoursPerMonth
          ? `waiting for quota: monthly CPU-hours used up (${usedHours.toFixed(1)} of ${quota.cpuHoursPerMonth} h); they renew on the 1st, or ask your lab admin`
          : undefined;
      },
      candidates: candidates.map((row) => ({ id: row.id, ownerId: row.owner_id })),
    });

    const byReason = new Map<string, string[]>();
    for (const row of candidates) {
      const reason = plan.waiting.get(row.id);
      if (reason && (row.state !== 'waiting' || row.wait_reason !== reason)) byReason.set(reason, [...(byReason.get(reason) ?? []), row.id]);
    }
    const admitted = await this.db.transaction().execute(async (trx) => {
      const rows =
        plan.admit.length === 0
          ? []
          : await trx
              .updateTable('runs')
              .set({ attempt: sql`attempt + 1`, dispatched_at: new Date(), state: 'queued', wait_reason: null, updated_at: new Date() })
              .where('id', 'in', plan.admit)
              .where('state', 'in', ['queued', 'waiting'])
              .where('dispatched_at', 'is', null)
              .returning(['id', 'attempt'])
              .execute();
      for (const [reason, ids] of byReason) {
        await trx
          .updateTable('runs')
          .set({ state: 'waiting', wait_reason: reason, updated_at: new Date() })
          .where('id', 'in', ids)
          .where('state', 'in', ['queued', 'waiting'])
          .where('dispatched_at', 'is', null)
          .execute();
      }
      return rows;
    });
    // Written first, queued second: if this fails, the reconciler re-admits them.
    await this.queue.add(admitted.map((row) => ({ runId: row.id, attempt: row.attempt })));

    const events: RunEvent[] = [
      ...admitted.map((row): RunEvent => ({ type: 'state', runId: row.id, state: 'queued', outcome: null, waitReason: null })),
      ...[...byReason].flatMap(([reason, ids]) => ids.map((runId): RunEvent => ({ type: 'state', runId, state: 'waiting', outcome: null, waitReason: reason }))),
    ];
    await Promise.all(events.map((event) => this.events.publish(event)));
  }

  /**
   * PostgreSQL is the truth: a run it says is in flight whose job the queue no
   * longer has (Redis wiped or restarted without its data) goes back to the
   * scheduler, which admits it again under a new attempt. The worker still
   * computing an old attempt, if any, is fenced off by the lease at its next write.
   */
  async reconcile(): Promise<{ readmitted: string[] }> {
    const rows = await this.db
      .selectFrom('runs')
      .select(['id', 'attempt', 'state', 'dispatched_at'])
      .where((eb) => eb.or([eb('state', '=', 'running'), eb.and([eb('state', '=', 'queued'), eb('dispatched_at', 'is not', null)])]))
      .execute();
    const readmitted: string[] = [];
    for (const row of rows) {
      if (row.state === 'queued' && row.dispatched_at && Date.now() - row.dispatched_at.getTime() < DISPATCH_GRACE_MS) continue;
      const jobState = await this.queue.jobState({ runId: row.id, attempt: row.attempt }); // throws while Redis is down: retry later
      if (!['missing', 'completed', 'failed', 'unknown'].includes(jobState)) continue;
      const giveUp = row.attempt >= MAX_ADMISSIONS;
      const updated = await this.db
        .updateTable('runs')
        .set(
          giveUp
            ? { state: 'failed', error: `gave up after ${row.attempt} admissions: the run's job kept being lost`, dispatched_at: null, finished_at: new Date(), updated_at: new Date() }
            : { state: 'queued', dispatched_at: null, worker_id: null, updated_at: new Date() },
        )
        .where('id', '=', row.id)
        .where('attempt', '=', row.attempt)
        .where('state', '=', row.state)
        .executeTakeFirst();
      if (Number(updated.numUpdatedRows) > 0) readmitted.push(row.id);
    }
    if (readmitted.length > 0) this.logger.warn(`re-admitting ${readmitted.length} run(s) whose queue job was lost`);
    return { readmitted };
  }
}
