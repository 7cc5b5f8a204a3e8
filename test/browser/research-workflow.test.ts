import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { saveScreenshot as saveFullPage } from '../support/browser';
import { saveTallScreenshot, startBrowserStack, type BrowserStack, type Person } from '../support/browser-stack';
import type { DemoCredentials } from '../support/demo-lab';
import type { TestApi } from '../support/test-api';

// The whole research workflow in the browser against the real API, scheduler and
// two real worker processes: build a sweep, watch it finish, read the outcome
// map, follow a running run live, pause it, and fork it as a collaborator.

/** Ball B² → ellipsoid on a coarse grid: α = 0.8π converges and α = 1.5π blows up, each in well under a second. */
const SWEEP_BASE = {
  domain: { kind: 'ball', dim: 2, boundaryAngle: 0.8 * Math.PI },
  target: { kind: 'ellipsoid', axisRatio: 1 },
  initial: { kind: 'identity' },
  grid: { points: 60 },
  time: { tMax: 20, maxStep: 0.05 },
  stop: { tension: 1e-6, gradientBound: 1e5 },
};

/** Ball B² → S² on a fine grid with small steps: runs for tens of seconds, checkpointing as it goes. */
const LONG_SPEC = {
  domain: { kind: 'ball', dim: 2, boundaryAngle: 0.9 * Math.PI },
  target: { kind: 'sphere' },
  initial: { kind: 'identity' },
  grid: { points: 2000 },
  time: { tMax: 15, maxStep: 0.0005, tolerance: 1e-8 },
  stop: { tension: 1e-12 },
};

/** A full-page screenshot from the top of the page (the shell's sticky header and side bar draw where they belong). */
const saveScreenshot = (page: Page, name: string) => saveTallScreenshot(page, name);

