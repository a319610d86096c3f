/** Headless Debian Chromium through playwright-core, one fresh profile per launch. */
import { mkdirSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import type { App } from './app';
import { DEMO_PASSWORD } from './app';
import { CHROMIUM } from './chromium';

export const SCREENSHOTS = 'test-results/screenshots';

/** A persistent context is the only way to hand Chromium a fresh --user-data-dir of our choosing. */
export async function launchContext(viewport = { width: 1280, height: 860 }): Promise<BrowserContext> {
  const profile = mkdtempSync(join(tmpdir(), 'rungwise-chromium-'));
  return chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    viewport,
    args: [
      '--headless',
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

export async function signInThroughForm(page: Page, app: App, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${app.url}/sign-in`);
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const path = join(SCREENSHOTS, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}
