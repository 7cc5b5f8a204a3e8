import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import { sql, type Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';
import {
  DEFAULT_QUOTAS,
  ErrorCode,
  estimateRunCpuSeconds,
  type Quota,
  type QuotaView,
  type Role,
  type RunSpec,
  type UsageRow,
} from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { ApiException, notFound } from '../common/api-error';
import { AuditService } from '../audit/audit.service';
import { DB, type Db } from '../database/database.module';
import { RunEventsService } from '../queue/run-events.service';

/** First day of the current month (UTC), as the ledger keys it. */
export function currentMonth(now = new Date()): string {
  return `${now.getUTCFullYear()}-${String(now.getUTCMonth() + 1).padStart(2, '0')}-01`;
}

@Injectable()
export class QuotasService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly audit: AuditService,
    private readonly events: RunEventsService,
  ) {}

  /** The quota in force: the person's own, or their role's default. */
  async effective(userId: string, executor: Kysely<Database> = this.db): Promise<Quota & { custom: boolean; role: Role }> {
    const row = await executor
      .selectFrom('users')
      .leftJoin('quotas', 'quotas.user_id', 'users.id')
      .select(['users.role', 'quotas.slots', 'quotas.cpu_hours_per_month', 'quotas.max_grid_points', 'quotas.max_run_cpu_seconds'])
      .where('users.id', '=', userId)
      .executeTakeFirst();
    if (!row) throw notFound('person');
    const role = row.role as Role;
    if (row.slots === null) return { ...DEFAULT_QUOTAS[role], custom: false, role };
    return {
      slots: row.slots,
      cpuHoursPerMonth: row.cpu_hours_per_month!,
      maxGridPoints: row.max_grid_points!,
      maxRunCpuSeconds: row.max_run_cpu_seconds!,
      custom: true,
      role,
    };
  }

  /** CPU seconds each person used this month. */
  async monthUsage(executor: Kysely<Database> = this.db): Promise<Map<string, number>> {
    const rows = await executor.selectFrom('cpu_usage').select(['user_id', 'cpu_seconds']).where('month', '=', sql<Date>`${currentMonth()}::date`).execute();
    return new Map(rows.map((row) => [row.user_id, row.cpu_seconds]));
  }

  async view(userId: string): Promise<QuotaView> {
    const quota = await this.effective(userId);
    const used = (await this.monthUsage()).get(userId) ?? 0;
    const inFlight = await this.db
      .selectFrom('runs')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('owner_id', '=', userId)
      .where((eb) => eb.or([eb('state', '=', 'running'), eb.and([eb('state', '=', 'queued'), eb('dispatched_at', 'is not', null)])]))
      .executeTakeFirstOrThrow();
    const { role: _role, ...rest } = quota;
    return { userId, ...rest, cpuHoursUsed: used / 3600, slotsInUse: Number(inFlight.n) };
  }

  async list(): Promise<(QuotaView & { name: string; email: string; role: Role; disabled: boolean })[]> {
    const people = await this.db.selectFrom('users').select(['id', 'name', 'email', 'role', 'disabled']).orderBy('name').execute();
    return Promise.all(people.map(async (p) => ({ ...(await this.view(p.id)), name: p.name, email: p.email, role: p.role as Role, disabled: p.disabled })));
  }

  /** Sets a person's quota, audited with before and after, in one transaction. */
  async set(actor: AuthenticatedUser, userId: string, quota: Quota): Promise<QuotaView> {
    await this.db.transaction().execute(async (trx) => {
      const before = await this.effective(userId, trx);
      await trx
        .insertInto('quotas')
        .values({
          user_id: userId,
          slots: quota.slots,
          cpu_hours_per_month: quota.cpuHoursPerMonth,
          max_grid_points: quota.maxGridPoints,
          max_run_cpu_seconds: quota.maxRunCpuSeconds,
          updated_by: actor.id,
        })
        .onConflict((oc) =>
          oc.column('user_id').doUpdateSet({
            slots: quota.slots,
            cpu_hours_per_month: quota.cpuHoursPerMonth,
            max_grid_points: quota.maxGridPoints,
            max_run_cpu_seconds: quota.maxRunCpuSeconds,
            updated_by: actor.id,
            updated_at: new Date(),
          }),
        )
        .execute();
      const { custom: _c, role: _r, ...beforeQuota } = before;
      await this.audit.record(trx, { actorId: actor.id, action: 'quota.set', subjectType: 'user', subjectId: userId, before: beforeQuota, after: quota });
    });
    return this.view(userId);
  }

  /** Monthly CPU-hours per person, newest month first; `userId` limits it to one person. */
  async usage(months: number, userId?: string): Promise<UsageRow[]> {
    const since = new Date();
    since.setUTCDate(1);
    since.setUTCMonth(since.getUTCMonth() - (months - 1));
    let query = this.db
      .selectFrom('cpu_usage')
      .innerJoin('users', 'users.id', 'cpu_usage.user_id')
      .select(['cpu_usage.user_id', 'users.name', 'users.email', sql<string>`to_char(cpu_usage.month, 'YYYY-MM-DD')`.as('month'), 'cpu_usage.cpu_seconds'])
      .where('cpu_usage.month', '>=', sql<Date>`${currentMonth(since)}::date`)
      .orderBy('cpu_usage.month', 'desc')
      .orderBy('users.name');
    if (userId) query = query.where('cpu_usage.user_id', '=', userId);
    return (await query.execute()).map((row) => ({ userId: row.user_id, name: row.name, email: row.email, month: row.month, cpuHours: row.cpu_seconds / 3600 }));
  }

  /**
   * Refuses, naming the limit, a run whose grid or expected CPU time exceeds the
   * owner's quota. (The worker also stops a run at the CPU limit it was admitted under.)
   */
  async assertSpecsWithin(userId: string, specs: RunSpec[]): Promise<void> {
    const quota = await this.effective(userId);
    specs.forEach((spec, index) => {
      const which = specs.length > 1 ? `run ${index + 1}: ` : '';
      const grid = Math.max(spec.grid.points, spec.grid.maxPoints);
      if (grid > quota.maxGridPoints) {
        throw new ApiException(HttpStatus.UNPROCESSABLE_ENTITY, ErrorCode.Unprocessable, `${which}the grid may reach ${grid} points, over your limit of ${quota.maxGridPoints} grid points (quota maxGridPoints); lower grid.points or grid.maxPoints, or ask your lab admin`, [
          { path: spec.grid.points > quota.maxGridPoints ? 'grid.points' : 'grid.maxPoints', message: `at most ${quota.maxGridPoints} grid points` },
        ]);
      }
      const cpu = estimateRunCpuSeconds(spec);
      if (cpu > quota.maxRunCpuSeconds) {
        throw new ApiException(HttpStatus.UNPROCESSABLE_ENTITY, ErrorCode.Unprocessable, `${which}the run is estimated at ${Math.round(cpu)} CPU seconds, over your limit of ${quota.maxRunCpuSeconds} CPU seconds per run (quota maxRunCpuSeconds)`, [
          { path: 'time', message: `at most ${quota.maxRunCpuSeconds} CPU seconds per run` },
        ]);
      }
    });
  }

  /** Runs paused because their owner's monthly CPU-hours ran out go back to the queue once budget is there again. */
  async resumeBudgetPausedRuns(): Promise<number> {
    const owners = await this.db.selectFrom('runs').select('owner_id').distinct().where('state', '=', 'paused').where('pause_reason', '=', 'cpu-budget').execute();
    if (owners.length === 0) return 0;
    const usage = await this.monthUsage();
    let resumed = 0;
    for (const { owner_id } of owners) {
      const quota = await this.effective(owner_id);
      if ((usage.get(owner_id) ?? 0) >= quota.cpuHoursPerMonth * 3600) continue;
      const rows = await this.db
        .updateTable('runs')
        .set({ state: 'queued', pause_reason: null, wait_reason: null, dispatched_at: null, worker_id: null, updated_at: new Date() })
        .where('owner_id', '=', owner_id)
        .where('state', '=', 'paused')
        .where('pause_reason', '=', 'cpu-budget')
        .returning('id')
        .execute();
      resumed += rows.length;
      await Promise.all(rows.map((row) => this.events.publish({ type: 'state', runId: row.id, state: 'queued', outcome: null, waitReason: null })));
    }
    return resumed;
  }
}
