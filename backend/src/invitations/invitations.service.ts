import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import type { Selectable } from 'kysely';
import type { InvitationsTable } from '@kiln/shared/db';
import {
  ErrorCode,
  Role,
  type AcceptInvitationRequest,
  type CreateInvitationRequest,
  type Invitation,
  type InvitationPreview,
  type LoginResponse,
} from '@kiln/shared';
import { AuditService } from '../audit/audit.service';
import { AuthService } from '../auth/auth.service';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { PasswordService } from '../auth/password.service';
import { ApiException, forbidden, notFound } from '../common/api-error';
import { hashSecret, newSecret } from '../common/secret-token';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';
import { MailOutboxService } from '../mail/mail-outbox.service';
import { StudyAccessService } from '../studies/study-access.service';

const gone = (message: string) => new ApiException(HttpStatus.GONE, ErrorCode.NotFound, message);

function statusOf(row: Selectable<InvitationsTable>): Invitation['status'] {
  if (row.accepted_at) return 'accepted';
  if (row.revoked_at) return 'revoked';
  if (row.expires_at.getTime() < Date.now()) return 'expired';
  return 'pending';
}

function toInvitation(row: Selectable<InvitationsTable>): Invitation {
  return {
    id: row.id,
    studyId: row.study_id,
    email: row.email,
    role: row.study_role,
    invitedBy: row.invited_by,
    expiresAt: row.expires_at.toISOString(),
    status: statusOf(row),
    createdAt: row.created_at.toISOString(),
  };
}

