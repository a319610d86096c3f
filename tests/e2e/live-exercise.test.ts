/**
 * Three browsers play the seeded demo exercise (run 2) to its end: the facilitator on
 * the Console, Tomas Reyl on Velmora's Desk, Darya Kovel on Ostrakh's. A sequential
 * turn by mouse, one by keyboard, the seeded chance draw, a sealed simultaneous turn with
 * an off-ladder proposal the facilitator adjudicates, the reveal, and play to an outcome.
 * Then an observer saves a note with the line down, reloads, and the note is saved once.
 */
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, startApp, type App } from '../support/app';
import { launchContext, screenshot, signInThroughForm } from '../support/browser';

let app: App;
const contexts: BrowserContext[] = [];
let facilitator: Page;
let blue: Page;
let red: Page;

async function openAs(email: string): Promise<Page> {
  const context = await launchContext({ width: 1360, height: 900 });
  contexts.push(context);
  const page = await context.newPage();
  await signInThroughForm(page, app, email);
  return page;
}

const connected = (page: Page) => page.locator('[data-connection="open"]').waitFor();
const stageWords = (page: Page) => page.getByTestId('stage-words').textContent();
const turnOf = async (page: Page) => Number((await page.getByTestId('turn').textContent())!.replace(/\D/g, ''));

async function waitForTurn(page: Page, turn: number): Promise<void> {
  await expect.poll(() => turnOf(page), { timeout: 15_000 }).toBe(turn);
}

async function chooseAndSubmit(page: Page, optionText: string | RegExp, rationale: string): Promise<void> {
  await page.getByTestId('option').filter({ hasText: optionText }).first().click();
  await page.getByLabel('Rationale').fill(rationale);
  await page.getByTestId('submit-move').click();
  await page.getByTestId('confirm-submit').click();
  await page.getByTestId('confirm-submit').waitFor({ state: 'detached' });
}

async function decideFor(team: string, optionLabel: RegExp, reason: string): Promise<void> {
  const mover = facilitator.locator(`[data-testid="mover"][data-team="${team}"]`);
  const open = mover.getByRole('button', { name: /Decide|Time is up/ });
  if (await open.isVisible()) await open.click();
  const select = mover.getByLabel('Decision');
  const label = (await select.locator('option').allTextContents()).find((t) => optionLabel.test(t))!;
  await select.selectOption({ label });
  await mover.getByLabel('Reason').fill(reason);
  await mover.getByRole('button', { name: 'Record the decision' }).click();
}

beforeAll(async () => {
  app = await startApp();
  [facilitator, blue, red] = await Promise.all([openAs(DEMO.facilitator), openAs(DEMO.blue), openAs(DEMO.red)]);
});
afterAll(async () => {
  for (const context of contexts) await context.close();
  await app?.stop();
});

