import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser, BrowserContextOptions, Page } from 'playwright-core';
import { expect } from 'vitest';
import { launchBrowser, saveScreenshot as saveFullPage } from './browser';
import { seedDemoLabForTests, type DemoCredentials } from './demo-lab';
import { startTestRedis, type TestRedis } from './redis-server';
import { startTestApi, type TestApi } from './test-api';
import { createTestDatabase, type TestDatabase } from './test-database';
import { testEnv } from './test-env';
import { startWorker, stopProcesses, type WorkerEnv, type WorkerProcess } from './worker-harness';

// What every browser test file sets up the same way: a fresh database with the
// demo lab, the real API serving the built web app, Chromium, and signing in
// through the sign-in page.

export interface BrowserStackOptions {
  /**
   * Redis for the API (and workers): 'own' starts a throwaway redis-server for
   * this file; a number picks a logical database of the shared test Redis; left
   * out, the shared test Redis as it is.
   */
  redis?: 'own' | number;
  /** Serve a private copy of frontend/dist, so a rebuild during the run cannot swap lazily loaded pages away. */
  privateWebDir?: boolean;
  /** Extra API environment (scheduler, mail, public URL...). */
  apiEnv?: Record<string, string>;
  /**
   * Runs after the database is seeded and before the API starts; what it returns
   * is added to the API environment, and its `close` runs after the API has closed.
   */
  beforeApi?: (stack: { database: TestDatabase; demo: DemoCredentials }) => Promise<{ env?: Record<string, string>; close?: () => Promise<void> }>;
  /** Worker processes to start against the same database and Redis. */
  workers?: Omit<WorkerEnv, 'databaseUrl' | 'redisUrl'>[];
  /** Viewport of the pages `newPage` opens; 1280 × 800 unless given. */
  viewport?: { width: number; height: number };
}

export interface Person {
  email: string;
  password: string;
  name: string;
}

export interface BrowserStack {
  database: TestDatabase;
  api: TestApi;
  browser: Browser;
  demo: DemoCredentials;
  /** The Redis URL the API and workers use. */
  redisUrl: string;
  workers: WorkerProcess[];
  /** A page in a fresh browser context (no session). */
  newPage(options?: BrowserContextOptions): Promise<Page>;
  /**
   * Signs in through the sign-in page. `startAt: '/'` opens the app first and
   * expects to be sent to the sign-in page; `waitForName: false` leaves the
   * outcome to the caller (by default it waits for the person's name in the heading).
   */
  signIn(page: Page, person: { email: string; password: string; name?: string }, options?: { startAt?: '/' | '/sign-in'; waitForName?: boolean }): Promise<void>;
  /** A fresh page signed in as the person. */
  signedInPage(person: Person, options?: { startAt?: '/' | '/sign-in' }): Promise<Page>;
  /** Logs in through the API and returns the access token. */
  token(person: { email: string; password: string }): Promise<string>;
  close(): Promise<void>;
}

/** A full-page screenshot from the top, the viewport as tall as the content so the side bar reaches the bottom. */
export async function saveTallScreenshot(page: Page, name: string, settleMs = 200): Promise<string> {
  const viewport = page.viewportSize()!;
  await page.evaluate(() => window.scrollTo(0, 0));
  const height = await page.evaluate(() => document.documentElement.scrollHeight);
  await page.setViewportSize({ width: viewport.width, height: Math.max(viewport.height, height) });
  await page.waitForTimeout(settleMs);
  try {
    return await saveFullPage(page, name);
  } finally {
    await page.setViewportSize(viewport);
  }
}

export async function startBrowserStack(options: BrowserStackOptions = {}): Promise<BrowserStack> {
  const viewport = options.viewport ?? { width: 1280, height: 800 };
  const cleanups: (() => Promise<void> | void)[] = [];
  const close = async () => {
    // Last started, first stopped; every step runs even if one before it failed.
    for (const cleanup of cleanups.reverse()) {
      try {
        await cleanup();
      } catch (error) {
        console.error('browser stack clean-up failed:', error);
      }
    }
    cleanups.length = 0;
  };
  try {
    const database = await createTestDatabase();
    cleanups.push(() => database.drop());
    const demo = await seedDemoLabForTests(database.db);

    let redisUrl = testEnv.redisUrl;
    if (options.redis === 'own') {
      const redis: TestRedis = await startTestRedis();
      cleanups.push(() => redis.stop());
      redisUrl = redis.url;
    } else if (typeof options.redis === 'number') {
      redisUrl = `${testEnv.redisUrl}/${options.redis}`;
    }

    const env: Record<string, string> = { REDIS_URL: redisUrl, ...options.apiEnv };
    if (options.privateWebDir) {
      const webDir = mkdtempSync(path.join(tmpdir(), 'kiln-web-'));
      cleanups.push(() => rmSync(webDir, { recursive: true, force: true }));
      cpSync('frontend/dist', webDir, { recursive: true });
      env.KILN_WEB_DIR = webDir;
    }
    if (options.beforeApi) {
      const extra = await options.beforeApi({ database, demo });
      if (extra.close) cleanups.push(extra.close);
      Object.assign(env, extra.env);
    }

    const api = await startTestApi(database.url, env);
    cleanups.push(() => api.close());
    const workers: WorkerProcess[] = [];
    cleanups.push(() => stopProcesses(workers));
    for (const worker of options.workers ?? []) {
      workers.push(await startWorker(database.db, { ...worker, databaseUrl: database.url, redisUrl }));
    }
    const browser = await launchBrowser();
    cleanups.push(() => browser.close());

    const newPage = async (contextOptions: BrowserContextOptions = {}) => {
      const context = await browser.newContext({ viewport, ...contextOptions });
      return context.newPage();
    };
    const signIn: BrowserStack['signIn'] = async (page, person, signInOptions = {}) => {
      if (signInOptions.startAt === '/') {
        await page.goto(api.baseUrl);
        await page.waitForURL(/\/sign-in/);
      } else {
        await page.goto(`${api.baseUrl}/sign-in`);
      }
      await page.getByLabel('E-mail').fill(person.email);
      await page.getByLabel('Password').fill(person.password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      if (signInOptions.waitForName !== false && person.name !== undefined) {
        await expect.poll(() => page.getByRole('heading', { level: 1 }).first().textContent(), { timeout: 15_000 }).toContain(person.name);
      }
    };
    const signedInPage: BrowserStack['signedInPage'] = async (person, signInOptions) => {
      const page = await newPage();
      await signIn(page, person, signInOptions);
      return page;
    };
    const token = async (person: { email: string; password: string }) => {
      const login = await api.request('POST', '/api/auth/login', { body: { email: person.email, password: person.password } });
      if (login.status !== 200 && login.status !== 201) throw new Error(`login of ${person.email} failed: ${login.status} ${login.text}`);
      return login.body.accessToken as string;
    };
    return { database, api, browser, demo, redisUrl, workers, newPage, signIn, signedInPage, token, close };
  } catch (error) {
    await close();
    throw error;
  }
}
