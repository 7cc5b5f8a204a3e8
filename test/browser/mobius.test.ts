import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, saveScreenshot as saveFullPage } from '../support/browser';
import { seedDemoLabForTests, type DemoCredentials } from '../support/demo-lab';
import { waitFor } from '../support/ports';
import { startTestRedis, type TestRedis } from '../support/redis-server';
import { startTestApi, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { startWorker, stopProcesses, type WorkerProcess } from '../support/worker-harness';

// Möbius diagnostics in the browser against the real API, scheduler and a real
// worker: σ(t) and X(t), the energy profile F(s) of a checkpoint with s*, the
// experimental jump to the maximiser (a new run with its badge and parent link),
// and the re-centring record of a normalized run.

/**
 * The built web app copied once for this file, so a rebuild of frontend/dist by
 * someone else during the run cannot swap the lazily loaded pages' files away.
 */
function snapshotWebApp(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'kiln-web-'));
  cpSync('frontend/dist', dir, { recursive: true });
  return dir;
}

/** S³ → S³ from the non-symmetric perturbation h₀ = r + 0.2·sin r, on the whole sphere: about a second of CPU. */
const STANDARD_SPEC = {
  domain: { kind: 'sphere', dim: 3 },
  target: { kind: 'sphere' },
  flow: 'standard',
  symmetry: 'none',
  initial: { kind: 'perturbed', amplitude: 0.2, mode: 1 },
  grid: { points: 120 },
  time: { tMax: 1, maxStep: 0.05 },
  stop: { tension: 1e-8, gradientBound: 1e8 },
};
const NORMALIZED_SPEC = { ...STANDARD_SPEC, flow: 'normalized' };
/** S² → S²: the Dirichlet energy is conformally invariant, so F(s) is constant (numerics.md §4, item 3). */
const TWO_D_SPEC = { ...STANDARD_SPEC, domain: { kind: 'sphere', dim: 2 }, time: { tMax: 0.2, maxStep: 0.05 } };

/** A full-page screenshot from the top, the viewport as tall as the content so the side bar reaches the bottom. */
async function saveScreenshot(page: Page, name: string) {
  const viewport = page.viewportSize()!;
  await page.evaluate(() => window.scrollTo(0, 0));
  const height = await page.evaluate(() => document.documentElement.scrollHeight);
  await page.setViewportSize({ width: viewport.width, height: Math.max(viewport.height, height) });
  await page.waitForTimeout(300);
  try {
    return await saveFullPage(page, name);
  } finally {
    await page.setViewportSize(viewport);
  }
}

/** Reads a number as the app prints it (1.2e−8 with a typographic minus). */
const readNumber = (text: string | null) => Number((text ?? '').replace(/−/g, '-').replace(/\s.*$/, ''));

