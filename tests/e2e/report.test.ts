import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, signIn, startApp, type App, type Client } from '../support/app';
import { launchContext, screenshot, signInThroughForm } from '../support/browser';
import { waitForMail } from '../support/mail';

let app: App;
let admin: Client;
let exerciseId: string;
let scenarioId: string;
const contexts: BrowserContext[] = [];
const pages = new Map<string, Page>();

/** One browser (its own profile) per person, signed in through the form once. */
async function personPage(email: string): Promise<Page> {
  const known = pages.get(email);
  if (known) return known;
  const context = await launchContext({ width: 1440, height: 960 });
  contexts.push(context);
  const page = await context.newPage();
  await signInThroughForm(page, app, email);
  pages.set(email, page);
  return page;
}

async function openDraft(page: Page): Promise<void> {
  await page.goto(`${app.url}/exercises/${exerciseId}/report`);
  await page.getByTestId('report-editor').waitFor();
  await expect.poll(() => page.getByTestId('connection').textContent(), { timeout: 30_000 }).toContain('Saved as you type');
}

beforeAll(async () => {
  app = await startApp();
  admin = await signIn(app, DEMO.admin);
  const facilitator = await signIn(app, DEMO.facilitator);
  const { body } = await facilitator.json<{ exercises: { id: string; state: string }[] }>('/api/exercises');
  exerciseId = body.exercises.find((e) => e.state === 'ended')!.id;
  scenarioId = (await facilitator.json(`/api/exercises/${exerciseId}/review`)).body.scenarioId;
});
afterAll(async () => {
  for (const context of contexts) await context.close();
  await app?.stop();
});

