import { Inject, Injectable } from '@nestjs/common';
import { sql } from 'kysely';
import { DEFAULT_QUOTAS, type NotificationSettings, type Role } from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';
import { MailOutboxService } from '../mail/mail-outbox.service';
import { currentMonth } from '../quotas/quotas.service';

/** Share of the monthly CPU-hours at which the owner is warned. */
const QUOTA_WARNING_SHARE = 0.8;

/**
 * E-mails about events people care about: a sweep finished, a run failed, CPU-hours
 * nearly used (candidates are announced where they are created). Each goes out once:
 * the outbox refuses a second message with the same key. Run by the active scheduler.
 */
@Injectable()
export class NotificationsService {
  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    private readonly outbox: MailOutboxService,
  ) {}

  async settings(user: AuthenticatedUser): Promise<NotificationSettings> {
    const row = await this.db
      .selectFrom('users')
      .select(['notify_sweep_finished', 'notify_run_failed', 'notify_candidate', 'notify_quota'])
      .where('id', '=', user.id)
      .executeTakeFirstOrThrow();
    return { sweepFinished: row.notify_sweep_finished, runFailed: row.notify_run_failed, candidate: row.notify_candidate, quotaNearlyUsed: row.notify_quota };
  }

  async update(user: AuthenticatedUser, change: Partial<NotificationSettings>): Promise<NotificationSettings> {
    const set = {
      ...(change.sweepFinished !== undefined ? { notify_sweep_finished: change.sweepFinished } : {}),
      ...(change.runFailed !== undefined ? { notify_run_failed: change.runFailed } : {}),
      ...(change.candidate !== undefined ? { notify_candidate: change.candidate } : {}),
      ...(change.quotaNearlyUsed !== undefined ? { notify_quota: change.quotaNearlyUsed } : {}),
    };
    if (Object.keys(set).length > 0) await this.db.updateTable('users').set(set).where('id', '=', user.id).execute();
    return this.settings(user);
  }

  /** One round: finished sweeps, failed runs, quotas nearly used. */
  async sendDue(): Promise<void> {
    await this.sweepsFinished();
    await this.runsFailed();
    await this.quotasNearlyUsed();
  }

  private async sweepsFinished(): Promise<void> {
    const done = await this.db
      .selectFrom('sweeps')
      .innerJoin('users', 'users.id', 'sweeps.owner_id')
      .select(['sweeps.id', 'sweeps.name', 'users.email', 'users.notify_sweep_finished'])
      .where('sweeps.notified_at', 'is', null)
      .where(({ not, exists, selectFrom }) =>
        not(exists(selectFrom('runs').select('runs.id').whereRef('runs.sweep_id', '=', 'sweeps.id').where('runs.state', 'in', ['queued', 'waiting', 'running']))),
      )
      .limit(50)
      .execute();
    for (const sweep of done) {
      await this.db.transaction().execute(async (trx) => {
        const claimed = await trx.updateTable('sweeps').set({ notified_at: new Date() }).where('id', '=', sweep.id).where('notified_at', 'is', null).executeTakeFirst();
        if (!claimed.numUpdatedRows || !sweep.notify_sweep_finished) return;
        const counts = await trx
          .selectFrom('runs')
          .select(['state', 'outcome', (eb) => eb.fn.countAll<number>().as('n')])
          .where('sweep_id', '=', sweep.id)
          .groupBy(['state', 'outcome'])
          .execute();
        const lines = counts.map((c) => `  ${c.outcome ?? c.state}: ${c.n}`);
        await this.outbox.enqueue(trx, {
          dedupeKey: `sweep-finished:${sweep.id}`,
          to: sweep.email,
          subject: `Sweep “${sweep.name}” has finished`,
          text: [
            `Every run of your sweep “${sweep.name}” has ended:`,
            ...lines,
            '',
            `See the outcomes: ${this.config.KILN_PUBLIC_URL}/sweeps/${sweep.id}`,
            'A blow-up outcome is a numerical indication, to be confirmed by a finer run.',
          ].join('\n'),
        });
      });
    }
  }

  private async runsFailed(): Promise<void> {
    const failed = await this.db
      .selectFrom('runs')
      .innerJoin('users', 'users.id', 'runs.owner_id')
      .select(['runs.id', 'runs.attempt', 'runs.error', 'users.email'])
      .where('runs.state', '=', 'failed')
      .where('users.notify_run_failed', '=', true)
      .where('runs.updated_at', '>', sql<Date>`now() - interval '1 day'`)
      .where(({ not, exists, selectFrom }) =>
        not(exists(selectFrom('mail_outbox').select('mail_outbox.id').whereRef('mail_outbox.dedupe_key', '=', sql<string>`'run-failed:' || runs.id || ':' || runs.attempt`))),
      )
      .limit(50)
      .execute();
    for (const run of failed) {
      await this.outbox.enqueue(this.db, {
        dedupeKey: `run-failed:${run.id}:${run.attempt}`,
        to: run.email,
        subject: 'A Kiln run failed',
        text: [`Your run ${run.id} stopped with an error:`, '', `  ${run.error ?? 'unknown error'}`, '', `${this.config.KILN_PUBLIC_URL}/runs/${run.id}`].join('\n'),
      });
    }
  }

  private async quotasNearlyUsed(): Promise<void> {
    const month = currentMonth();
    const rows = await this.db
      .selectFrom('cpu_usage')
      .innerJoin('users', 'users.id', 'cpu_usage.user_id')
      .leftJoin('quotas', 'quotas.user_id', 'cpu_usage.user_id')
      .select(['users.id', 'users.email', 'users.role', 'users.notify_quota', 'quotas.cpu_hours_per_month', 'cpu_usage.cpu_seconds'])
      .where('cpu_usage.month', '=', sql<Date>`${month}::date`)
      .execute();
    for (const row of rows) {
      const allowance = (row.cpu_hours_per_month ?? DEFAULT_QUOTAS[row.role as Role].cpuHoursPerMonth) * 3600;
      if (!row.notify_quota || allowance <= 0 || row.cpu_seconds < QUOTA_WARNING_SHARE * allowance) continue;
      await this.outbox.enqueue(this.db, {
        dedupeKey: `quota-80:${row.id}:${month}`,
        to: row.email,
        subject: 'Your Kiln CPU-hours are nearly used',
        text: [
          `You have used ${(row.cpu_seconds / 3600).toFixed(1)} of your ${(allowance / 3600).toFixed(1)} CPU-hours this month.`,
          'When they run out, your runs are checkpointed and paused until the budget allows more.',
          `Your quota: ${this.config.KILN_PUBLIC_URL}/`,
        ].join('\n'),
      });
    }
  }
}
