import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { saveScreenshot } from '../support/browser';
import { startBrowserStack, type BrowserStack } from '../support/browser-stack';
import type { DemoCredentials } from '../support/demo-lab';
import type { TestApi } from '../support/test-api';

describe('signing in and out in the browser', () => {
  let stack: BrowserStack;
  let api: TestApi;
  let demo: DemoCredentials;

  beforeAll(async () => {
    stack = await startBrowserStack();
    ({ api, demo } = stack);
  });
  afterAll(async () => {
    await stack?.close();
  });

  const newPage = () => stack.newPage();

  /** Opens the app, expects to be sent to the sign-in page, and submits the form (the outcome is each test's to check). */
  async function signIn(page: Page, email: string, password: string) {
    await stack.signIn(page, { email, password }, { startAt: '/', waitForName: false });
  }

  it('a researcher signs in, sees the overview with their name and no admin pages, and signs out', async () => {
    const page = await newPage();
    await signIn(page, demo.postdoc.email, demo.postdoc.password);
    await expect
      .poll(() => page.getByRole('heading', { level: 1 }).first().textContent(), { timeout: 15_000 })
      .toContain(demo.postdoc.name);
    await page.getByText('PostgreSQL').first().waitFor();
    expect(await page.getByRole('link', { name: 'Lab', exact: true }).count()).toBe(0);
    await saveScreenshot(page, 'overview-researcher');

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in/);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    expect(await page.evaluate(() => localStorage.getItem('kiln.token'))).toBeNull();
    // Signed out means signed out: the overview sends you back to sign in.
    await page.goto(api.baseUrl);
    await page.waitForURL(/\/sign-in/);
    await page.context().close();
  });

  it('a wrong password shows a clear message and keeps the user on the sign-in page', async () => {
    const page = await newPage();
    await signIn(page, demo.researcher.email, 'not-the-password');
    await page.getByText('E-mail or password is wrong.').waitFor({ timeout: 10_000 });
    expect(page.url()).toContain('/sign-in');
    await saveScreenshot(page, 'sign-in-wrong-password');
    await page.context().close();
  });

  it('bad input is stopped in the browser with the shared schema\'s message', async () => {
    const page = await newPage();
    await signIn(page, 'not-an-address', 'x');
    await page.getByText('email must be an e-mail address').waitFor({ timeout: 10_000 });
    await page.context().close();
  });

  it('the lab admin sees the Lab page with the lab\'s people, also after a reload of the deep link', async () => {
    const page = await newPage();
    await signIn(page, demo.admin.email, demo.admin.password);
    await page.getByRole('link', { name: 'Lab', exact: true }).click();
    await page.waitForURL(/\/lab$/);
    await page.getByText(demo.collaborator.email).waitFor({ timeout: 10_000 });
    await page.reload();
    await page.getByText(demo.collaborator.email).waitFor({ timeout: 10_000 });
    await saveScreenshot(page, 'lab-admin');
    await page.context().close();
  });

  it('a collaborator sees no Lab link and is told the Lab page is for admins', async () => {
    const page = await newPage();
    await signIn(page, demo.collaborator.email, demo.collaborator.password);
    await expect
      .poll(() => page.getByRole('heading', { level: 1 }).first().textContent(), { timeout: 15_000 })
      .toContain(demo.collaborator.name);
    expect(await page.getByRole('link', { name: 'Lab', exact: true }).count()).toBe(0);
    await page.goto(`${api.baseUrl}/lab`);
    await page.getByText('Only lab admins can see this page').waitFor({ timeout: 10_000 });
    await saveScreenshot(page, 'lab-denied-collaborator');
    await page.context().close();
  });

  it('an unknown page says so and offers a way back; unknown API paths stay JSON', async () => {
    const page = await newPage();
    await signIn(page, demo.researcher.email, demo.researcher.password);
    await page.getByRole('button', { name: 'Sign out' }).waitFor({ timeout: 15_000 });
    await page.goto(`${api.baseUrl}/no/such/page`);
    await page.getByText('Page not found').waitFor({ timeout: 10_000 });
    await saveScreenshot(page, 'not-found');
    await page.context().close();
    const apiMiss = await api.request('GET', '/api/no/such/route');
    expect(apiMiss.status).toBe(404);
    expect(apiMiss.body.error).toBe('not_found');
  });
});
