import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Role } from '@kiln/shared';
import { createSmtpSink } from '../../backend/src/mail/smtp-sink';
import { createPerson, type TestPerson } from '../support/people';
import { freePort, waitFor } from '../support/ports';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { testEnv } from '../support/test-env';

// Invitations and password resets travel by real SMTP to the local sink.
describe('invitations, password resets and API tokens', () => {
  let database: TestDatabase;
  let api: TestApi;
  let sink: ReturnType<typeof createSmtpSink>;
  let owner: TestPerson, admin: TestPerson, stranger: TestPerson;
  let ownerToken: string;
  let studyId: string;
  let otherStudyId: string;

  const login = async (email: string, password: string) => (await api.request('POST', '/api/auth/login', { body: { email, password } })).body.accessToken as string;
  /** The link of the newest message to an address, as the recipient would click it. */
  const linkTo = async (address: string, pattern: RegExp) => {
    const message = await waitFor(`mail to ${address}`, () =>
      database.db.selectFrom('mail_messages').selectAll().where(({ eb, val }) => eb(val(address), '=', eb.fn.any('envelope_to'))).orderBy('received_at', 'desc').executeTakeFirst(),
    );
    const body = message.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
    const link = body.match(pattern)?.[0];
    if (!link) throw new Error(`no link in:\n${message.raw}`);
    return { message, token: decodeURIComponent(new URL(link).searchParams.get('token')!) };
  };

  beforeAll(async () => {
    database = await createTestDatabase();
    const smtpPort = await freePort();
    sink = createSmtpSink(database.db);
    await new Promise<void>((resolve) => sink.listen(smtpPort, '127.0.0.1', resolve));
    api = await startTestApi(database.url, {
      REDIS_URL: `${testEnv.redisUrl}/5`,
      KILN_SCHEDULER: '0',
      SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
      KILN_MAIL_SINK: '1',
      KILN_PUBLIC_URL: 'http://kiln.test',
    });
    owner = await createPerson(database.db, Role.Researcher, { name: 'Joren Owner' });
    admin = await createPerson(database.db, Role.Admin);
    stranger = await createPerson(database.db, Role.Researcher);
    ownerToken = await login(owner.email, owner.password);
    studyId = (await api.request('POST', '/api/studies', { token: ownerToken, body: { name: 'Shared study' } })).body.id;
    otherStudyId = (await api.request('POST', '/api/studies', { token: ownerToken, body: { name: 'Private study' } })).body.id;
  });
  afterAll(async () => {
    await api?.close();
    await new Promise<void>((resolve) => sink.close(() => resolve()));
    await database?.drop();
  });

  it('invite → e-mail at the sink → accept → the collaborator sees that study and nothing else; the link works once', async () => {
    const invite = await api.request('POST', `/api/studies/${studyId}/invitations`, { token: ownerToken, body: { email: 'New.Person@Elsewhere.example', role: 'member' } });
    expect(invite.status).toBe(201);
    expect(invite.body).toMatchObject({ email: 'new.person@elsewhere.example', status: 'pending' });
    const { message, token } = await linkTo('new.person@elsewhere.example', /http:\/\/kiln\.test\/invitations\/accept\?token=[^\s]+/);
    expect(message.subject).toContain('Shared study');

    const preview = await api.request('GET', `/api/invitations/preview?token=${encodeURIComponent(token)}`);
    expect(preview.body).toMatchObject({ studyName: 'Shared study', invitedByName: 'Joren Owner', accountExists: false });
    const weak = await api.request('POST', '/api/invitations/accept', { body: { token, name: 'New Person', password: 'short' } });
    expect(weak.status).toBe(400);
    const accepted = await api.request('POST', '/api/invitations/accept', { body: { token, name: 'New Person', password: 'a-good-long-password' } });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ role: 'collaborator', email: 'new.person@elsewhere.example' });
    const collaboratorToken = accepted.body.accessToken;

    const studies = await api.request('GET', '/api/studies', { token: collaboratorToken });
    expect(studies.body.map((s: { id: string }) => s.id)).toEqual([studyId]);
    expect((await api.request('GET', `/api/studies/${otherStudyId}`, { token: collaboratorToken })).status).toBe(404);

    const reused = await api.request('POST', '/api/invitations/accept', { body: { token, name: 'Again', password: 'a-good-long-password' } });
    expect(reused.status).toBe(410);
    expect(reused.body.message).toMatch(/already used/);
  });

  it('refuses an expired link, a revoked one, and an old link after a resend', async () => {
    const invite = await api.request('POST', `/api/studies/${studyId}/invitations`, { token: ownerToken, body: { email: 'late@elsewhere.example' } });
    const first = await linkTo('late@elsewhere.example', /http:\/\/kiln\.test\/invitations\/accept\?token=[^\s]+/);
    const resent = await api.request('POST', `/api/invitations/${invite.body.id}/resend`, { token: ownerToken });
    expect(resent.status).toBe(201);
    const old = await api.request('POST', '/api/invitations/accept', { body: { token: first.token, name: 'Late', password: 'a-good-long-password' } });
    expect(old.status).toBe(404);

    await database.db.updateTable('invitations').set({ expires_at: new Date(Date.now() - 1000) }).where('id', '=', invite.body.id).execute();
    const second = await waitFor('the resent link', async () => {
      const rows = await database.db.selectFrom('mail_messages').select('raw').where(({ eb, val }) => eb(val('late@elsewhere.example'), '=', eb.fn.any('envelope_to'))).execute();
      return rows.length === 2 ? rows : undefined;
    });
    const token = decodeURIComponent(second.map((r) => r.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=').match(/token=([^\s]+)/)![1]).find((t) => t !== encodeURIComponent(first.token) && t !== first.token)!);
    const expired = await api.request('POST', '/api/invitations/accept', { body: { token, name: 'Late', password: 'a-good-long-password' } });
    expect(expired.status).toBe(410);
    expect(expired.body.message).toMatch(/expired/);

    const other = await api.request('POST', `/api/studies/${studyId}/invitations`, { token: ownerToken, body: { email: 'withdrawn@elsewhere.example' } });
    const link = await linkTo('withdrawn@elsewhere.example', /http:\/\/kiln\.test\/invitations\/accept\?token=[^\s]+/);
    await api.request('DELETE', `/api/invitations/${other.body.id}`, { token: ownerToken });
    const revoked = await api.request('POST', '/api/invitations/accept', { body: { token: link.token, name: 'W', password: 'a-good-long-password' } });
    expect(revoked.status).toBe(410);
  });

  it('only the study owner or an admin invites; bad addresses are refused', async () => {
    const strangerToken = await login(stranger.email, stranger.password);
    expect((await api.request('POST', `/api/studies/${studyId}/invitations`, { token: strangerToken, body: { email: 'x@y.example' } })).status).toBe(404);
    expect((await api.request('POST', `/api/studies/${studyId}/invitations`, { token: ownerToken, body: { email: 'not an address' } })).status).toBe(400);
    const adminToken = await login(admin.email, admin.password);
    expect((await api.request('POST', `/api/studies/${studyId}/invitations`, { token: adminToken, body: { email: 'via.admin@elsewhere.example', role: 'viewer' } })).status).toBe(201);
  });

  it('password reset by e-mail: the link sets a new password once; unknown addresses look the same', async () => {
    const unknown = await api.request('POST', '/api/auth/password-reset', { body: { email: 'nobody@nowhere.example' } });
    const known = await api.request('POST', '/api/auth/password-reset', { body: { email: owner.email } });
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    expect(known.body).toEqual(unknown.body);
    const { token } = await linkTo(owner.email, /http:\/\/kiln\.test\/reset-password\?token=[^\s]+/);
    const done = await api.request('POST', '/api/auth/password-reset/confirm', { body: { token, password: 'a-brand-new-password' } });
    expect(done.status).toBe(200);
    expect((await api.request('POST', '/api/auth/login', { body: { email: owner.email, password: owner.password } })).status).toBe(401);
    ownerToken = await login(owner.email, 'a-brand-new-password');
    expect(ownerToken).toEqual(expect.any(String));
    const again = await api.request('POST', '/api/auth/password-reset/confirm', { body: { token, password: 'yet-another-password' } });
    expect(again.status).toBe(400);
  });

  it('personal API tokens: shown once, work as bearer, never grant more than the owner role, stop at revocation', async () => {
    const created = await api.request('POST', '/api/tokens', { token: ownerToken, body: { name: 'notebook' } });
    expect(created.status).toBe(201);
    const secret: string = created.body.token;
    expect(secret).toMatch(/^kiln_pat_/);
    const listed = await api.request('GET', '/api/tokens', { token: ownerToken });
    expect(JSON.stringify(listed.body)).not.toContain(secret);
    const me = await api.request('GET', '/api/auth/me', { token: secret });
    expect(me.body).toMatchObject({ id: owner.id, role: 'researcher' });
    expect((await api.request('GET', '/api/users', { token: secret })).status).toBe(403);
    expect((await api.request('GET', '/api/studies', { token: secret })).status).toBe(200);

    expect((await api.request('DELETE', `/api/tokens/${created.body.id}`, { token: ownerToken })).status).toBe(204);
    const revoked = await api.request('GET', '/api/auth/me', { token: secret });
    expect(revoked.status).toBe(401);
    expect((await api.request('GET', '/api/auth/me', { token: 'kiln_pat_madeup' })).status).toBe(401);
    const audit = await database.db.selectFrom('audit_log').select('action').where('subject_id', '=', created.body.id).orderBy('id').execute();
    expect(audit.map((a) => a.action)).toEqual(['token.create', 'token.revoke']);
  });

  it('the outbox page shows admins every message the sink received, and nobody else', async () => {
    const adminToken = await login(admin.email, admin.password);
    const outbox = await api.request('GET', '/api/admin/mail', { token: adminToken });
    expect(outbox.status).toBe(200);
    expect(outbox.body.length).toBeGreaterThanOrEqual(5);
    expect(outbox.body.map((m: { subject: string }) => m.subject)).toContain('Reset your Kiln password');
    expect((await api.request('GET', '/api/admin/mail', { token: ownerToken })).status).toBe(403);
  });
});