describe('e2e: a live exercise in three browsers', () => {
  it('plays the demo exercise from the briefing to an outcome', async () => {
    await facilitator.goto(`${app.url}/exercises`);
    const href = (await facilitator.getByRole('link', { name: /run 2/ }).getAttribute('href'))!;
    for (const page of [facilitator, blue, red]) {
      await page.goto(`${app.url}${href}`);
      await connected(page);
    }
    for (const page of [facilitator, blue, red]) {
      expect(await page.getByRole('note').textContent()).toContain('EXERCISE');
      expect(await page.getByTestId('countdown').isVisible()).toBe(true);
    }
    expect(await blue.getByTestId('briefs').textContent()).toContain('Velmora only');
    expect(await blue.getByTestId('briefs').textContent()).not.toContain('Ostrakh only');
    await screenshot(blue, 'live-desk-briefing');
    await screenshot(facilitator, 'live-console-briefing');

    // Play starts: Velmora moves first, Ostrakh waits.
    await facilitator.getByTestId('start-play').click();
    await blue.getByTestId('option').first().waitFor();
    await red.getByTestId('waiting').waitFor();
    await expect.poll(() => blue.getByTestId('countdown').getAttribute('data-clock')).toBe('running');
    // The Console's analysis leads with the one equilibrium play, not the strategy profiles.
    await expect
      .poll(() => facilitator.getByTestId('equilibrium-note').textContent(), { timeout: 30_000 })
      .toBe('From the start: one equilibrium play (294,912 strategy profiles that differ only at moves off the path).');
    await chooseAndSubmit(blue, 'Hold at Naval shadowing', 'Keep the frigates on station and let Ostrakh show its hand.');
    await screenshot(blue, 'live-desk-after-move');

    // Ostrakh by keyboard: focus the options, pick the second with "2", Ctrl+Enter, Enter.
    await waitForTurn(red, 2);
    await red.getByTestId('option').first().locator('input').focus();
    await red.keyboard.press('2');
    await red.keyboard.press('Control+Enter');
    await red.getByTestId('confirm-submit').waitFor();
    await red.keyboard.press('Enter');
    await waitForTurn(facilitator, 3);

    // Chance: the server's seeded draw.
    expect(await stageWords(facilitator)).toContain('Chance');
    await screenshot(facilitator, 'live-console-chance');
    await facilitator.getByTestId('draw').click();
    await waitForTurn(facilitator, 4);
    expect(await facilitator.getByTestId('move-list').textContent()).toContain('Seeded draw');

    // The simultaneous round: Velmora seals a step down; Ostrakh proposes something off the ladder.
    expect(await stageWords(facilitator)).toContain('at the same time');
    await waitForTurn(blue, 4);
    await chooseAndSubmit(blue, /^.*Step down/, 'Offer to step down if Ostrakh does the same.');
    await expect.poll(() => red.getByTestId('other-movers').textContent()).toContain('has submitted (sealed)');
    await expect.poll(() => facilitator.getByTestId('sealed-label').count()).toBe(1);
    await red.getByLabel(/Propose a move that is not on the ladder/).check();
    await red.getByLabel('Your proposal').fill('Invite the Lantern Isles Council to inspect the survey ships, frigates stay where they are');
    await red.getByTestId('submit-move').click();
    await red.getByTestId('confirm-submit').click();
    await red.getByTestId('submitted').waitFor();
    await facilitator.getByTestId('proposal').waitFor();
    await screenshot(red, 'live-desk-proposal-sent');
    await decideFor('ostrakh', /^Hold at/, 'An inspection offer changes nothing at sea: Ostrakh holds its position.');
    await expect.poll(() => facilitator.getByTestId('reveal').isEnabled()).toBe(true);
    await screenshot(facilitator, 'live-console-sealed');
    await facilitator.getByTestId('reveal').click();
    await waitForTurn(red, 5);
    expect(await red.getByTestId('move-list').textContent()).toContain('adjudicated');
    await screenshot(red, 'live-desk-revealed');

    // On to the end: Lantern (if the crisis calls it in) stands aside by the facilitator's decision, then Velmora settles.
    for (let step = 0; step < 10 && (await facilitator.getByTestId('exercise-state').textContent()) !== 'ended'; step++) {
      const turn = await turnOf(facilitator);
      const words = (await stageWords(facilitator))!;
      if (words.includes('Chance')) await facilitator.getByTestId('draw').click();
      else if (words.includes('Lantern Isles Council')) await decideFor('lantern', /^Stand aside/, 'The Council’s player is away; it keeps its counsel this round.');
      else if (words.startsWith('Velmora')) {
        await waitForTurn(blue, turn);
        await chooseAndSubmit(blue, /^.*Settle/, 'Take the settlement while it is on offer.');
      } else {
        await waitForTurn(red, turn);
        await chooseAndSubmit(red, /^.*Settle/, 'Settle before the insurers leave.');
      }
      await expect.poll(async () => (await turnOf(facilitator)) > turn || (await facilitator.getByTestId('exercise-state').textContent()) === 'ended', { timeout: 15_000 }).toBe(true);
    }
    for (const page of [facilitator, blue, red]) await expect.poll(() => page.getByTestId('exercise-state').textContent()).toBe('ended');
    await blue.getByTestId('outcome').waitFor();
    expect(await facilitator.getByTestId('outcome').textContent()).toContain('Outcome');
    await screenshot(facilitator, 'live-console-ended');
    await screenshot(blue, 'live-desk-ended');
    await facilitator.getByRole('tab', { name: 'Audit log' }).click();
    expect(await facilitator.getByTestId('audit-log').textContent()).toContain('Revealed turn 4');
    await screenshot(facilitator, 'live-console-log');
  });

  it('keeps a note saved while the line is down over a page reload, and saves it once the line is back', async () => {
    const observer = await openAs(DEMO.observer);
    let online = false;
    await observer.routeWebSocket(/\/ws\/exercise\//, (socket) => {
      if (online) socket.connectToServer(); // else the page's socket opens onto nothing that answers
    });
    await observer.goto(`${app.url}/exercises`);
    await observer.goto(`${app.url}${(await observer.getByRole('link', { name: /run 1/ }).getAttribute('href'))!}`);
    await observer.locator('[data-connection="connecting"]').waitFor();
    const text = 'Velmora’s lead hesitated before the second move (written offline)';
    await observer.getByLabel(/^Note$/).fill(text);
    await observer.getByTestId('save-note').click();
    await expect.poll(() => observer.getByTestId('connection').textContent()).toContain('1 waiting to send');
    await screenshot(observer, 'live-observer-waiting-to-send');

    online = true;
    await observer.reload();
    await connected(observer);
    await expect.poll(() => observer.getByTestId('note').filter({ hasText: text }).count(), { timeout: 15_000 }).toBe(1);
    await expect.poll(() => observer.getByTestId('connection').textContent()).not.toContain('waiting to send');
    expect(await observer.evaluate(() => Object.keys(sessionStorage).filter((k) => k.startsWith('rungwise:unsent:')))).toEqual([]);
    await observer.reload();
    await connected(observer);
    expect(await observer.getByTestId('note').filter({ hasText: text }).count()).toBe(1);

    // Signing out leaves nothing of this person's kept intents in the browser.
    await observer.evaluate(() => sessionStorage.setItem('rungwise:unsent:someone:somewhere', '[]'));
    await observer.getByRole('button', { name: 'Sign out' }).click();
    await observer.waitForURL((url) => url.pathname.startsWith('/sign-in'));
    expect(await observer.evaluate(() => Object.keys(sessionStorage))).toEqual([]);
  });
});
