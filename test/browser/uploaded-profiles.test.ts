import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { saveTallScreenshot, startBrowserStack, type BrowserStack } from '../support/browser-stack';

// Uploaded profiles in the sweep builder, against the real API, scheduler and a
// real worker: an initial profile h₀ (CSV r,h) and a target hypersurface
// (CSV h,f,z) uploaded through the API, chosen in the builder, and a run of them
// that converges.

const ROWS = 200;
const nodes = Array.from({ length: ROWS }, (_, i) => (i === ROWS - 1 ? Math.PI : (i * Math.PI) / (ROWS - 1)));
/** h₀ = r on [0, π]: the identity, as a table. */
const INITIAL_CSV = ['r,h', ...nodes.map((r) => `${r},${r}`)].join('\n');
/** The ellipsoid f = sin h, z = 1.5 cos h, with f exactly 0 at both poles. */
const TARGET_CSV = ['h,f,z', ...nodes.map((h, i) => `${h},${i === 0 || i === ROWS - 1 ? 0 : Math.sin(h)},${1.5 * Math.cos(h)}`)].join('\n');

describe('uploaded profiles in the sweep builder', () => {
  let stack: BrowserStack;
  let token: string;

  beforeAll(async () => {
    stack = await startBrowserStack({
      redis: 'own',
      privateWebDir: true,
      apiEnv: { KILN_SCHEDULER_TICK_MS: '100' },
      workers: [{ host: 'bench-u', slots: 1 }],
    });
    token = await stack.token(stack.demo.postdoc);
  }, 90_000);

  afterAll(async () => {
    await stack?.close();
  });

  async function upload(kind: string, csv: string, filename: string) {
    const form = new FormData();
    form.set('kind', kind);
    form.set('file', new Blob([csv]), filename);
    const response = await fetch(`${stack.api.baseUrl}/api/uploads`, { method: 'POST', headers: { authorization: `Bearer ${token}` }, body: form });
    const body = await response.json();
    expect(response.status, JSON.stringify(body)).toBe(201);
    return body as { id: string };
  }

  it('a researcher chooses an uploaded h₀ table and an uploaded target profile; the one-run sweep converges', async () => {
    const page = await stack.signedInPage(stack.demo.postdoc);
    const openBuilder = async () => {
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Studies' }).click();
      await page.getByRole('link', { name: 'Ellipsoid targets past the oscillation threshold' }).click();
      await page.getByRole('button', { name: 'New sweep' }).click();
      await page.getByRole('heading', { name: 'New sweep' }).waitFor();
    };

    // Nothing uploaded yet: the builder says where uploads are made.
    await openBuilder();
    await page.getByText('Profile (uploaded)').click();
    await page.getByText('No uploads yet — upload a profile on your').waitFor();
    await page.getByRole('link', { name: 'Account page' }).waitFor();
    expect(await page.getByRole('button', { name: /^Submit/ }).isDisabled()).toBe(true);

    const initial = await upload('initial-profile', INITIAL_CSV, 'identity-h0.csv');
    const target = await upload('target-profile', TARGET_CSV, 'ellipsoid-1.5.csv');

    // The builder lists them: the target profile, and the initial profile for the sphere.
    await page.reload();
    await page.getByRole('heading', { name: 'New sweep' }).waitFor();
    await page.getByLabel('Name').fill('Uploaded h₀ into an uploaded ellipsoid');
    await page.getByLabel('Dimension m').fill('3');
    await page.getByText('Profile (uploaded)').click();
    await page.getByRole('combobox', { name: 'Target profile' }).click();
    await page.locator('.ant-select-item-option', { hasText: /ellipsoid-1\.5\.csv · 200 rows/ }).click();
    await page.getByRole('combobox', { name: 'Initial data h₀' }).click();
    await page.locator('.ant-select-item-option', { hasText: 'Table (uploaded)' }).click();
    await page.getByRole('combobox', { name: 'Initial profile for the sphere' }).click();
    await page.locator('.ant-select-item-option', { hasText: /identity-h0\.csv · 200 rows/ }).click();
    await page.getByText('h₀ from your table (200 rows)').waitFor();

    await page.getByRole('button', { name: 'Remove axis 1' }).click();
    await page.getByLabel('Grid points').fill('80');
    await page.getByLabel('End time t_max').fill('100');
    await page.getByLabel('Largest step').fill('0.5');
    await page.getByLabel('Tension threshold').fill('1e-7');
    await expect.poll(() => page.getByTestId('preview-run-count').textContent(), { timeout: 10_000 }).toBe('1');
    await saveTallScreenshot(page, 'sweep-builder-uploaded-profiles');

    await page.getByRole('button', { name: 'Submit 1 run' }).click();
    await page.waitForURL(/\/sweeps\/[0-9a-f-]{36}$/);
    const sweepId = page.url().split('/').pop()!;
    await page.getByRole('heading', { name: 'Uploaded h₀ into an uploaded ellipsoid' }).waitFor();
    await expect.poll(() => page.locator('.state-bar__done').first().textContent(), { timeout: 60_000, interval: 500 }).toBe('1 of 1 done');
    await page.getByRole('cell', { name: 'Converged' }).first().waitFor();

    // The run carries the two uploads and finished converged.
    const run = await stack.database.db.selectFrom('runs').select(['spec', 'state', 'outcome']).where('sweep_id', '=', sweepId).executeTakeFirstOrThrow();
    const spec = typeof run.spec === 'string' ? JSON.parse(run.spec) : run.spec;
    expect(spec.initial).toEqual({ kind: 'table', uploadId: initial.id });
    expect(spec.target).toEqual({ kind: 'profile', uploadId: target.id });
    expect(run.state).toBe('finished');
    expect(run.outcome).toBe('converged');

    // The API names the field when an upload is of the wrong kind.
    const wrong = await stack.api.request('POST', '/api/sweeps', {
      token,
      body: { studyId: (await stack.api.request('GET', '/api/studies', { token })).body[0].id, name: 'wrong kind', axes: [], base: { ...spec, initial: { kind: 'table', uploadId: target.id } } },
    });
    expect(wrong.status).toBe(400);
    expect(JSON.stringify(wrong.body)).toContain('initial.uploadId');
    await page.context().close();
  }, 120_000);
});
