import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { newPasswordSchema } from '@kiln/shared';
import { createSmtpSink } from '../../backend/src/mail/smtp-sink';
import { saveScreenshot as saveFullPage } from '../support/browser';
import { saveTallScreenshot, startBrowserStack, type BrowserStack, type Person } from '../support/browser-stack';
import type { DemoCredentials } from '../support/demo-lab';
import { freePort, waitFor } from '../support/ports';
import type { TestApi } from '../support/test-api';
import type { TestDatabase } from '../support/test-database';

// Working with people outside the lab, in the browser against the real API and a
// real SMTP round trip to the local sink: an invitation sent from the study page,
// accepted from the e-mailed link by someone new, the outbox page for admins,
// "Forgot your password?" with its e-mailed link, and the account page.

/** A full-page screenshot from the top, the viewport as tall as the content. */
const saveScreenshot = (page: Page, name: string) => saveTallScreenshot(page, name);

const PUBLIC_URL = 'http://kiln.test';
const NEWCOMER = { email: 'ada.lindqvist@elsewhere.example', name: 'Ada Lindqvist', password: 'heat-flow-on-spheres' };

describe('collaboration in the browser', () => {
  let stack: BrowserStack;
  let database: TestDatabase;
  let api: TestApi;
  let demo: DemoCredentials;
  let studyId: string;
  let inviteLink: string;

  /**
   * The newest message to an address and the link in it matching `path`, with
   * the public address swapped for the test server's (the API's port is only
   * known once it listens, after the public address was configured).
   */
  async function linkTo(address: string, path: string, after = new Date(0)) {
    const message = await waitFor(`mail to ${address}`, () =>
      database.db
        .selectFrom('mail_messages')
        .selectAll()
        .where(({ eb, val }) => eb(val(address), '=', eb.fn.any('envelope_to')))
        .where('received_at', '>', after)
        .orderBy('received_at', 'desc')
        .executeTakeFirst(),
    );
    const body = message.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
    const link = body.match(new RegExp(`${PUBLIC_URL.replace(/\./g, '\\.')}${path}\\?token=[^\\s]+`))?.[0];
    if (!link) throw new Error(`no ${path} link in:\n${message.raw}`);
    return { message, url: link.replace(PUBLIC_URL, api.baseUrl) };
  }

  beforeAll(async () => {
    // Its own redis-server, its own copy of the built app (a rebuild of frontend/dist by
    // someone else during the run cannot swap the lazily loaded pages' files away), and
    // the local SMTP sink writing into this file's database.
    stack = await startBrowserStack({
      redis: 'own',
      privateWebDir: true,
      apiEnv: { KILN_SCHEDULER_TICK_MS: '100', KILN_MAIL_SINK: '1', KILN_PUBLIC_URL: PUBLIC_URL },
      beforeApi: async ({ database }) => {
        const smtpPort = await freePort();
        const sink = createSmtpSink(database.db);
        await new Promise<void>((resolve) => sink.listen(smtpPort, '127.0.0.1', resolve));
        return {
          env: { SMTP_URL: `smtp://127.0.0.1:${smtpPort}` },
          close: () => new Promise<void>((resolve) => sink.close(() => resolve())),
        };
      },
    });
    ({ database, api, demo } = stack);
    const token = await stack.token(demo.postdoc);
    studyId = (await api.request('GET', '/api/studies', { token })).body[0].id;
    // A second study of the same owner that the newcomer must never see.
    await api.request('POST', '/api/studies', { token, body: { name: 'Private: B³ blow-up thresholds' } });
  }, 60_000);

  afterAll(async () => {
    await stack?.close();
  });

  const newPage = () => stack.newPage();

  /** Signs in through the sign-in page and waits for the person's name in the heading. */
  const signIn = (page: Page, person: Person) => stack.signIn(page, person);

  it('the owner invites an e-mail from the study page; the newcomer accepts from the mailed link and sees that study only', async () => {
    const owner = await newPage();
    await signIn(owner, demo.postdoc);
    await owner.goto(`${api.baseUrl}/studies/${studyId}`);
    const invite = owner.locator('.ant-card', { hasText: 'Invite people' });
    await invite.getByLabel('E-mail').fill('not-an-address');
    await invite.getByRole('button', { name: 'Send invitation' }).click();
    await invite.getByText('email must be an e-mail address').waitFor();
    await invite.getByLabel('E-mail').fill(NEWCOMER.email);
    await invite.getByRole('button', { name: 'Send invitation' }).click();
    await owner.getByText(`Invitation mailed to ${NEWCOMER.email}.`).waitFor();
    const row = invite.locator(`.invitation-list__item[data-email="${NEWCOMER.email}"]`);
    await row.getByText('Waiting').waitFor();
    await saveScreenshot(owner, 'study-invite');

    const mail = await linkTo(NEWCOMER.email, '/invitations/accept');
    expect(mail.message.subject).toContain('Ellipsoid targets past the oscillation threshold');
    inviteLink = mail.url;

    // A fresh browser, as the newcomer's own.
    const newcomer = await newPage();
    await newcomer.goto(inviteLink);
    await newcomer.getByRole('heading', { name: 'Join “Ellipsoid targets past the oscillation threshold”' }).waitFor();
    await newcomer.getByText(demo.postdoc.name).waitFor();
    await newcomer.getByLabel('Your name').fill(NEWCOMER.name);
    await newcomer.getByLabel('Choose a password').fill('short');
    await newcomer.getByRole('button', { name: 'Create account and join' }).click();
    const tooShort = newPasswordSchema.safeParse('short').error!.issues[0]!.message;
    await newcomer.getByText(tooShort).waitFor();
    await saveScreenshot(newcomer, 'invitation-accept');
    await newcomer.getByLabel('Choose a password').fill(NEWCOMER.password);
    await newcomer.getByRole('button', { name: 'Create account and join' }).click();
    await newcomer.waitForURL(new RegExp(`/studies/${studyId}$`), { timeout: 15_000 });
    await newcomer.getByRole('heading', { name: 'Ellipsoid targets past the oscillation threshold' }).waitFor();
    await newcomer.getByRole('button', { name: 'Sign out' }).waitFor();
    expect(await newcomer.locator('.shell__user').textContent()).toContain(NEWCOMER.name);

    await newcomer.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Studies' }).click();
    await newcomer.getByRole('link', { name: 'Ellipsoid targets past the oscillation threshold' }).waitFor();
    expect(await newcomer.getByText('Private: B³ blow-up thresholds').count()).toBe(0);
    await saveScreenshot(newcomer, 'collaborator-studies');

    // The owner's list now says accepted.
    await owner.reload();
    await row.getByText('Accepted').waitFor({ timeout: 10_000 });

    // The link works once: opened again, the server's reason and what to do.
    const again = await newPage();
    await again.goto(inviteLink);
    await again.getByRole('alert').getByText(/already used/).waitFor();
    await again.getByText('Ask the person who invited you to resend the invitation').waitFor();
    await saveScreenshot(again, 'invitation-used');
    await Promise.all([owner, newcomer, again].map((p) => p.context().close()));
  });

  it('an admin reads the invitation in the outbox page as its recipient would; others are told it is not for them', async () => {
    const admin = await newPage();
    await signIn(admin, demo.admin);
    await admin.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Lab' }).click();
    await admin.getByRole('link', { name: /Outbox/ }).click();
    await admin.waitForURL(/\/lab\/outbox$/);
    const view = admin.getByTestId('mail-view').first();
    await view.waitFor({ timeout: 10_000 });
    const text = await view.textContent();
    expect(text).toContain(NEWCOMER.email);
    expect(text).toContain('invited you to the Kiln study “Ellipsoid targets past the oscillation threshold”');
    // Soft line breaks and =3D are decoded: the whole link is one clickable address.
    const href = await view.locator('a[href*="/invitations/accept?token="]').first().getAttribute('href');
    expect(href).toBe(inviteLink.replace(api.baseUrl, PUBLIC_URL));
    await saveScreenshot(admin, 'lab-outbox');

    const researcher = await newPage();
    await signIn(researcher, demo.researcher);
    await researcher.goto(`${api.baseUrl}/lab/outbox`);
    await researcher.getByText('Only lab admins can see this page').waitFor();
    await Promise.all([admin, researcher].map((p) => p.context().close()));
  });

  it('someone who already has an account is told to sign in, comes back to the link and joins the study', async () => {
    const owner = await api.request('POST', '/api/auth/login', { body: { email: demo.postdoc.email, password: demo.postdoc.password } });
    const privateStudy = (await api.request('GET', '/api/studies', { token: owner.body.accessToken })).body.find((s: { name: string }) => s.name.startsWith('Private'));
    const sent = new Date(Date.now() - 1000);
    const invite = await api.request('POST', `/api/studies/${privateStudy.id}/invitations`, { token: owner.body.accessToken, body: { email: demo.researcher.email, role: 'viewer' } });
    expect(invite.status).toBe(201);
    const { url } = await linkTo(demo.researcher.email, '/invitations/accept', sent);

    const page = await newPage();
    await page.goto(url);
    await page.getByText(`You already have a Kiln account with ${demo.researcher.email}.`).waitFor();
    await saveScreenshot(page, 'invitation-existing-account');
    await page.getByRole('button', { name: 'Sign in to accept' }).click();
    await page.getByLabel('E-mail').fill(demo.researcher.email);
    await page.getByLabel('Password').fill(demo.researcher.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('button', { name: 'Accept and open the study' }).click();
    await page.waitForURL(new RegExp(`/studies/${privateStudy.id}$`), { timeout: 15_000 });
    await page.getByRole('heading', { name: 'Private: B³ blow-up thresholds' }).waitFor().catch(async (e) => {
      await saveFullPage(page, 'debug-invitation-existing-account');
      throw e;
    });
    await page.context().close();
  });

  it('"Forgot your password?" mails a link that sets a new password once', async () => {
    const page = await newPage();
    await page.goto(`${api.baseUrl}/sign-in`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.waitForURL(/\/reset-password$/);
    const asked = new Date(Date.now() - 1000);
    await page.getByLabel('E-mail').fill(NEWCOMER.email);
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await page.getByText('If this address has a Kiln account, a reset link is on its way.').waitFor();
    await saveScreenshot(page, 'reset-request');

    const { url } = await linkTo(NEWCOMER.email, '/reset-password', asked);
    await page.goto(url);
    await page.getByRole('heading', { name: 'Choose a new password' }).waitFor();
    await page.getByLabel('New password', { exact: true }).fill('a-fresh-password-2');
    await page.getByLabel('Repeat the new password').fill('a-fresh-password-3');
    await page.getByRole('button', { name: 'Set new password' }).click();
    await page.getByText('the two passwords differ').waitFor();
    await page.getByLabel('Repeat the new password').fill('a-fresh-password-2');
    await page.getByRole('button', { name: 'Set new password' }).click();
    await page.getByText('Your password was changed.').waitFor();
    await saveScreenshot(page, 'reset-done');

    // The old password no longer works; the new one does.
    expect((await api.request('POST', '/api/auth/login', { body: { email: NEWCOMER.email, password: NEWCOMER.password } })).status).toBe(401);
    await signIn(page, { ...NEWCOMER, password: 'a-fresh-password-2' });

    // The same link a second time is refused with the reason and what to do.
    await page.goto(url);
    await page.getByLabel('New password', { exact: true }).fill('yet-another-password');
    await page.getByLabel('Repeat the new password').fill('yet-another-password');
    await page.getByRole('button', { name: 'Set new password' }).click();
    await page.getByRole('link', { name: 'Ask for a new link' }).waitFor().catch(async (e) => {
      await saveFullPage(page, 'debug-reset-reused');
      throw e;
    });
    await saveScreenshot(page, 'reset-reused');
    await page.context().close();
  });

  it('the account page: notification switches, an API token shown once that works from a script, uploads checked before sending', async () => {
    const page = await newPage();
    await signIn(page, demo.postdoc);
    await page.locator('.shell__user').getByRole('link', { name: demo.postdoc.name }).click();
    await page.getByRole('heading', { name: 'Your account' }).waitFor();

    const candidateSwitch = page.getByRole('switch', { name: 'A run of mine became a blow-up candidate' });
    const before = await candidateSwitch.getAttribute('aria-checked');
    await candidateSwitch.click();
    await expect.poll(() => candidateSwitch.getAttribute('aria-checked')).not.toBe(before);
    const me = await database.db.selectFrom('users').select('id').where('email', '=', demo.postdoc.email).executeTakeFirstOrThrow();
    const login = await api.request('POST', '/api/auth/login', { body: { email: demo.postdoc.email, password: demo.postdoc.password } });
    const settings = await api.request('GET', '/api/me/notifications', { token: login.body.accessToken });
    expect(String(settings.body.candidate)).toBe(before === 'true' ? 'false' : 'true');
    expect(me.id).toBeTruthy();

    await page.getByLabel('Token name').fill('notebook');
    await page.getByRole('button', { name: 'Create token' }).click();
    await page.getByText('you will not see it again').waitFor();
    const secret = (await page.getByTestId('new-token-secret').textContent())!;
    expect(await page.locator('.new-token__snippet').textContent()).toContain(`Authorization: Bearer ${secret}`);
    const scripted = await api.request('GET', '/api/studies', { token: secret });
    expect(scripted.status).toBe(200);
    expect(scripted.body.length).toBe(2);
    await page.locator('.token-table tr', { hasText: 'notebook' }).waitFor();

    // A malformed profile is stopped in the browser, naming row and column; nothing is sent.
    const posts: string[] = [];
    page.on('request', (request) => {
      if (request.method() === 'POST' && request.url().endsWith('/api/uploads')) posts.push(request.url());
    });
    await page.getByLabel('File to upload').setInputFiles({ name: 'bad.csv', mimeType: 'text/csv', buffer: Buffer.from('r,h\n0,0\n0.5,abc\n1,3\n') });
    await page.getByTestId('upload-problems').getByText('row 3, column h').waitFor();
    expect(await page.getByRole('button', { name: 'Upload', exact: true }).isDisabled()).toBe(true);
    await saveScreenshot(page, 'account');
    const rows = Array.from({ length: 21 }, (_, i) => `${i / 20},${(1.5 * Math.PI * i) / 20}`).join('\n');
    await page.getByLabel('File to upload').setInputFiles({ name: 'h0.csv', mimeType: 'text/csv', buffer: Buffer.from(`r,h\n${rows}\n`) });
    await page.getByRole('button', { name: 'Upload', exact: true }).click();
    await page.getByText('h0.csv uploaded and checked: 21 rows · ball.').waitFor();
    await page.locator('.uploads-table tr', { hasText: 'h0.csv' }).waitFor();
    expect(posts).toHaveLength(1);

    await page.getByRole('button', { name: /^Revoke token notebook/ }).click();
    await page.getByRole('button', { name: 'Revoke', exact: true }).click();
    await page.getByText('Token “notebook” revoked.').waitFor();
    expect((await api.request('GET', '/api/studies', { token: secret })).status).toBe(401);
    await saveScreenshot(page, 'account-after');
    await page.context().close();
  });
});
