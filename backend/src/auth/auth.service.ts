import { Inject, Injectable } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import type { LoginRequest, LoginResponse } from '@kiln/shared';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { badInput, unauthenticated } from '../common/api-error';
import { hashSecret, newSecret } from '../common/secret-token';
import { AuditService } from '../audit/audit.service';
import { DB, type Db } from '../database/database.module';
import { MailOutboxService } from '../mail/mail-outbox.service';

/** How long a password-reset link works. */
const RESET_LINK_MINUTES = 60;
import { toUser } from '../users/users.mapper';
import { UsersRepository } from '../users/users.repository';
import type { AccessTokenPayload } from './jwt.strategy';
import { PasswordService } from './password.service';

@Injectable()
export class AuthService {
  constructor(
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    private readonly users: UsersRepository,
    private readonly passwords: PasswordService,
    private readonly jwt: JwtService,
    @Inject(DB) private readonly db: Db,
    private readonly outbox: MailOutboxService,
    private readonly audit: AuditService,
  ) {}

  /** Mails a one-time reset link when the address has an active account; says nothing either way. */
  async requestPasswordReset(email: string): Promise<void> {
    const row = await this.users.findByEmail(email);
    if (!row || row.disabled) return;
    const secret = newSecret();
    await this.db.transaction().execute(async (trx) => {
      const reset = await trx
        .insertInto('password_resets')
        .values({ user_id: row.id, token_hash: hashSecret(secret), expires_at: new Date(Date.now() + RESET_LINK_MINUTES * 60_000) })
        .returning('id')
        .executeTakeFirstOrThrow();
      await this.outbox.enqueue(trx, {
        dedupeKey: `password-reset:${reset.id}`,
        to: row.email,
        subject: 'Reset your Kiln password',
        text: [
          `Someone (hopefully you) asked to reset the password of your Kiln account ${row.email}.`,
          '',
          `Open this link within ${RESET_LINK_MINUTES} minutes to choose a new password (it works once):`,
          `${this.config.KILN_PUBLIC_URL}/reset-password?token=${encodeURIComponent(secret)}`,
          '',
          'If you did not ask for this, ignore this e-mail; your password stays as it is.',
        ].join('\n'),
      });
    });
  }

  async confirmPasswordReset(token: string, password: string): Promise<void> {
    const passwordHash = await this.passwords.hash(password);
    await this.db.transaction().execute(async (trx) => {
      const reset = await trx.selectFrom('password_resets').selectAll().where('token_hash', '=', hashSecret(token)).forUpdate().executeTakeFirst();
      if (!reset || reset.used_at || reset.expires_at.getTime() < Date.now()) {
        throw badInput('This reset link is not valid any more (used, expired or wrong). Ask for a new one.', [{ path: 'token', message: 'expired, used or unknown' }]);
      }
      await trx.updateTable('users').set({ password_hash: passwordHash, updated_at: new Date() }).where('id', '=', reset.user_id).execute();
      await trx.updateTable('password_resets').set({ used_at: new Date() }).where('user_id', '=', reset.user_id).where('used_at', 'is', null).execute();
      await this.audit.record(trx, { actorId: reset.user_id, action: 'password.reset', subjectType: 'user', subjectId: reset.user_id });
    });
  }

  async login({ email, password }: LoginRequest): Promise<LoginResponse> {
    const row = await this.users.findByEmail(email);
    const valid = await this.passwords.verify(row?.password_hash ?? null, password);
    // One message for an unknown e-mail and a wrong password: no account probing.
    if (!row || !valid) throw unauthenticated('E-mail or password is wrong.');
    if (row.disabled) throw unauthenticated('This account is disabled; ask your lab admin.');
    const payload: AccessTokenPayload = { sub: row.id, role: row.role };
    const accessToken = await this.jwt.signAsync(payload, { expiresIn: this.config.KILN_TOKEN_TTL_SECONDS });
    return { accessToken, expiresIn: this.config.KILN_TOKEN_TTL_SECONDS, user: toUser(row) };
  }
}
