import { Inject, Injectable } from '@nestjs/common';
import { sql, type Insertable, type Kysely } from 'kysely';
import type { Database, RunsTable } from '@kiln/shared/db';
import type { RunListQuery } from '@kiln/shared';
import { DB, type Db } from '../database/database.module';

type Executor = Kysely<Database>;

const SORT_COLUMNS = {
  index: 'runs.sweep_index',
  created: 'runs.created_at',
  state: 'runs.state',
  outcome: 'runs.outcome',
  cpu: 'runs.cpu_seconds',
  energy: sql`(runs.summary->>'energyFinal')::double precision`,
} as const;

@Injectable()
export class RunsRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  /** A run with the run id of its parent checkpoint (forks). */
  findById(id: string, executor: Executor = this.db) {
    return executor
      .selectFrom('runs')
      .leftJoin('checkpoints as parent', 'parent.id', 'runs.parent_checkpoint_id')
      .selectAll('runs')
      .select('parent.run_id as parent_run_id')
      .where('runs.id', '=', id)
      .executeTakeFirst();
  }

  insertMany(rows: Insertable<RunsTable>[], executor: Executor = this.db) {
    return executor.insertInto('runs').values(rows).execute();
  }

  insertOne(row: Insertable<RunsTable>, executor: Executor = this.db) {
    return executor.insertInto('runs').values(row).returning('id').executeTakeFirstOrThrow();
  }

  async listBySweep(sweepId: string, query: RunListQuery, executor: Executor = this.db) {
    return this.list({ sweepId }, query, executor);
  }

  /**
   * A page of runs. `visibleTo` limits them to studies the user belongs to;
   * `ownerId` to one person's runs; `sweepId`/`studyId` to one sweep or study.
   */
  async list(
    filter: { sweepId?: string; studyId?: string; ownerId?: string; visibleTo?: string },
    query: RunListQuery,
    executor: Executor = this.db,
  ) {
    let base = executor.selectFrom('runs');
    if (filter.sweepId) base = base.where('runs.sweep_id', '=', filter.sweepId);
    if (filter.studyId) base = base.where('runs.study_id', '=', filter.studyId);
    if (filter.ownerId) base = base.where('runs.owner_id', '=', filter.ownerId);
    if (filter.visibleTo) {
      const userId = filter.visibleTo;
      base = base.where('runs.study_id', 'in', (eb) => eb.selectFrom('study_members').select('study_id').where('user_id', '=', userId));
    }
    if (query.state) base = base.where('runs.state', '=', query.state);
    if (query.outcome) base = base.where('runs.outcome', '=', query.outcome);
    const { total } = await base.select((eb) => eb.fn.countAll<number>().as('total')).executeTakeFirstOrThrow();
    const column = SORT_COLUMNS[query.sort];
    const rows = await base
      .leftJoin('checkpoints as parent', 'parent.id', 'runs.parent_checkpoint_id')
      .selectAll('runs')
      .select('parent.run_id as parent_run_id')
      .orderBy(column as any, (ob) => (query.order === 'asc' ? ob.asc() : ob.desc()).nullsLast())
      .orderBy('runs.sweep_index')
      .orderBy('runs.id')
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize)
      .execute();
    return { rows, total: Number(total) };
  }

  countsBySweep(sweepId: string, executor: Executor = this.db) {
    return executor
      .selectFrom('runs')
      .select(['state', (eb) => eb.fn.countAll<number>().as('n')])
      .where('sweep_id', '=', sweepId)
      .groupBy('state')
      .execute();
  }

  metrics(runId: string, fromStep: number, limit: number, executor: Executor = this.db) {
    return executor
      .selectFrom('run_metrics')
      .selectAll()
      .where('run_id', '=', runId)
      .where('step', '>', fromStep)
      .orderBy('step')
      .limit(limit)
      .execute();
  }

  checkpoints(runId: string, executor: Executor = this.db) {
    return executor
      .selectFrom('checkpoints')
      .select(['id', 'run_id', 'seq', 'step', 't', 'points', 'reason', 'cpu_seconds', 'size_bytes', 'sha256', 'created_at'])
      .where('run_id', '=', runId)
      .orderBy('seq')
      .execute();
  }

  /** Runs of a user that hold or wait for a worker slot. */
  async inFlightCount(ownerId: string, executor: Executor = this.db): Promise<number> {
    const row = await executor
      .selectFrom('runs')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('owner_id', '=', ownerId)
      .where((eb) => eb.or([eb('state', '=', 'running'), eb.and([eb('state', '=', 'queued'), eb('dispatched_at', 'is not', null)])]))
      .executeTakeFirstOrThrow();
    return Number(row.n);
  }
}
