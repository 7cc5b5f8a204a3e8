import { Inject, Injectable } from '@nestjs/common';
import type { ApiTokenInfo } from '@kiln/shared';
import { AuditService } from '../audit/audit.service';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { notFound } from '../common/api-error';
import { hashSecret, newSecret } from '../common/secret-token';
import { DB, type Db } from '../database/database.module';
import { toUser } from '../users/users.mapper';

/** Personal API tokens look like this, so the auth guard can tell them from sign-in tokens. */
export const API_TOKEN_PREFIX = 'kiln_pat_';

/** Personal API tokens for scripts and notebooks: shown once, stored hashed, revocable, audited. */
@Injectable()
export class ApiTokensService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly audit: AuditService,
  ) {}

  async create(user: AuthenticatedUser, name: string): Promise<ApiTokenInfo & { token: string }> {
    const token = newSecret(API_TOKEN_PREFIX);
    const row = await this.db.transaction().execute(async (trx) => {
      const created = await trx.insertInto('api_tokens').values({ user_id: user.id, name, token_hash: hashSecret(token) }).returningAll().executeTakeFirstOrThrow();
      await this.audit.record(trx, { actorId: user.id, action: 'token.create', subjectType: 'api_token', subjectId: created.id, after: { name } });
      return created;
    });
    return { id: row.id, name: row.name, createdAt: row.created_at.toISOString(), lastUsedAt: null, revokedAt: null, token };
  }

  async list(user: AuthenticatedUser): Promise<ApiTokenInfo[]> {
    const rows = await this.db.selectFrom('api_tokens').selectAll().where('user_id', '=', user.id).orderBy('created_at', 'desc').execute();
    return rows.map((row) => ({
      id: row.id,
      name: row.name,
      createdAt: row.created_at.toISOString(),
      lastUsedAt: row.last_used_at?.toISOString() ?? null,
      revokedAt: row.revoked_at?.toISOString() ?? null,
    }));
  }

  async revoke(user: AuthenticatedUser, id: string): Promise<void> {
    await this.db.transaction().execute(async (trx) => {
      const row = await trx
        .updateTable('api_tokens')
        .set({ revoked_at: new Date() })
        .where('id', '=', id)
        .where('user_id', '=', user.id)
        .where('revoked_at', 'is', null)
        .returning(['id', 'name'])
        .executeTakeFirst();
      if (!row) throw notFound('token');
      await this.audit.record(trx, { actorId: user.id, action: 'token.revoke', subjectType: 'api_token', subjectId: id, before: { name: row.name } });
    });
  }

  /** The owner of a live token, with their current role (a token never grants more than that). */
  async authenticate(token: string): Promise<AuthenticatedUser | undefined> {
    const row = await this.db
      .selectFrom('api_tokens')
      .innerJoin('users', 'users.id', 'api_tokens.user_id')
      .selectAll('users')
      .select('api_tokens.id as token_id')
      .where('api_tokens.token_hash', '=', hashSecret(token))
      .where('api_tokens.revoked_at', 'is', null)
      .executeTakeFirst();
    if (!row || row.disabled) return undefined;
    await this.db.updateTable('api_tokens').set({ last_used_at: new Date() }).where('id', '=', row.token_id).execute();
    return toUser(row);
  }
}
