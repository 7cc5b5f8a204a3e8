import { quotaSchema } from '@kiln/shared';
import { sql } from 'kysely';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { saveTallScreenshot, startBrowserStack, type BrowserStack } from '../support/browser-stack';
import type { DemoCredentials } from '../support/demo-lab';
import type { TestApi } from '../support/test-api';
import type { TestDatabase } from '../support/test-database';
import { QUICK_SPHERE_SPEC } from '../support/specs';

// The lab admin's pages in the browser against the real API: quotas edited
// inline and persisted, the audit log with before and after, a bad value stopped
// by the shared schema, the worker hosts with a stale one marked, usage, people,
// and what a researcher is told on these pages.

/** A full-page screenshot from the top, the viewport as tall as the content so the side bar reaches the bottom. */
const saveScreenshot = (page: Page, name: string) => saveTallScreenshot(page, name);

describe('the lab admin pages in the browser', () => {
  let stack: BrowserStack;
  let database: TestDatabase;
  let api: TestApi;
  let demo: DemoCredentials;
  let researcherId: string;
  let heldRunId: string;
  let adminToken: string;

  beforeAll(async () => {
    // A Redis logical database of this file's own. No scheduler: no worker computes here, and its
    // reconciler would hand the run "held" by the inserted worker back to the queue.
    stack = await startBrowserStack({ redis: 9, apiEnv: { KILN_SCHEDULER: '0' } });
    ({ database, api, demo } = stack);

    const people = await database.db.selectFrom('users').select(['id', 'email']).execute();
    const idOf = (email: string) => people.find((p) => p.email === email)!.id;
    researcherId = idOf(demo.researcher.email);

    // Two worker processes as the worker's heartbeat writes them: one beating now, one silent for ten minutes.
    const now = Date.now();
    await database.db
      .insertInto('workers')
      .values([
        { id: 'bench-fresh:4101', host: 'bench-fresh', pid: 4101, slots: 4, started_at: new Date(now - 3_600_000), last_heartbeat_at: new Date(now - 2_000), stopped_at: null },
        { id: 'bench-silent:4202', host: 'bench-silent', pid: 4202, slots: 2, started_at: new Date(now - 7_200_000), last_heartbeat_at: new Date(now - 600_000), stopped_at: null },
      ])
      .execute();
    // A run the fresh worker holds, as its claim writes it.
    const study = await database.db.selectFrom('studies').select('id').executeTakeFirstOrThrow();
    const held = await database.db
      .insertInto('runs')
      .values({ study_id: study.id, owner_id: idOf(demo.postdoc.email), spec: JSON.stringify(QUICK_SPHERE_SPEC), state: 'running', worker_id: 'bench-fresh:4101', started_at: new Date(now - 60_000), dispatched_at: new Date(now - 61_000), lease: 1, attempt: 1 })
      .returning('id')
      .executeTakeFirstOrThrow();
    heldRunId = held.id;

    // CPU time in the ledger for three months, as the runs' trigger would have counted it.
    const month = (back: number) => {
      const d = new Date();
      return sql<Date>`${`${new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() - back, 1)).toISOString().slice(0, 10)}`}::date`;
    };
    const usage: [string, number, number][] = [
      [demo.postdoc.email, 0, 41.5],
      [demo.postdoc.email, 1, 120],
      [demo.postdoc.email, 2, 88],
      [demo.researcher.email, 0, 12.25],
      [demo.researcher.email, 1, 64],
      [demo.collaborator.email, 1, 9.5],
    ];
    for (const [email, back, hours] of usage) {
      await database.db.insertInto('cpu_usage').values({ user_id: idOf(email), month: month(back), cpu_seconds: hours * 3600 }).execute();
    }

    adminToken = await stack.token(demo.admin);
  }, 60_000);

  afterAll(async () => {
    await stack?.close();
  });

  /** Signed in through the sign-in page once per person; later pages start from that browser storage. */
  const sessions = new Map<keyof DemoCredentials, Awaited<ReturnType<BrowserContext['storageState']>>>();
  async function signedIn(who: keyof DemoCredentials): Promise<Page> {
    const stored = sessions.get(who);
    const page = await stack.newPage({ storageState: stored });
    if (stored) await page.goto(api.baseUrl);
    else await stack.signIn(page, demo[who], { waitForName: false });
    await page.getByRole('button', { name: 'Sign out' }).waitFor({ timeout: 15_000 });
    if (!stored) sessions.set(who, await page.context().storageState());
    return page;
  }

  const quotaRow = (page: Page, name: string) => page.locator('.quota-table tr', { hasText: name });

  it('the admin sets a researcher\'s slots and CPU-hours inline; the change persists and is in the audit log with before and after', async () => {
    const page = await signedIn('admin');
    await page.getByRole('link', { name: 'Lab', exact: true }).click();
    await page.getByRole('link', { name: /Quotas/ }).click();
    await page.waitForURL(/\/lab\/quotas$/);

    const name = demo.researcher.name;
    const slots = page.getByLabel(`Slots for ${name}`);
    const cpuHours = page.getByLabel(`CPU-hours per month for ${name}`);
    await slots.waitFor({ timeout: 10_000 });
    expect(await slots.inputValue()).toBe('4');
    await expect.poll(() => quotaRow(page, name).getByTestId('quota-source').textContent()).toBe('Role default');
    // The ledger's 12.25 CPU-hours of this month against the researcher default of 300.
    expect(await quotaRow(page, name).locator('.usage-meter').textContent()).toContain('12.3 of 300 CPU-h');
    await saveScreenshot(page, 'lab-quotas');

    await slots.fill('6');
    await cpuHours.fill('450');
    await page.getByRole('button', { name: `Save quota of ${name}` }).click();
    await page.getByText(`Saved ${name}'s quota.`).waitFor({ timeout: 10_000 });
    await expect.poll(() => quotaRow(page, name).getByTestId('quota-source').textContent()).toBe('Custom');

    await page.reload();
    await page.getByLabel(`Slots for ${name}`).waitFor({ timeout: 10_000 });
    expect(await page.getByLabel(`Slots for ${name}`).inputValue()).toBe('6');
    expect(await page.getByLabel(`CPU-hours per month for ${name}`).inputValue()).toBe('450');
    expect(await quotaRow(page, name).getByTestId('quota-source').textContent()).toBe('Custom');
    expect(await quotaRow(page, name).locator('.usage-meter').textContent()).toContain('of 450 CPU-h');
    const stored = await database.db.selectFrom('quotas').selectAll().where('user_id', '=', researcherId).executeTakeFirstOrThrow();
    expect([stored.slots, stored.cpu_hours_per_month]).toEqual([6, 450]);

    await page.getByRole('link', { name: /Audit log/ }).click();
    await page.waitForURL(/\/lab\/audit$/);
    const entry = page.locator('.audit-table tr', { hasText: `for ${name}` });
    await entry.waitFor({ timeout: 10_000 });
    expect(await entry.textContent()).toContain('Quota set');
    expect(await entry.textContent()).toContain(demo.admin.name);
    expect(await entry.locator('[data-field="slots"] .audit-change__before').textContent()).toBe('4 slots');
    expect(await entry.locator('[data-field="slots"] .audit-change__after').textContent()).toBe('6 slots');
    expect(await entry.locator('[data-field="cpuHoursPerMonth"] .audit-change__before').textContent()).toBe('300 CPU-h a month');
    expect(await entry.locator('[data-field="cpuHoursPerMonth"] .audit-change__after').textContent()).toBe('450 CPU-h a month');
    expect(await entry.locator('.audit-change__same').textContent()).toContain('largest grid');

    // Filtering by action and person keeps the entry; a day range in the past hides it.
    await page.goto(`${api.baseUrl}/lab/audit?action=quota.set&person=${researcherId}`);
    await entry.waitFor({ timeout: 10_000 });
    await saveScreenshot(page, 'lab-audit');
    await page.goto(`${api.baseUrl}/lab/audit?from=2020-01-01&to=2020-01-31`);
    await page.getByText('No change matches these filters.').waitFor({ timeout: 10_000 });
    await page.context().close();
  });

  it('a bad value is stopped in the browser with the shared schema\'s message, and nothing is saved', async () => {
    const page = await signedIn('admin');
    await page.goto(`${api.baseUrl}/lab/quotas`);
    const name = demo.postdoc.name;
    const slots = page.getByLabel(`Slots for ${name}`);
    await slots.waitFor({ timeout: 10_000 });
    const expected = quotaSchema.safeParse({ slots: 2000, cpuHoursPerMonth: 300, maxGridPoints: 20_000, maxRunCpuSeconds: 3600 }).error!.issues[0]!.message;

    const requests: string[] = [];
    page.on('request', (request) => {
      if (request.method() === 'PUT') requests.push(request.url());
    });
    await slots.fill('2000');
    await page.getByRole('button', { name: `Save quota of ${name}` }).click();
    await quotaRow(page, name).getByText(expected).waitFor({ timeout: 5_000 });
    // A blank time is stopped too, naming the CPU-time field.
    await page.getByLabel(`Longest run hours for ${name}`).fill('');
    await page.getByLabel(`Longest run minutes for ${name}`).fill('');
    await quotaRow(page, name).getByText(/^maxRunCpuSeconds must be/).waitFor({ timeout: 5_000 });
    await saveScreenshot(page, 'lab-quotas-invalid');
    expect(requests).toEqual([]);
    const stored = await database.db.selectFrom('quotas').selectAll().where('user_id', '=', (await database.db.selectFrom('users').select('id').where('email', '=', demo.postdoc.email).executeTakeFirstOrThrow()).id).executeTakeFirst();
    expect(stored).toBeUndefined();
    await page.context().close();
  });

  it('the workers page lists a live worker and marks a stale one', async () => {
    // The fresh worker beats again now, as its heartbeat loop would, so a slow run of this file cannot make it stale.
    await database.db.updateTable('workers').set({ last_heartbeat_at: new Date() }).where('id', '=', 'bench-fresh:4101').execute();
    const page = await signedIn('admin');
    await page.goto(`${api.baseUrl}/lab/workers`);
    const fresh = page.locator('tr', { hasText: 'bench-fresh' });
    const silent = page.locator('tr', { hasText: 'bench-silent' });
    await fresh.waitFor({ timeout: 10_000 });
    await silent.waitFor();
    expect(await fresh.locator('[data-status]').textContent()).toBe('Alive');
    expect(await silent.locator('[data-status]').textContent()).toBe('Stale');
    expect(await silent.locator('[data-status] svg').count()).toBe(1);
    // Its heartbeat was written 10 minutes before set-up; the page rounds the age as the test goes on.
    expect(await silent.getByTestId('heartbeat').textContent()).toMatch(/^1[01] min ago$/);
    expect(await fresh.textContent()).toContain('1 of 4 slots busy');
    expect(await silent.textContent()).toContain('none');
    // The held run links to its page.
    await fresh.getByRole('link', { name: heldRunId.slice(0, 8) }).click();
    await page.waitForURL(new RegExp(`/runs/${heldRunId}$`));
    await page.goBack();
    await fresh.waitFor({ timeout: 10_000 });
    await page.getByText('1 worker has stopped sending heartbeats').waitFor();
    await saveScreenshot(page, 'lab-workers');
    await page.context().close();
  });

  it('the usage page charts CPU-hours per person and month and lists them', async () => {
    const page = await signedIn('admin');
    await page.goto(`${api.baseUrl}/lab/usage`);
    const table = page.locator('.usage-table');
    await table.waitFor({ timeout: 10_000 });
    const postdoc = table.locator('tr', { hasText: demo.postdoc.name });
    expect(await postdoc.locator('td').last().textContent()).toBe('250'); // 41.5 + 120 + 88 = 249.5, to 3 significant figures
    expect(await page.locator('.chart').getAttribute('data-points')).toBe(String(3 * 6));
    await saveScreenshot(page, 'lab-usage');
    await page.context().close();
  });

  it('the admin disables and enables a person and changes a role, each after confirming; all audited', async () => {
    const page = await signedIn('admin');
    await page.getByRole('link', { name: 'Lab', exact: true }).click();
    const row = page.locator('tr', { hasText: demo.collaborator.email });
    await row.waitFor({ timeout: 10_000 });
    await page.getByTestId('invite-note').waitFor();
    await saveScreenshot(page, 'lab-people');
    await row.getByRole('button', { name: 'Disable' }).click();
    await page.getByRole('button', { name: 'Disable account' }).click();
    await row.getByText('Disabled', { exact: true }).waitFor({ timeout: 10_000 });
    await row.getByRole('button', { name: 'Enable' }).click();
    await page.getByRole('button', { name: 'Enable account' }).click();
    await row.getByText('Active', { exact: true }).waitFor({ timeout: 10_000 });
    const audit = await api.request('GET', '/api/admin/audit?action=person.update', { token: adminToken });
    expect(audit.body.items.map((e: { after: { disabled: boolean } }) => e.after.disabled)).toEqual([false, true]);

    // A role change is confirmed too, and moves the person onto the new role's default quota.
    await page.getByLabel(`Role of ${demo.collaborator.name}`).click();
    await page.locator('.ant-select-item-option', { hasText: 'Researcher' }).click();
    await page.locator('.ant-modal-confirm-title', { hasText: `Make ${demo.collaborator.name} a researcher?` }).waitFor({ timeout: 5_000 });
    expect(await page.locator('.ant-modal-confirm').count()).toBe(1);
    await saveScreenshot(page, 'lab-people-role-confirm');
    await page.getByRole('button', { name: 'Make researcher' }).click();
    await page.getByText(`${demo.collaborator.name} is now a researcher.`).waitFor({ timeout: 10_000 });
    await page.getByRole('link', { name: /Quotas/ }).click();
    await expect.poll(() => page.getByLabel(`Slots for ${demo.collaborator.name}`).inputValue(), { timeout: 10_000 }).toBe('4');
    await page.context().close();
  });

  it('a researcher is told the admin pages are for admins, and sees the quota the admin set on the Overview', async () => {
    const page = await signedIn('researcher');
    expect(await page.getByRole('link', { name: 'Lab', exact: true }).count()).toBe(0);
    for (const path of ['/lab/quotas', '/lab/workers', '/lab/usage', '/lab/audit']) {
      await page.goto(`${api.baseUrl}${path}`);
      await page.getByText('Only lab admins can see this page').waitFor({ timeout: 10_000 });
      expect(await page.getByText('These pages are for lab admins.').count()).toBe(1);
    }
    await saveScreenshot(page, 'lab-denied-researcher');

    // The first test gave this researcher 6 slots; the Overview shows their own use against it.
    await page.getByRole('link', { name: 'Overview', exact: true }).click();
    await expect.poll(() => page.getByTestId('slot-use').textContent(), { timeout: 10_000 }).toBe('0 of 6 slots in use');
    await page.context().close();
  });
});
