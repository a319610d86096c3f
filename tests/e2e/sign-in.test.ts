import type { BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, DEMO_PASSWORD, startApp, type App } from '../support/app';
import { launchContext, screenshot, signInThroughForm } from '../support/browser';
import { DEMO_PEOPLE } from '../../server/seed/people';

let app: App;
let browser: BrowserContext;

beforeAll(async () => {
  app = await startApp();
  browser = await launchContext();
});
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe('e2e: signing in', () => {
  it('signs in as the demo facilitator and sees the dashboard', async () => {
    const page = await browser.newPage();
    await page.goto(app.url);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await screenshot(page, 'sign-in');
    await signInThroughForm(page, app, DEMO.facilitator);
    await expect.poll(() => page.getByTestId('user-name').textContent()).toBe('Ines Marlow');
    expect(await page.getByRole('heading', { name: 'Your scenarios' }).isVisible()).toBe(true);
    const links = await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents();
    expect(links.map((l) => l.trim())).toEqual(['Home', 'Studio', 'Exercises', 'Invite']);
    expect(await page.locator('footer').textContent()).toContain('not predictions');
    await screenshot(page, 'dashboard-facilitator');
    await page.close();
  });

  it('shows a wrong password as a clear message and keeps what was typed', async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    await page.goto(`${app.url}/sign-in`);
    await page.getByLabel('E-mail address').fill(DEMO.red);
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('do not match an account');
    expect(await page.getByLabel('E-mail address').inputValue()).toBe(DEMO.red);
    await page.close();
  });

  it('waits for the page script when the form is used before it has run, and never puts the password in the address', async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    // Hold back every script of the page for two seconds: the server-rendered form is on screen, not yet live.
    await page.route('**/_astro/**', async (route) => {
      await new Promise((done) => setTimeout(done, 2_000));
      await route.continue();
    });
    const addresses: string[] = [];
    page.on('framenavigated', (frame) => frame === page.mainFrame() && addresses.push(frame.url()));
    await page.goto(`${app.url}/sign-in`, { waitUntil: 'commit' });
    await page.getByLabel('E-mail address').fill(DEMO.observer);
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    const button = page.getByRole('button', { name: 'Sign in' });
    expect(await button.isDisabled()).toBe(true);
    await page.getByLabel('Password').press('Enter');
    await button.click();
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    await expect.poll(() => page.getByTestId('user-name').textContent()).toBe(DEMO_PEOPLE.observer.name);
    expect(addresses.join(' ')).not.toContain(DEMO_PASSWORD);
    expect(addresses.join(' ')).not.toContain('password=');
    await page.close();
  });

  it('gives the admin the Users and Outbox pages', async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    await signInThroughForm(page, app, DEMO.admin);
    await page.getByRole('link', { name: 'Users' }).click();
    await page.getByTestId('users-table').getByText(DEMO.observer).waitFor();
    await page.getByLabel('E-mail address').fill('fresh.observer@rungwise.example');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText('Invitation sent to fresh.observer@rungwise.example').waitFor();
    await screenshot(page, 'admin-users');
    await page.getByRole('link', { name: 'Outbox' }).click();
    await page.getByTestId('outbox-list').getByText('You are invited to Rungwise').first().click();
    await page.getByTestId('outbox-message').getByText('fresh.observer@rungwise.example').first().waitFor();
    await screenshot(page, 'admin-outbox');
    await page.close();
  });
});
