import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { saveScreenshot as saveFullPage } from '../support/browser';
import { saveTallScreenshot, startBrowserStack, type BrowserStack, type Person } from '../support/browser-stack';
import type { DemoCredentials } from '../support/demo-lab';
import { waitFor } from '../support/ports';
import type { TestApi } from '../support/test-api';
import type { TestDatabase } from '../support/test-database';

// Triage of a possible singularity in the browser against the real API, scheduler
// and a real worker: the queue, the candidate's evidence plots, a verdict, and a
// finer fork in one click with its comparison.

/** Ball B² → S² with h₀ = 1.5π·r: blows up within seconds (numerics.md §4). */
const BLOWUP_SPEC = {
  domain: { kind: 'ball', dim: 2, boundaryAngle: 1.5 * Math.PI },
  target: { kind: 'sphere' },
  initial: { kind: 'identity' },
  grid: { points: 200 },
  time: { tMax: 50, maxStep: 1 },
  stop: { tension: 1e-8, gradientBound: 1e8 },
};

/** A full-page screenshot from the top, the viewport as tall as the content so the side bar reaches the bottom. */
const saveScreenshot = (page: Page, name: string) => saveTallScreenshot(page, name, 300);

describe('blow-up candidates in the browser', () => {
  let stack: BrowserStack;
  let database: TestDatabase;
  let api: TestApi;
  let demo: DemoCredentials;
  let runId: string;
  let candidateId: string;

  beforeAll(async () => {
    // Its own redis-server and its own copy of the built app (a rebuild of frontend/dist
    // by someone else during the run cannot swap the lazily loaded pages' files away).
    stack = await startBrowserStack({
      redis: 'own',
      privateWebDir: true,
      apiEnv: { KILN_SCHEDULER_TICK_MS: '100' },
      workers: [{ host: 'bench-c', slots: 2, checkpointSeconds: 1 }],
      viewport: { width: 1360, height: 860 },
    });
    ({ database, api, demo } = stack);

    // The study's owner launches a one-run sweep that blows up; the scanner flags it.
    const token = await stack.token(demo.postdoc);
    const studyId = (await api.request('GET', '/api/studies', { token })).body[0].id;
    const sweep = await api.request('POST', '/api/sweeps', { token, body: { studyId, name: 'B² at 1.5π', base: BLOWUP_SPEC, axes: [] } });
    expect(sweep.status, sweep.text).toBe(201);
    runId = (await database.db.selectFrom('runs').select('id').where('sweep_id', '=', sweep.body.id).executeTakeFirstOrThrow()).id;
    const candidate = await waitFor('a candidate for the blow-up run', () =>
      database.db.selectFrom('candidates').select('id').where('run_id', '=', runId).executeTakeFirst(), 60_000);
    candidateId = candidate.id;
    // Its evidence is final once the run has ended.
    await waitFor('the run to end', async () => {
      const run = await database.db.selectFrom('runs').select('state').where('id', '=', runId).executeTakeFirstOrThrow();
      return ['finished', 'failed'].includes(run.state) ? run : undefined;
    }, 60_000);
  }, 120_000);

  afterAll(async () => {
    await stack?.close();
  });

  const signedInPage = (person: Person) => stack.signedInPage(person);

  it('a researcher opens the queue, reads a candidate\'s evidence, records a verdict and forks a finer run', async () => {
    const page = await signedInPage(demo.researcher);
    // The overview lists it among the new candidates.
    await page.locator('.candidate-mini-list').getByRole('link', { name: `Run ${runId.slice(0, 8)}` }).waitFor({ timeout: 15_000 });
    await saveScreenshot(page, 'overview-new-candidates');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Candidates' }).click();
    await page.getByRole('heading', { name: 'Blow-up candidates' }).waitFor();
    const row = page.locator('.candidates-table tr', { hasText: runId.slice(0, 8) });
    await row.waitFor({ timeout: 15_000 });
    expect(await row.textContent()).toContain('Awaiting verdict');
    expect(await row.textContent()).toMatch(/±/);
    expect(await page.getByText('A blow-up call is numerical evidence, not a proof').count()).toBeGreaterThan(0);
    await saveScreenshot(page, 'candidates-queue');

    // Filtering by a verdict nobody gave empties the queue and says what to do.
    await page.getByLabel('Filter by verdict').click();
    await page.locator('.ant-select-item-option', { hasText: 'Confirmed singularity' }).click();
    await page.getByText('No candidate matches these filters.').waitFor();
    await page.getByLabel('Filter by verdict').click();
    await page.locator('.ant-select-item-option', { hasText: 'Any verdict' }).click();
    await row.waitFor();

    await row.getByRole('link', { name: `Candidate of run ${runId.slice(0, 8)}` }).click();
    await page.waitForURL(new RegExp(`/candidates/${candidateId}$`));
    await page.getByTestId('candidate-run-link').waitFor();
    // The three evidence plots, each with data.
    const plots = page.getByTestId('evidence-plots').getByRole('img');
    await expect.poll(() => plots.count(), { timeout: 15_000 }).toBe(3);
    for (const name of ['max|∇u| against T̂ − t', 'Rescaled profiles', 'History of max|∇u| and tension']) {
      const chart = page.getByRole('img', { name: new RegExp(name.replace(/[|()]/g, '\\$&')) });
      expect(Number(await chart.getAttribute('data-points')), name).toBeGreaterThan(0);
    }
    const facts = await page.getByTestId('evidence-facts').textContent();
    expect(facts).toContain('Blow-up time T̂');
    expect(facts).toContain('cells within λ');
    expect(await page.getByText('Numerical evidence, to be confirmed').count()).toBe(1);
    await saveScreenshot(page, 'candidate-evidence');

    // A verdict with a note, kept and audited.
    await page.getByRole('radio', { name: 'Needs a finer run' }).check();
    await page.getByLabel('Note').fill('Only 200 points; λ followed to a few cells.');
    await page.getByRole('button', { name: 'Record verdict' }).click();
    await page.getByText('Verdict recorded: needs a finer run.').waitFor();
    await page.locator('.page-header').getByText('Needs a finer run').waitFor();
    const stored = await database.db.selectFrom('candidates').select(['verdict', 'verdict_note']).where('id', '=', candidateId).executeTakeFirstOrThrow();
    expect(stored).toEqual({ verdict: 'needs-finer-run', verdict_note: 'Only 200 points; λ followed to a few cells.' });
    expect(await database.db.selectFrom('audit_log').select('id').where('action', '=', 'candidate.verdict').where('subject_id', '=', candidateId).executeTakeFirst()).toBeTruthy();

    // Fork finer in one click: the finer run is linked, and once it ends the two are compared.
    await page.getByRole('button', { name: 'Fork finer' }).click();
    const finerLink = page.getByTestId('finer-run-link').getByRole('link');
    await finerLink.waitFor({ timeout: 15_000 });
    const finer = await database.db.selectFrom('candidates').select('finer_run_id').where('id', '=', candidateId).executeTakeFirstOrThrow();
    expect(finer.finer_run_id).toBeTruthy();
    expect(await finerLink.getAttribute('href')).toBe(`/runs/${finer.finer_run_id}`);
    const finerSpec = (await database.db.selectFrom('runs').select('spec').where('id', '=', finer.finer_run_id!).executeTakeFirstOrThrow()).spec as { grid: { points: number } };
    expect(finerSpec.grid.points).toBe(400);
    const comparison = page.getByTestId('finer-comparison');
    await comparison.getByText(/agree|disagree|did not blow up/).waitFor({ timeout: 90_000 });
    await saveScreenshot(page, 'candidate-finer');

    await finerLink.click();
    await page.waitForURL(new RegExp(`/runs/${finer.finer_run_id}$`));
    await page.getByTestId('parent-link').waitFor().catch(async (e) => {
      await saveFullPage(page, 'debug-finer-run');
      throw e;
    });
    await page.context().close();
  });

  it('a member exports the run\'s data, uploads its checkpoint file and resumes it as a new run in the study', async () => {
    const page = await signedInPage(demo.researcher);
    await page.goto(`${api.baseUrl}/runs/${runId}`);
    const exports = page.locator('.ant-card', { hasText: 'for your own analysis' });
    await exports.getByRole('button', { name: 'Profile (.npy)' }).waitFor({ timeout: 15_000 });

    const download = async (button: string) => {
      const [file] = await Promise.all([page.waitForEvent('download'), exports.getByRole('button', { name: button }).click()]);
      const path = await file.path();
      return { name: file.suggestedFilename(), path, bytes: readFileSync(path) };
    };
    const metrics = await download('Metrics (CSV)');
    expect(metrics.name).toMatch(/-metrics\.csv$/);
    expect(metrics.bytes.toString('utf8').split('\n')[0]).toContain('gradMax');
    const npy = await download('Profile (.npy)');
    expect(npy.bytes.subarray(0, 6).toString('latin1')).toBe('\x93NUMPY');
    const checkpoint = await download('Checkpoint file');
    expect(checkpoint.name).toMatch(/\.kcp$/);
    await saveScreenshot(page, 'run-exports');

    // Brought back as an upload and resumed in the study, as a collaborator elsewhere would.
    await page.locator('.shell__user').getByRole('link', { name: demo.researcher.name }).click();
    await page.getByRole('heading', { name: 'Your account' }).waitFor();
    await page.getByLabel('Kind of upload').click();
    await page.locator('.ant-select-item-option', { hasText: 'Checkpoint file' }).click();
    await page.getByLabel('File to upload').setInputFiles({ name: checkpoint.name, mimeType: 'application/octet-stream', buffer: checkpoint.bytes });
    await page.getByRole('button', { name: 'Upload', exact: true }).click();
    await page.getByText(`${checkpoint.name} uploaded and checked`).first().waitFor({ timeout: 15_000 });
    const row = page.locator('.uploads-table tr', { hasText: checkpoint.name });
    await row.getByRole('button', { name: 'Resume this checkpoint' }).click();
    const resumed = row.getByRole('link');
    await resumed.waitFor({ timeout: 15_000 });
    await saveScreenshot(page, 'account-resumed-upload');
    await resumed.click();
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
    const newRunId = page.url().split('/').pop()!;
    expect(newRunId).not.toBe(runId);
    const stored = await database.db.selectFrom('runs').select(['study_id', 'owner_id']).where('id', '=', newRunId).executeTakeFirstOrThrow();
    const researcher = await database.db.selectFrom('users').select('id').where('email', '=', demo.researcher.email).executeTakeFirstOrThrow();
    expect(stored.owner_id).toBe(researcher.id);
    await page.context().close();
  });

  it('a viewer in the study reads the evidence but sees the verdict form disabled, with the reason', async () => {
    const collaborator = await database.db.selectFrom('users').select('id').where('email', '=', demo.collaborator.email).executeTakeFirstOrThrow();
    await database.db.updateTable('study_members').set({ role: 'viewer' }).where('user_id', '=', collaborator.id).execute();
    const page = await signedInPage(demo.collaborator);
    await page.goto(`${api.baseUrl}/candidates/${candidateId}`);
    await page.getByText('You are a viewer in this study').first().waitFor({ timeout: 15_000 });
    expect(await page.getByRole('button', { name: 'Record verdict' }).isDisabled()).toBe(true);
    expect(await page.getByRole('radio', { name: 'Confirmed singularity' }).isDisabled()).toBe(true);
    await saveScreenshot(page, 'candidate-viewer');
    await page.context().close();
  });
});
