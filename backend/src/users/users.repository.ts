import { Inject, Injectable } from '@nestjs/common';
import type { Insertable, Kysely, Selectable } from 'kysely';
import type { Database, UsersTable } from '@kiln/shared/db';
import { DB, type Db } from '../database/database.module';

type Executor = Kysely<Database>;

@Injectable()
export class UsersRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  findByEmail(email: string, executor: Executor = this.db): Promise<Selectable<UsersTable> | undefined> {
    return executor.selectFrom('users').selectAll().where('email', '=', email.toLowerCase()).executeTakeFirst();
  }

  findById(id: string, executor: Executor = this.db): Promise<Selectable<UsersTable> | undefined> {
    return executor.selectFrom('users').selectAll().where('id', '=', id).executeTakeFirst();
  }

  list(executor: Executor = this.db): Promise<Selectable<UsersTable>[]> {
    return executor.selectFrom('users').selectAll().orderBy('role').orderBy('name').execute();
  }

  insert(user: Insertable<UsersTable>, executor: Executor = this.db): Promise<Selectable<UsersTable>> {
    return executor.insertInto('users').values(user).returningAll().executeTakeFirstOrThrow();
  }
}
