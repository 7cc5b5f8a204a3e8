import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import { ErrorCode, Role, type UpdatePersonRequest, type User } from '@kiln/shared';
import { AuditService } from '../audit/audit.service';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { ApiException, notFound } from '../common/api-error';
import { DB, type Db } from '../database/database.module';
import { toUser } from '../users/users.mapper';

@Injectable()
export class AdminService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly audit: AuditService,
  ) {}

  async updatePerson(actor: AuthenticatedUser, id: string, change: UpdatePersonRequest): Promise<User> {
    if (id === actor.id && (change.disabled === true || (change.role && change.role !== Role.Admin))) {
      throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, 'You cannot disable yourself or give up your own admin role; ask another lab admin.');
    }
    const row = await this.db.transaction().execute(async (trx) => {
      const before = await trx.selectFrom('users').selectAll().where('id', '=', id).forUpdate().executeTakeFirst();
      if (!before) throw notFound('person');
      const after = await trx
        .updateTable('users')
        .set({ ...change, updated_at: new Date() })
        .where('id', '=', id)
        .returningAll()
        .executeTakeFirstOrThrow();
      const pick = (u: typeof before) => ({ role: u.role, disabled: u.disabled, name: u.name });
      await this.audit.record(trx, { actorId: actor.id, action: 'person.update', subjectType: 'user', subjectId: id, before: pick(before), after: pick(after) });
      return after;
    });
    return toUser(row);
  }
}
