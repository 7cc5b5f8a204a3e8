import { Inject, Injectable } from '@nestjs/common';
import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';
import type { AuditEntry, AuditQuery, Page } from '@kiln/shared';
import { DB, type Db } from '../database/database.module';

/** Who changed what, when, with the value before and after. Written in the change's own transaction. */
@Injectable()
export class AuditService {
  constructor(@Inject(DB) private readonly db: Db) {}

  async record(
    executor: Kysely<Database>,
    entry: { actorId: string | null; action: string; subjectType: string; subjectId: string | null; before?: unknown; after?: unknown },
  ): Promise<void> {
    await executor
      .insertInto('audit_log')
      .values({
        actor_id: entry.actorId,
        action: entry.action,
        subject_type: entry.subjectType,
        subject_id: entry.subjectId,
        before: entry.before === undefined ? null : JSON.stringify(entry.before),
        after: entry.after === undefined ? null : JSON.stringify(entry.after),
      })
      .execute();
  }

  async list(query: AuditQuery): Promise<Page<AuditEntry>> {
    let base = this.db.selectFrom('audit_log').leftJoin('users', 'users.id', 'audit_log.actor_id');
    if (query.action) base = base.where('audit_log.action', '=', query.action);
    if (query.subjectType) base = base.where('audit_log.subject_type', '=', query.subjectType);
    if (query.subjectId) base = base.where('audit_log.subject_id', '=', query.subjectId);
    if (query.actorId) base = base.where('audit_log.actor_id', '=', query.actorId);
    if (query.from) base = base.where('audit_log.at', '>=', new Date(query.from));
    if (query.to) base = base.where('audit_log.at', '<', new Date(query.to));
    const { total } = await base.select((eb) => eb.fn.countAll<number>().as('total')).executeTakeFirstOrThrow();
    const rows = await base
      .select(['audit_log.id', 'audit_log.at', 'audit_log.actor_id', 'users.name as actor_name', 'audit_log.action', 'audit_log.subject_type', 'audit_log.subject_id', 'audit_log.before', 'audit_log.after'])
      .orderBy('audit_log.at', 'desc')
      .orderBy('audit_log.id', 'desc')
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize)
      .execute();
    return {
      items: rows.map((row) => ({
        id: String(row.id),
        at: row.at.toISOString(),
        actorId: row.actor_id,
        actorName: row.actor_name,
        action: row.action,
        subjectType: row.subject_type,
        subjectId: row.subject_id,
        before: row.before,
        after: row.after,
      })),
      total: Number(total),
      page: query.page,
      pageSize: query.pageSize,
    };
  }
}