describe('the research workflow in the browser', () => {
  let stack: BrowserStack;
  let api: TestApi;
  let demo: DemoCredentials;
  let studyId: string;
  let postdocToken: string;

  beforeAll(async () => {
    // A Redis logical database of this file's own, so no other test file shares its queue.
    stack = await startBrowserStack({
      redis: 7,
      apiEnv: { KILN_SCHEDULER_TICK_MS: '200' },
      workers: ['bench-a', 'bench-b'].map((host) => ({ host, slots: 2, checkpointSeconds: 2 })),
    });
    ({ api, demo } = stack);
    postdocToken = await stack.token(demo.postdoc);
    const studies = await api.request('GET', '/api/studies', { token: postdocToken });
    studyId = studies.body[0].id;
  }, 90_000);

  afterAll(async () => {
    await stack?.close();
  });

  /** A fresh page: the app sends it to the sign-in page, and the person signs in there. */
  const signedInPage = (person: Person) => stack.signedInPage(person, { startAt: '/' });

  async function openBuilder(page: Page, screenshots = false) {
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Studies' }).click();
    await page.getByRole('link', { name: 'Ellipsoid targets past the oscillation threshold' }).waitFor();
    if (screenshots) await saveScreenshot(page, 'studies');
    await page.getByRole('link', { name: 'Ellipsoid targets past the oscillation threshold' }).click();
    await page.getByText('No sweeps in this study yet.').or(page.locator('.sweep-list')).first().waitFor();
    if (screenshots) await saveScreenshot(page, 'study-before-sweep');
    await page.getByRole('button', { name: 'New sweep' }).click();
    await page.getByRole('heading', { name: 'New sweep' }).waitFor().catch(async (e) => {
      await saveFullPage(page, 'debug-new-sweep');
      throw e;
    });
  }

  it('a researcher creates a study; bad values are stopped in the browser with the same messages the API gives', async () => {
    const page = await signedInPage(demo.postdoc);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Studies' }).click();
    await page.getByRole('button', { name: 'New study' }).click();
    await page.getByRole('button', { name: 'Create study' }).click();
    await page.getByText('name is required').waitFor();
    await page.getByLabel('Question').fill('Ball B³ into S³: where does blow-up start in α?');
    await page.getByRole('button', { name: 'Create study' }).click();
    await page.getByRole('heading', { name: 'Ball B³ into S³: where does blow-up start in α?' }).waitFor();
    await page.getByText('No sweeps in this study yet.').waitFor();
    await page.getByText('Owner ·').waitFor();
    await saveScreenshot(page, 'study-new');

    await openBuilder(page);

    // A grid far too coarse: the shared schema's message, and no way to submit.
    await page.getByLabel('Grid points').fill('5');
    const inline = 'grid.points must be an integer from 20 to 20000';
    await page.getByText(inline, { exact: true }).waitFor();
    expect(await page.getByRole('button', { name: /^Submit/ }).isDisabled()).toBe(true);
    await saveScreenshot(page, 'sweep-builder-invalid');
    const points = await api.request('POST', '/api/sweeps/preview', {
      token: postdocToken,
      body: { studyId, base: { ...SWEEP_BASE, grid: { points: 5 } }, axes: [] },
    });
    expect(points.status).toBe(400);
    expect(points.body.details.map((d: { message: string }) => d.message)).toContain(inline);

    // A valid base but an axis value outside the field's range: the run is named, as by the API.
    await page.getByLabel('Grid points').fill('60');
    await page.getByLabel('Values of Axis ratio b').fill('0.001, 2');
    const axes = [{ path: 'target.axisRatio', values: [0.001, 2] }];
    const expansion = await api.request('POST', '/api/sweeps/preview', {
      token: postdocToken,
      body: { studyId, base: { ...SWEEP_BASE, domain: { kind: 'sphere', dim: 3 }, target: { kind: 'ellipsoid', axisRatio: 2.5 }, grid: { points: 60 }, time: { tMax: 50 }, stop: { tension: 1e-8, gradientBound: 1e8 } }, axes },
    });
    expect(expansion.status).toBe(400);
    expect(expansion.body.message).toMatch(/^run 1 \(target\.axisRatio = 0\.001\)/);
    await page.getByText(expansion.body.message, { exact: true }).waitFor();
    expect(await page.getByRole('button', { name: /^Submit/ }).isDisabled()).toBe(true);

    // Text that is not a number never reaches the API.
    await page.getByLabel('Values of Axis ratio b').fill('2, two');
    await page.getByText('"two" is not a number').waitFor();

    // A log range must stay positive: the axis schema's message, in the browser and from the API.
    await page.getByText('Range', { exact: true }).click();
    await page.getByLabel('From').fill('0');
    await page.getByLabel('To', { exact: true }).fill('3');
    await page.getByLabel('Steps').fill('4');
    await page.getByText('Log', { exact: true }).click();
    const logMessage = 'a log range needs from > 0 and to > 0';
    await page.getByText(logMessage, { exact: true }).waitFor();
    const logRange = await api.request('POST', '/api/sweeps/preview', {
      token: postdocToken,
      body: { studyId, base: SWEEP_BASE, axes: [{ path: 'target.axisRatio', range: { from: 0, to: 3, steps: 4, scale: 'log' } }] },
    });
    expect(logRange.status).toBe(400);
    expect(JSON.stringify(logRange.body)).toContain(logMessage);
    await page.getByLabel('From').fill('0.5');
    await expect.poll(() => page.getByTestId('preview-run-count').textContent(), { timeout: 10_000 }).toBe('4');
    await page.getByText('Values', { exact: true }).click();

    // A sweep without a name is not sent.
    await page.getByLabel('Values of Axis ratio b').fill('2, 3');
    await page.getByRole('button', { name: 'Submit 2 runs' }).click();
    await page.getByText('name is required').waitFor();
    expect(page.url()).toMatch(/\/sweeps\/new$/);
    await page.context().close();
  }, 60_000);

  it('a researcher builds a 12-run sweep over axis ratios, watches it finish and reads the outcome map', async () => {
    const page = await signedInPage(demo.postdoc);
    await saveScreenshot(page, 'overview-before-sweep');
    await openBuilder(page, true);

    await page.getByLabel('Name').fill('Ball into ellipsoids: axis ratio × boundary angle');
    await page.getByText('Ball Bᵐ').click();
    await page.getByLabel('Dimension m').fill('2');
    await page.getByLabel('Boundary angle α').fill('0.8π');
    await page.getByLabel('Axis ratio b', { exact: true }).fill('1');
    await page.getByLabel('Grid points').fill('60');
    await page.getByLabel('End time t_max').fill('20');
    await page.getByLabel('Largest step').fill('0.05');
    await page.getByLabel('Tension threshold').fill('1e-6');
    await page.getByLabel('Gradient bound').fill('1e5');
    await page.getByLabel('Values of Axis ratio b').fill('0.5, 1, 1.5, 2, 2.5, 3');
    await page.getByRole('button', { name: 'Add an axis' }).click();
    await page.getByRole('combobox', { name: 'Axis 2 field' }).click();
    await page.keyboard.type('boundaryAngle');
    await page.keyboard.press('Enter');
    await page.getByLabel('Values of Boundary angle α (rad)').fill('0.8π, 1.5π');

    // The live preview: 12 runs and a rough CPU estimate against the quota.
    await expect.poll(() => page.getByTestId('preview-run-count').textContent(), { timeout: 10_000 }).toBe('12');
    await expect.poll(() => page.getByTestId('preview-cpu-hours').textContent(), { timeout: 10_000 }).toMatch(/≈ .*CPU-(s|min|h)/);
    await page.getByText('The CPU estimate is rough').waitFor();
    await page.getByRole('img', { name: 'Initial profile h₀(r)' }).waitFor();
    await saveScreenshot(page, 'sweep-builder');

    await page.getByRole('button', { name: 'Submit 12 runs' }).click();
    await page.waitForURL(/\/sweeps\/[0-9a-f-]{36}$/);
    await page.getByRole('heading', { name: 'Ball into ellipsoids: axis ratio × boundary angle' }).waitFor();
    await expect
      .poll(() => page.locator('.state-bar__done').first().textContent(), { timeout: 90_000, intervals: [500] })
      .toBe('12 of 12 done');

    // Every cell has an outcome: both converged and blow-up cells are on the map.
    const count = async (kind: string) => Number(await page.getByTestId(`map-count-${kind}`).textContent());
    await expect.poll(() => count('pending'), { timeout: 15_000 }).toBe(0);
    const converged = await count('converged');
    const blowup = await count('blowup');
    expect(converged).toBeGreaterThan(0);
    expect(blowup).toBeGreaterThan(0);
    expect(converged + blowup + (await count('other'))).toBe(12);
    // The table says the same, with words beside the icons.
    await page.getByRole('cell', { name: 'Blow-up' }).first().waitFor();
    await page.getByRole('cell', { name: 'Converged' }).first().waitFor();
    await saveScreenshot(page, 'sweep-page');

    // The results as CSV: a header and one row per run.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Results (CSV)' }).click()]);
    expect(download.suggestedFilename()).toMatch(/results\.csv$/);
    const csv = readFileSync((await download.path())!, 'utf8').trim().split(/\r?\n/);
    expect(csv).toHaveLength(13);
    const outcomeColumn = csv[0]!.split(',').indexOf('outcome');
    expect(outcomeColumn).toBeGreaterThan(0);
    expect(csv.slice(1).filter((row) => row.split(',')[outcomeColumn] === 'blowup')).toHaveLength(blowup);

    // A cell opens its run: α = 1.5π (top row) with axis ratio 1 (second column) blew up.
    const map = page.getByTestId('outcome-map').locator('.chart');
    await map.scrollIntoViewIfNeeded();
    const box = (await map.boundingBox())!;
    const grid = { left: 84, right: 16, top: 16, bottom: 56 };
    const x = box.x + grid.left + 1.5 * ((box.width - grid.left - grid.right) / 6);
    const y = box.y + grid.top + 0.5 * ((box.height - grid.top - grid.bottom) / 2);
    await page.mouse.click(x, y);
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
    await page.getByText('A blow-up call is numerical evidence, not a proof').waitFor();
    await page.getByTestId('blowup-T').waitFor().catch(async (e) => {
      await saveFullPage(page, 'debug-run-blowup');
      throw e;
    });
    await page.getByText('1.5π').first().waitFor();
    await page.getByText('Profile snapshots h(r)').waitFor();
    await page.getByRole('img', { name: /Profile h\(r\) at checkpoint/ }).waitFor({ timeout: 10_000 });
    await saveScreenshot(page, 'run-blowup');

    await page.locator('.page-crumbs').getByRole('link', { name: 'Ellipsoid targets past the oscillation threshold' }).click();
    await page.getByRole('link', { name: 'Ball into ellipsoids: axis ratio × boundary angle' }).waitFor();
    await page.getByText('12 of 12 done').first().waitFor();
    await saveScreenshot(page, 'study');

    await page.getByRole('link', { name: 'Overview', exact: true }).click();
    const singularities = page.locator('.panel', { has: page.getByText('Possible singularities', { exact: true }) });
    await singularities.getByRole('cell', { name: 'Blow-up' }).first().waitFor({ timeout: 10_000 });
    await page.getByRole('tab', { name: /Recently finished \(12\)/ }).click();
    await saveScreenshot(page, 'overview-after-sweep');
    await page.context().close();
  }, 150_000);

  it('a running run updates its plots live, is paused, and a collaborator forks it with a finer grid', async () => {
    const created = await api.request('POST', '/api/sweeps', {
      token: postdocToken,
      body: { studyId, name: 'One long run', base: LONG_SPEC, axes: [] },
    });
    expect(created.status).toBe(201);
    const runs = await api.request('GET', `/api/sweeps/${created.body.id}/runs`, { token: postdocToken });
    const runId: string = runs.body.items[0].id;

    const page = await signedInPage(demo.postdoc);
    await page.goto(`${api.baseUrl}/runs/${runId}`);
    await page.getByText('Diagnostics').waitFor();
    await page.evaluate(() => ((window as unknown as { kilnMarker: string }).kilnMarker = 'same document'));
    await page.getByText('Live', { exact: true }).waitFor({ timeout: 20_000 });

    const samples = async () => Number((await page.getByTestId('metric-charts').getAttribute('data-samples').catch(() => '0')) ?? 0);
    const plotted = async () => Number((await page.getByRole('img', { name: 'Energy over time' }).getAttribute('data-points').catch(() => '0')) ?? 0);
    await expect.poll(samples, { timeout: 30_000 }).toBeGreaterThan(0);
    const first = await plotted();
    await expect.poll(plotted, { timeout: 20_000 }).toBeGreaterThan(first);
    await expect.poll(samples, { timeout: 20_000 }).toBeGreaterThan(first);
    // Same document: the plots grew without a reload.
    expect(await page.evaluate(() => (window as unknown as { kilnMarker?: string }).kilnMarker)).toBe('same document');
    await page.getByRole('button', { name: /Fork from checkpoint/ }).first().waitFor({ timeout: 20_000 });
    await saveScreenshot(page, 'run-live');

    await page.getByRole('button', { name: 'Pause' }).click();
    await page.locator('.run-title').getByText('Paused').waitFor({ timeout: 30_000 });
    await page.getByRole('button', { name: 'Resume', exact: true }).waitFor();
    await page.context().close();

    // The collaborator forks the paused run from its last checkpoint with a finer grid.
    const collaborator = await signedInPage(demo.collaborator);
    await collaborator.goto(`${api.baseUrl}/runs/${runId}`);
    await collaborator
      .getByRole('button', { name: /Fork from checkpoint/ })
      .first()
      .click()
      .catch(async (e) => {
        await saveFullPage(collaborator, 'debug-collaborator-run');
        throw e;
      });
    const dialog = collaborator.getByRole('dialog');
    await dialog.getByLabel('Grid points').fill('5');
    await dialog.getByText('grid.points must be an integer from 20 to 20000').waitFor();
    await dialog.getByLabel('Grid points').fill('2400');
    await saveScreenshot(collaborator, 'fork-dialog');
    await dialog.getByRole('button', { name: 'Start the fork' }).click();
    await collaborator.waitForURL((url) => /\/runs\/[0-9a-f-]{36}$/.test(url.pathname) && !url.pathname.endsWith(runId));
    const link = collaborator.getByTestId('parent-link');
    await link.waitFor({ timeout: 10_000 });
    expect(await link.textContent()).toContain(runId.slice(0, 8));
    await collaborator.getByText('2400 points').first().waitFor();

    const forkId = collaborator.url().split('/').pop()!;
    const fork = await api.request('GET', `/api/runs/${forkId}`, { token: postdocToken });
    expect(fork.body.parentRunId).toBe(runId);
    expect(fork.body.spec.grid.points).toBe(2400);
    await saveScreenshot(collaborator, 'run-fork');

    // The parent link leads back to the parent run.
    await link.getByRole('link').click();
    await collaborator.waitForURL((url) => url.pathname.endsWith(runId));
    await collaborator.getByText('Checkpoints').first().waitFor();
    await collaborator.context().close();
  }, 150_000);
});