/** Invitations into one study by e-mail: an expiring, one-time link (architecture.md, "People and access"). */
@Injectable()
export class InvitationsService {
  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    private readonly access: StudyAccessService,
    private readonly outbox: MailOutboxService,
    private readonly passwords: PasswordService,
    private readonly audit: AuditService,
    private readonly auth: AuthService,
  ) {}

  /** Study owners and lab admins invite. */
  private async assertCanInvite(user: AuthenticatedUser, studyId: string): Promise<void> {
    const role = await this.access.assertCanView(user, studyId);
    if (user.role !== Role.Admin && role !== 'owner') throw forbidden('Only the study owner or a lab admin can invite people to this study.');
  }

  async create(user: AuthenticatedUser, studyId: string, body: CreateInvitationRequest): Promise<Invitation> {
    await this.assertCanInvite(user, studyId);
    const member = await this.db
      .selectFrom('study_members')
      .innerJoin('users', 'users.id', 'study_members.user_id')
      .select('users.id')
      .where('study_members.study_id', '=', studyId)
      .where('users.email', '=', body.email)
      .executeTakeFirst();
    if (member) throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, `${body.email} is already in this study.`);
    const row = await this.db.transaction().execute(async (trx) => {
      const secret = newSecret();
      const invitation = await trx
        .insertInto('invitations')
        .values({
          study_id: studyId,
          email: body.email,
          study_role: body.role,
          invited_by: user.id,
          token_hash: hashSecret(secret),
          expires_at: new Date(Date.now() + this.config.KILN_INVITATION_DAYS * 86_400_000),
        })
        .returningAll()
        .executeTakeFirstOrThrow();
      await this.mail(trx, invitation, secret, user.name);
      await this.audit.record(trx, { actorId: user.id, action: 'invitation.create', subjectType: 'study', subjectId: studyId, after: { email: body.email, role: body.role } });
      return invitation;
    });
    return toInvitation(row);
  }

  private async mail(trx: Db, invitation: Selectable<InvitationsTable>, secret: string, inviterName: string): Promise<void> {
    const study = await trx.selectFrom('studies').select('name').where('id', '=', invitation.study_id).executeTakeFirstOrThrow();
    const link = `${this.config.KILN_PUBLIC_URL}/invitations/accept?token=${encodeURIComponent(secret)}`;
    await this.outbox.enqueue(trx, {
      dedupeKey: `invitation:${invitation.id}:${invitation.token_hash}`,
      to: invitation.email,
      subject: `${inviterName} invited you to the Kiln study “${study.name}”`,
      text: [
        `${inviterName} invited you to join the study “${study.name}” on Kiln as a ${invitation.study_role}.`,
        '',
        `Open this link to accept (it works once, until ${invitation.expires_at.toUTCString()}):`,
        link,
        '',
        'Kiln runs and shares simulations of geometric heat flows. If you did not expect this, ignore this e-mail.',
      ].join('\n'),
    });
  }

  async list(user: AuthenticatedUser, studyId: string): Promise<Invitation[]> {
    await this.assertCanInvite(user, studyId);
    const rows = await this.db.selectFrom('invitations').selectAll().where('study_id', '=', studyId).orderBy('created_at', 'desc').execute();
    return rows.map(toInvitation);
  }

  private async findForManager(user: AuthenticatedUser, id: string) {
    const row = await this.db.selectFrom('invitations').selectAll().where('id', '=', id).executeTakeFirst();
    if (!row) throw notFound('invitation');
    await this.assertCanInvite(user, row.study_id).catch(() => {
      throw notFound('invitation');
    });
    return row;
  }

  /** A new link (the old one stops working) with a fresh expiry, mailed again. */
  async resend(user: AuthenticatedUser, id: string): Promise<Invitation> {
    const current = await this.findForManager(user, id);
    if (current.accepted_at || current.revoked_at) throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, `This invitation was ${current.accepted_at ? 'accepted' : 'revoked'}; send a new one instead.`);
    const row = await this.db.transaction().execute(async (trx) => {
      const secret = newSecret();
      const updated = await trx
        .updateTable('invitations')
        .set({ token_hash: hashSecret(secret), expires_at: new Date(Date.now() + this.config.KILN_INVITATION_DAYS * 86_400_000) })
        .where('id', '=', id)
        .returningAll()
        .executeTakeFirstOrThrow();
      await this.mail(trx, updated, secret, user.name);
      await this.audit.record(trx, { actorId: user.id, action: 'invitation.resend', subjectType: 'study', subjectId: updated.study_id, after: { email: updated.email } });
      return updated;
    });
    return toInvitation(row);
  }

  async revoke(user: AuthenticatedUser, id: string): Promise<Invitation> {
    const current = await this.findForManager(user, id);
    if (current.accepted_at) throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, 'This invitation was already accepted; remove the member instead.');
    const row = await this.db.transaction().execute(async (trx) => {
      const updated = await trx.updateTable('invitations').set({ revoked_at: new Date() }).where('id', '=', id).returningAll().executeTakeFirstOrThrow();
      await this.audit.record(trx, { actorId: user.id, action: 'invitation.revoke', subjectType: 'study', subjectId: updated.study_id, before: { email: updated.email } });
      return updated;
    });
    return toInvitation(row);
  }

  /** The pending invitation a link's secret opens; refused when expired, used or revoked. */
  private async pendingByToken(executor: Db, token: string) {
    const row = await executor.selectFrom('invitations').selectAll().where('token_hash', '=', hashSecret(token)).forUpdate().executeTakeFirst();
    if (!row) throw notFound('invitation (the link is wrong, or was replaced by a newer one)');
    const status = statusOf(row);
    if (status === 'accepted') throw gone('This invitation link was already used. Sign in instead.');
    if (status === 'revoked') throw gone('This invitation was withdrawn. Ask the study owner for a new one.');
    if (status === 'expired') throw gone('This invitation link has expired. Ask the study owner to send it again.');
    return row;
  }

  async preview(token: string): Promise<InvitationPreview> {
    const row = await this.pendingByToken(this.db, token);
    const [study, inviter, account] = await Promise.all([
      this.db.selectFrom('studies').select('name').where('id', '=', row.study_id).executeTakeFirstOrThrow(),
      this.db.selectFrom('users').select('name').where('id', '=', row.invited_by).executeTakeFirstOrThrow(),
      this.db.selectFrom('users').select('id').where('email', '=', row.email).executeTakeFirst(),
    ]);
    return { studyName: study.name, invitedByName: inviter.name, email: row.email, role: row.study_role, expiresAt: row.expires_at.toISOString(), accountExists: Boolean(account) };
  }

  /** Accepting with a new account: creates the collaborator with the chosen password and signs them in. */
  async acceptNewAccount(body: AcceptInvitationRequest): Promise<LoginResponse> {
    const passwordHash = await this.passwords.hash(body.password);
    const email = await this.db.transaction().execute(async (trx) => {
      const invitation = await this.pendingByToken(trx, body.token);
      const existing = await trx.selectFrom('users').select('id').where('email', '=', invitation.email).executeTakeFirst();
      if (existing) throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, 'An account with this e-mail exists: sign in, then open the link again to join the study.');
      const user = await trx
        .insertInto('users')
        .values({ email: invitation.email, name: body.name, role: Role.Collaborator, password_hash: passwordHash })
        .returning('id')
        .executeTakeFirstOrThrow();
      await this.join(trx, invitation, user.id);
      return invitation.email;
    });
    return this.auth.login({ email, password: body.password });
  }

  /** Accepting as a signed-in person whose e-mail the invitation names. */
  async acceptSignedIn(user: AuthenticatedUser, token: string): Promise<{ studyId: string }> {
    return this.db.transaction().execute(async (trx) => {
      const invitation = await this.pendingByToken(trx, token);
      if (invitation.email !== user.email) throw forbidden(`This invitation is for ${invitation.email}; sign in with that account.`);
      await this.join(trx, invitation, user.id);
      return { studyId: invitation.study_id };
    });
  }

  private async join(trx: Db, invitation: Selectable<InvitationsTable>, userId: string): Promise<void> {
    await trx
      .insertInto('study_members')
      .values({ study_id: invitation.study_id, user_id: userId, role: invitation.study_role })
      .onConflict((oc) => oc.columns(['study_id', 'user_id']).doNothing())
      .execute();
    await trx.updateTable('invitations').set({ accepted_at: new Date(), accepted_by: userId }).where('id', '=', invitation.id).execute();
    await this.audit.record(trx, { actorId: userId, action: 'invitation.accept', subjectType: 'study', subjectId: invitation.study_id, after: { email: invitation.email, role: invitation.study_role } });
  }
}
