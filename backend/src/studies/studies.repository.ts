import { Inject, Injectable } from '@nestjs/common';
import type { Kysely, Selectable } from 'kysely';
import type { Database, StudiesTable } from '@kiln/shared/db';
import type { StudyRole } from '@kiln/shared';
import { DB, type Db } from '../database/database.module';

type Executor = Kysely<Database>;

@Injectable()
export class StudiesRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  findById(id: string, executor: Executor = this.db): Promise<Selectable<StudiesTable> | undefined> {
    return executor.selectFrom('studies').selectAll().where('id', '=', id).executeTakeFirst();
  }

  /** The user's role in the study, or undefined when not a member. */
  async memberRole(studyId: string, userId: string, executor: Executor = this.db): Promise<StudyRole | undefined> {
    const row = await executor
      .selectFrom('study_members')
      .select('role')
      .where('study_id', '=', studyId)
      .where('user_id', '=', userId)
      .executeTakeFirst();
    return row?.role;
  }

  listForMember(userId: string, executor: Executor = this.db) {
    return executor
      .selectFrom('studies')
      .innerJoin('study_members', 'study_members.study_id', 'studies.id')
      .selectAll('studies')
      .select('study_members.role as my_role')
      .where('study_members.user_id', '=', userId)
      .orderBy('studies.created_at', 'desc')
      .execute();
  }

  listAll(executor: Executor = this.db) {
    return executor.selectFrom('studies').selectAll().orderBy('created_at', 'desc').execute();
  }

  members(studyId: string, executor: Executor = this.db) {
    return executor
      .selectFrom('study_members')
      .innerJoin('users', 'users.id', 'study_members.user_id')
      .select(['users.id as user_id', 'users.name', 'users.email', 'study_members.role'])
      .where('study_members.study_id', '=', studyId)
      .orderBy('study_members.role')
      .orderBy('users.name')
      .execute();
  }

  async create(name: string, description: string, ownerId: string, executor: Executor = this.db) {
    const study = await executor
      .insertInto('studies')
      .values({ name, description, owner_id: ownerId })
      .returningAll()
      .executeTakeFirstOrThrow();
    await executor.insertInto('study_members').values({ study_id: study.id, user_id: ownerId, role: 'owner' }).execute();
    return study;
  }
}