describe('Möbius diagnostics in the browser', () => {
  let database: TestDatabase;
  let redis: TestRedis;
  let api: TestApi;
  let browser: Browser;
  let webDir: string;
  let demo: DemoCredentials;
  let token: string;
  let standardId: string;
  let normalizedId: string;
  let twoDId: string;
  const workers: WorkerProcess[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    demo = await seedDemoLabForTests(database.db);
    redis = await startTestRedis();
    webDir = snapshotWebApp();
    api = await startTestApi(database.url, { REDIS_URL: redis.url, KILN_SCHEDULER_TICK_MS: '100', KILN_WEB_DIR: webDir });
    workers.push(await startWorker(database.db, { databaseUrl: database.url, redisUrl: redis.url, host: 'bench-m', slots: 2, checkpointSeconds: 1 }));
    browser = await launchBrowser();

    const login = await api.request('POST', '/api/auth/login', { body: { email: demo.postdoc.email, password: demo.postdoc.password } });
    token = login.body.accessToken;
    const studyId = (await api.request('GET', '/api/studies', { token })).body[0].id;
    const launch = async (name: string, base: object) => {
      const sweep = await api.request('POST', '/api/sweeps', { token, body: { studyId, name, base, axes: [] } });
      expect(sweep.status, sweep.text).toBe(201);
      return (await database.db.selectFrom('runs').select('id').where('sweep_id', '=', sweep.body.id).executeTakeFirstOrThrow()).id;
    };
    standardId = await launch('S³ perturbed, standard flow', STANDARD_SPEC);
    normalizedId = await launch('S³ perturbed, normalized flow', NORMALIZED_SPEC);
    twoDId = await launch('S² perturbed, standard flow', TWO_D_SPEC);
    for (const id of [standardId, normalizedId, twoDId]) {
      const ended = await waitFor(`run ${id} to end`, async () => {
        const run = await database.db.selectFrom('runs').select(['state', 'error']).where('id', '=', id).executeTakeFirstOrThrow();
        return ['finished', 'failed'].includes(run.state) ? run : undefined;
      }, 40_000);
      expect(ended, `run ${id}`).toEqual({ state: 'finished', error: null });
    }
  }, 90_000);

  afterAll(async () => {
    await browser?.close();
    await stopProcesses(workers);
    await api?.close();
    await redis?.stop();
    await database?.drop();
    if (webDir) rmSync(webDir, { recursive: true, force: true });
  });

  async function signedInPage(): Promise<Page> {
    const context = await browser.newContext({ viewport: { width: 1360, height: 860 } });
    const page = await context.newPage();
    // A stuck wait fails with its own message well inside the test's time limit.
    page.setDefaultTimeout(15_000);
    await page.goto(`${api.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill(demo.postdoc.email);
    await page.getByLabel('Password').fill(demo.postdoc.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).first().textContent(), { timeout: 15_000 }).toContain(demo.postdoc.name);
    return page;
  }

  it('the standard run shows σ = 0 and a drifting X, the energy profile with s*, and the experimental jump starts a marked fork', async () => {
    const checkpoints = (await api.request('GET', `/api/runs/${standardId}/checkpoints`, { token })).body as { id: string; seq: number }[];
    expect(checkpoints.length).toBeGreaterThan(0);
    const last = checkpoints[checkpoints.length - 1]!;
    const profile = await api.request('GET', `/api/checkpoints/${last.id}/dilation-profile`, { token });
    expect(profile.status, profile.text).toBe(200);

    const page = await signedInPage();
    try {
      await standardRunChecks(page, last, profile.body);
    } catch (error) {
      await saveFullPage(page, 'debug-mobius-standard');
      throw error;
    } finally {
      await page.context().close();
    }
  }, 60_000);

  async function standardRunChecks(page: Page, last: { id: string; seq: number }, profile: { profile: unknown[]; sStar: number; gap: number }) {
    await page.goto(`${api.baseUrl}/runs/${standardId}`);
    await page.locator('.run-title').getByText('Finished').waitFor({ timeout: 15_000 });

    // σ and X over time: the standard flow has σ = 0 and says so.
    await page.getByText('Standard flow', { exact: true }).waitFor();
    expect(Number(await page.getByRole('img', { name: 'Sigma over time' }).getAttribute('data-points'))).toBeGreaterThan(1);
    expect(Number(await page.getByRole('img', { name: 'Center X over time' }).getAttribute('data-points'))).toBeGreaterThan(1);
    await page.getByText('σ is 0 throughout and X is free to drift', { exact: false }).waitFor();

    // The energy profile of the latest checkpoint: F(s) on a log axis, s* and the gap as numbers.
    const chart = page.getByRole('img', { name: `Energy profile F(s) of checkpoint ${last.seq}, s on a log scale` });
    await chart.waitFor({ timeout: 20_000 });
    expect(Number(await chart.getAttribute('data-points'))).toBe(profile.profile.length);
    const sStar = readNumber(await page.getByTestId('dilation-sstar').textContent());
    expect(Math.abs(sStar - profile.sStar)).toBeLessThan(1e-4 * profile.sStar);
    const gap = readNumber(await page.getByTestId('dilation-gap').textContent());
    expect(Math.abs(gap - profile.gap)).toBeLessThanOrEqual(1e-3 * Math.abs(profile.gap) + 1e-12);
    await page.getByText('not a step of any flow', { exact: false }).first().waitFor();
    await saveScreenshot(page, 'mobius-standard-run');

    // The experimental jump: a confirmation, then the new run with its badge and parent link.
    await page.getByRole('button', { name: 'Experimental: jump to the maximiser…' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByText('Start an experimental run from').waitFor();
    // The parent ran to t_max = 1 and the jump keeps t, so the new run is offered as much time again.
    expect(await dialog.getByLabel('End time t_max of the new run').inputValue()).toBe('2');
    await saveScreenshot(page, 'mobius-jump-confirm');
    await dialog.getByRole('button', { name: 'Start the experimental run' }).click();
    await page.waitForURL((url) => /\/runs\/[0-9a-f-]{36}$/.test(url.pathname) && !url.pathname.endsWith(standardId), { timeout: 15_000 });
    const jumpedId = page.url().split('/').pop()!;
    const badge = page.getByTestId('experimental-origin');
    await badge.waitFor({ timeout: 10_000 });
    await expect.poll(() => badge.getByTestId('parent-link').textContent(), { timeout: 10_000 }).toContain(`checkpoint #${last.seq}`);
    const badgeText = (await badge.textContent()) ?? '';
    expect(badgeText).toContain('Experimental: started from h∘γs* of checkpoint');
    expect(badgeText).toContain(`run ${standardId.slice(0, 8)}`);

    const jumped = await api.request('GET', `/api/runs/${jumpedId}`, { token });
    expect(jumped.body.parentRunId).toBe(standardId);
    expect(jumped.body.parentCheckpointId).toBe(last.id);
    expect(jumped.body.origin).toMatchObject({ kind: 'dilation-jump', experimental: true });
    expect(jumped.body.origin.sStar).toBeCloseTo(profile.sStar, 10);
    expect(jumped.body.spec.time.tMax).toBe(2);
    expect(jumped.body.spec.flow).toBe('standard');
    // It runs on from the jumped state: its σ/X plots fill in, and it ends.
    await page.locator('.run-title').getByText('Finished').waitFor({ timeout: 30_000 });
    await expect.poll(async () => Number(await page.getByRole('img', { name: 'Center X over time' }).getAttribute('data-points').catch(() => '0')), { timeout: 10_000 }).toBeGreaterThan(1);
    await saveScreenshot(page, 'mobius-jumped-run');

    // The parent link leads back.
    await badge.getByRole('link', { name: standardId.slice(0, 8) }).click();
    await page.waitForURL((url) => url.pathname.endsWith(standardId));
    await page.getByTestId('dilation-profile-panel').waitFor();
  }

  it('the normalized run shows σ(t), X at round-off and its re-centring record; the jump is not offered there', async () => {
    const run = (await api.request('GET', `/api/runs/${normalizedId}`, { token })).body;
    expect(run.summary.recentre).toBeTruthy();

    const page = await signedInPage();
    try {
      await normalizedRunChecks(page, run.summary.recentre.s);
    } catch (error) {
      await saveFullPage(page, 'debug-mobius-normalized');
      throw error;
    } finally {
      await page.context().close();
    }
  }, 40_000);

  async function normalizedRunChecks(page: Page, recentreS: number) {
    await page.goto(`${api.baseUrl}/runs/${normalizedId}`);
    await page.locator('.run-title').getByText('Finished').waitFor({ timeout: 15_000 });
    await page.getByText('Normalized flow', { exact: true }).waitFor();
    const trajectory = page.getByTestId('mobius-trajectory');
    await trajectory.waitFor();
    expect(Number(await page.getByRole('img', { name: 'Sigma over time' }).getAttribute('data-points'))).toBeGreaterThan(1);
    expect(Number(await page.getByRole('img', { name: 'Center X over time' }).getAttribute('data-points'))).toBeGreaterThan(1);

    const record = page.getByTestId('recentre-record');
    await record.getByText('Re-centring of the initial data').waitFor();
    const s = readNumber(await record.getByTestId('recentre-s').textContent());
    expect(Math.abs(s - recentreS)).toBeLessThan(1e-5 * Math.abs(recentreS));
    expect(await record.textContent()).toContain('σ(0)');
    expect(await record.textContent()).toContain('Energy before → after');

    // The profile is there too, but the jump is refused for the normalized flow, with the reason.
    await page.getByRole('img', { name: /Energy profile F\(s\) of checkpoint/ }).waitFor({ timeout: 20_000 });
    expect(await page.getByRole('button', { name: 'Experimental: jump to the maximiser…' }).isDisabled()).toBe(true);
    await page.getByText('Not offered for the normalized flow', { exact: false }).waitFor();
    await saveScreenshot(page, 'mobius-normalized-run');
  }

  it('in dimension 2 the profile is a flat line and says why (conformal invariance), without magnifying grid error', async () => {
    const checkpoints = (await api.request('GET', `/api/runs/${twoDId}/checkpoints`, { token })).body as { id: string; seq: number }[];
    const last = checkpoints[checkpoints.length - 1]!;
    const profile = (await api.request('GET', `/api/checkpoints/${last.id}/dilation-profile`, { token })).body as { profile: [number, number][] };
    const values = profile.profile.map(([, f]) => f);
    // Flat up to grid error: under the 1% the panel calls flat, and far under the 5% the F axis always spans.
    expect((Math.max(...values) - Math.min(...values)) / Math.max(...values)).toBeLessThan(0.01);

    const page = await signedInPage();
    try {
      await page.goto(`${api.baseUrl}/runs/${twoDId}`);
      await page.getByRole('img', { name: /Energy profile F\(s\) of checkpoint/ }).waitFor({ timeout: 20_000 });
      await page.getByText('F(s) is flat to within', { exact: false }).waitFor();
      await page.getByText('In dimension 2 the Dirichlet energy is conformally invariant', { exact: false }).waitFor();
      await saveScreenshot(page, 'mobius-two-dimensional-run');
    } catch (error) {
      await saveFullPage(page, 'debug-mobius-two-d');
      throw error;
    } finally {
      await page.context().close();
    }
  }, 30_000);
});
