import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { testEnv } from './test-env';

/** Debian's Chromium driven by playwright-core (no browser is ever downloaded). */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: testEnv.chromium,
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

/** Saves a full-page screenshot as a test artefact a person can look at. */
export async function saveScreenshot(page: Page, name: string): Promise<string> {
  const dir = path.resolve(testEnv.artifactsDir, 'screenshots');
  mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}