describe('e2e: writing the after-action report together', () => {
  it('shows the review with its charts, tree, tables and the caution', async () => {
    const page = await personPage(DEMO.observer);
    await page.goto(`${app.url}/exercises/${exerciseId}/review`);
    await page.getByTestId('moves-table').waitFor({ timeout: 30_000 });
    expect(await page.locator('[data-caution]').first().textContent()).toContain('aid to discussion');
    expect(await page.getByTestId('equilibrium-count').textContent()).toBe('The scenario has one equilibrium play (294,912 strategy profiles that differ only at moves off the path).');
    expect(await page.locator('[data-chart="escalation"] svg').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('path-tree').locator('.react-flow__node').count()).toBeGreaterThan(3);
    expect(await page.getByTestId('timeline').locator('[data-kind="note"]').count()).toBeGreaterThan(3);
    await screenshot(page, 'review-observer');
    await page.goto(`${app.url}/scenarios/${scenarioId}/runs`);
    expect(await page.getByRole('alert').textContent()).toContain('This scenario belongs to someone else');
  });

  it('compares the runs of the scenario for its facilitator', async () => {
    const page = await personPage(DEMO.facilitator);
    await page.goto(`${app.url}/scenarios/${scenarioId}/runs`);
    await page.getByTestId('runs-table').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('runs-table').textContent()).toContain('staff course, run 1');
    await screenshot(page, 'runs-scenario');
  });

  it('lets two people type in the same report and see each other’s text and caret', async () => {
    const facilitator = await personPage(DEMO.facilitator);
    const observer = await personPage(DEMO.observer);
    await openDraft(facilitator);
    await openDraft(observer);

    await facilitator.locator('.report-doc li p').last().click();
    await facilitator.keyboard.press('End');
    await facilitator.keyboard.press('Enter');
    await facilitator.keyboard.type('Facilitator typing in Chromium.');
    const hotWash = observer.locator('.report-doc p', { hasText: 'Velmora’s team said' });
    const box = (await hotWash.boundingBox())!;
    await hotWash.click({ position: { x: box.width - 2, y: box.height - 4 } }); // after the last word
    await observer.keyboard.press('End');
    await observer.keyboard.type(' Observer typing in Chromium.');

    await expect.poll(() => observer.getByTestId('report-editor').textContent(), { timeout: 15_000 }).toContain('Facilitator typing in Chromium.');
    await expect.poll(() => facilitator.getByTestId('report-editor').textContent(), { timeout: 15_000 }).toContain('Observer typing in Chromium.');
    await expect.poll(() => observer.locator('.collaboration-carets__label').allTextContents(), { timeout: 15_000 }).toContain('Ines Marlow');
    await expect.poll(() => facilitator.getByTestId('people').textContent()).toContain('Oren Hale');
    await screenshot(facilitator, 'report-facilitator-editing');
    await screenshot(observer, 'report-observer-editing');

    await facilitator.getByRole('button', { name: 'Issue version 2' }).click();
    await facilitator.getByRole('group', { name: 'Confirm issue' }).getByRole('button', { name: 'Issue', exact: true }).click();
    await expect.poll(() => facilitator.getByTestId('versions').textContent()).toContain('Version 2');

    const send = facilitator.getByRole('form', { name: 'Send the report' });
    await expect.poll(() => send.getByLabel('Version').inputValue()).toBe('2');
    expect(await send.getByLabel('To').inputValue()).toBe(DEMO.sponsor);
    await send.getByLabel('Covering note').fill('Version 2 with what we wrote together after the hot wash.');
    await send.getByRole('button', { name: 'Send with the PDF attached' }).click();
    await expect.poll(() => facilitator.getByTestId('dispatches').textContent(), { timeout: 15_000 }).toContain(`Version 2 to ${DEMO.sponsor}`);
    await screenshot(facilitator, 'report-issued-and-sent');

    const mail = await waitForMail(admin, DEMO.sponsor, /version 2/);
    expect(mail.text).toContain('Version 2 with what we wrote together');
    expect(mail.attachments[0]).toMatchObject({ contentType: 'application/pdf' });
  });

  it('writes the observer notes again after a late note, in front of both editors, keeping what they typed', async () => {
    const facilitator = await personPage(DEMO.facilitator);
    const observer = await personPage(DEMO.observer);
    const note = 'A late note: the envoy was never briefed on the insurers.';
    const added = await observer.request.post(`${app.url}/api/exercises/${exerciseId}/intents`, {
      data: { key: `late-${Date.now()}`, intent: { kind: 'note', turn: 6, moveId: null, tags: ['misreading'], text: note } },
    });
    expect(added.status()).toBe(200);
    await openDraft(facilitator);
    await openDraft(observer);
    const panel = facilitator.getByTestId('generated-sections');
    await expect.poll(() => panel.locator('[data-section="notes"]').getAttribute('data-state'), { timeout: 30_000 }).toBe('outdated');
    await panel.getByRole('button', { name: 'Write the ticked sections again' }).click();
    await panel.getByRole('group', { name: 'Confirm writing again' }).getByRole('button', { name: 'Replace' }).click();
    await expect.poll(() => panel.textContent(), { timeout: 15_000 }).toContain('Written again: Observer notes.');
    expect(await panel.locator('[data-section="notes"]').getAttribute('data-state')).toBe('current');
    await expect.poll(() => observer.getByTestId('report-editor').textContent(), { timeout: 15_000 }).toContain(note);
    expect(await observer.getByTestId('report-editor').textContent()).toContain('Facilitator typing in Chromium.');
    await screenshot(facilitator, 'report-generated-sections-written-again');
  });

  it('shows the sponsor the issued version only', async () => {
    const sponsor = await personPage(DEMO.sponsor);
    await sponsor.goto(`${app.url}/exercises/${exerciseId}/report`);
    const issued = sponsor.getByTestId('issued-version');
    await issued.waitFor();
    expect(await issued.textContent()).toContain('version 2, issued');
    expect(await issued.textContent()).toContain('Facilitator typing in Chromium.');
    expect(await issued.textContent()).toContain('EXERCISE · EXERCISE · EXERCISE');
    expect(await sponsor.getByTestId('report-editor').count()).toBe(0);
    await screenshot(sponsor, 'report-sponsor-reads');
  });
});
