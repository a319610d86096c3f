/**
 * A facilitator builds a small ladder from nothing in Chromium, sees the
 * equilibrium path, changes one payoff and sees the path change, exports the
 * scenario and imports it back unchanged.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, startApp, type App } from '../support/app';
import { launchContext, screenshot, signInThroughForm } from '../support/browser';

let app: App;
let browser: BrowserContext;

beforeAll(async () => {
  app = await startApp();
  browser = await launchContext({ width: 1440, height: 900 });
});
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

/**
 * The equilibrium path in words, read in one step and only once the panel says it belongs
 * to the document as it stands (data-state="current"); '' while a change waits for its
 * rerun, so that a path left over from before an edit is never taken for the new one.
 */
const pathText = (page: Page) =>
  page
    .getByTestId('equilibrium-panel')
    .evaluate((panel: HTMLElement) => (panel.dataset.state === 'current' ? (panel.querySelector<HTMLElement>('[data-testid="equilibrium-path"]')?.innerText ?? '') : ''));
const pathOtherThan = async (page: Page, before: string) => {
  const now = await pathText(page);
  return now !== '' && now !== before;
};

async function exportFile(page: Page): Promise<unknown> {
  const download = page.waitForEvent('download');
  await page.getByRole('button', { name: 'Export JSON' }).click();
  const file = await (await download).path();
  return JSON.parse(readFileSync(file, 'utf8'));
}

describe('e2e: authoring in the Studio', () => {
  it('builds a ladder from nothing, follows the equilibrium as a payoff changes, and round-trips the file', async () => {
    const page = await browser.newPage();
    const problems: string[] = [];
    page.on('pageerror', (e) => problems.push(e.message));
    await signInThroughForm(page, app, DEMO.facilitator);

    await page.getByRole('link', { name: 'Studio' }).click();
    await page.getByTestId('library-table').waitFor();
    await screenshot(page, 'studio-library');
    await page.getByRole('link', { name: 'New scenario' }).first().click();
    await page.getByLabel('Title').fill('Harbour of Tessel');
    await page.getByRole('button', { name: 'Create scenario' }).click();
    await page.getByTestId('workbench').waitFor();
    expect(await page.getByTestId('scenario-title').textContent()).toBe('Harbour of Tessel');

    // The ladder: rename the rungs, add one and move it below the top, one round only.
    await page.getByRole('tab', { name: 'Ladder' }).click();
    await page.getByLabel('Name of rung 1').fill('Naval blockade');
    await page.getByRole('button', { name: 'Add a rung' }).click();
    await page.getByLabel('Name of rung 3').fill('Ultimatum');
    await page.getByLabel('Cost at Ultimatum').fill('3');
    await page.getByLabel('Credibility at Ultimatum').fill('2');
    await page.getByRole('button', { name: 'Move Ultimatum down the ladder (calmer)' }).click();
    expect(await page.getByLabel('Name of rung 2').inputValue()).toBe('Ultimatum');
    await page.getByLabel('Rounds').fill('1');
    await expect.poll(() => page.getByTestId('rebuild-report').textContent()).toContain('Tree rebuilt from the ladder');
    await screenshot(page, 'studio-ladder');

    // The equilibrium path, on the tree and in words.
    await page.getByRole('tab', { name: 'Tree' }).click();
    await page.getByTestId('tree-canvas').waitFor();
    await expect.poll(() => pathText(page), { timeout: 30_000 }).toMatch(/\S/);
    const before = await pathText(page);
    expect(await page.locator('[data-on-path]').count()).toBeGreaterThan(0);
    await screenshot(page, 'studio-tree-equilibrium');

    // Keyboard: focus the tree, walk to the first move, read what each action is worth.
    await page.getByTestId('tree-canvas').focus();
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowLeft');
    await page.getByTestId('action-values').waitFor();
    expect(await page.getByTestId('margin').textContent()).toContain('Margin to the runner-up for Blue');

    // Make the equilibrium outcome bad for both teams: the last mover turns away from it.
    await page.getByRole('tab', { name: 'Outcomes' }).click();
    // The row is found once by its marker and then by its node: after the first edit the
    // marker may move to another row.
    const marked = page.getByTestId('outcomes-table').locator('tr', { hasText: 'equilibrium outcome' });
    const row = page.locator(`[data-testid="outcomes-table"] tr[data-node="${await marked.getAttribute('data-node')}"]`);
    await row.getByLabel(/^Payoff of Blue at /).fill('-100');
    await row.getByLabel(/^Payoff of Red at /).fill('-100');
    await page.getByRole('tab', { name: 'Tree' }).click();
    await expect.poll(() => pathOtherThan(page, before), { timeout: 30_000 }).toBe(true);
    await screenshot(page, 'studio-tree-path-changed');

    // The tree as SVG and PNG.
    const svg = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Save SVG' }).click();
    const svgText = readFileSync(await (await svg).path(), 'utf8');
    expect(svgText.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svgText).toContain('Naval blockade');
    const png = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Save PNG' }).click();
    const pngBytes = readFileSync(await (await png).path());
    expect([...pngBytes.subarray(0, 4)]).toEqual([0x89, 0x50, 0x4e, 0x47]);

    // Undo brings the old path back; redo the change and save.
    await page.getByRole('button', { name: 'Undo' }).click();
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(() => pathText(page), { timeout: 30_000 }).toBe(before);
    await page.getByRole('button', { name: 'Redo' }).click();
    await page.getByRole('button', { name: 'Redo' }).click();
    await expect.poll(() => pathOtherThan(page, before), { timeout: 30_000 }).toBe(true);
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await expect.poll(() => page.getByTestId('save-state').textContent()).toBe('All changes saved');

    // Export, import the file back, export again: the same document.
    const exported = await exportFile(page);
    expect(exported).toMatchObject({ format: 'rungwise.scenario/1', title: 'Harbour of Tessel', ladder: { rounds: 1 } });
    await page.goto(`${app.url}/studio`);
    await page.locator('[data-testid="import-file"]:enabled').waitFor({ state: 'attached' });
    const file = `${app.dir}/harbour.json`;
    writeFileSync(file, JSON.stringify(exported));
    await page.getByTestId('import-file').setInputFiles(file);
    await page.waitForURL((url) => /\/studio\/[0-9a-f-]{36}$/.test(url.pathname));
    await page.getByTestId('workbench').waitFor();
    expect(await exportFile(page)).toEqual(exported);
    await screenshot(page, 'studio-imported');

    // An import with faults lists every one by path, and imports nothing.
    await page.goto(`${app.url}/studio`);
    await page.locator('[data-testid="import-file"]:enabled').waitFor({ state: 'attached' });
    const broken = { ...(exported as Record<string, unknown>), title: '', weights: 'heavy' };
    writeFileSync(file, JSON.stringify(broken));
    await page.getByTestId('import-file').setInputFiles(file);
    await page.getByTestId('fault-list').waitFor();
    const faults = await page.getByTestId('fault-list').innerText();
    expect(faults).toContain('title');
    expect(faults).toContain('weights');
    await screenshot(page, 'studio-import-faults');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('opens the demo scenario collapsed, with its analysis panels', async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    await signInThroughForm(page, app, DEMO.facilitator);
    await page.goto(`${app.url}/studio`);
    await page.getByRole('link', { name: 'Serrin Strait' }).first().click();
    await page.getByTestId('workbench').waitFor();
    await page.getByRole('tab', { name: 'Tree' }).click();
    await expect.poll(() => pathText(page), { timeout: 30_000 }).toMatch(/\S/);
    const count = await page.getByTestId('tree-count').textContent();
    expect(count).toMatch(/^\d+ of 3656 nodes shown$/);
    expect(await page.getByTestId('equilibrium-count').textContent()).toMatch(
      /^One equilibrium play \(294,912 strategy profiles that differ only at moves off the path\)\. Some stages off the path have whole ranges of equilibria between those counted\. · /,
    );
    await screenshot(page, 'studio-demo-tree');

    await page.getByRole('tab', { name: 'Analysis' }).click();
    await page.getByTestId('panel-marks').getByRole('button', { name: 'Run' }).click();
    await page.getByTestId('verdicts').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('verdicts').innerText()).toMatch(/credible/);
    await page.getByTestId('panel-sensitivity').getByRole('button', { name: 'Run' }).click();
    await page.getByTestId('sensitivity-table').waitFor({ timeout: 60_000 });
    await page.getByTestId('panel-agreement').getByRole('button', { name: 'Run' }).click();
    await page.getByTestId('agreement-chart').waitFor({ timeout: 60_000 });
    await page.getByTestId('panel-monte-carlo').getByRole('button', { name: 'Run' }).click();
    await page.getByTestId('monte-carlo-chart').waitFor({ timeout: 60_000 });
    expect(await page.locator('[data-caution]').count()).toBeGreaterThanOrEqual(4);
    await screenshot(page, 'studio-demo-analysis');

    // An address naming a tab opens it, as a link from elsewhere would.
    await page.evaluate(() => (window.location.hash = '#outcomes'));
    await expect.poll(() => page.getByRole('tab', { name: 'Outcomes' }).getAttribute('aria-selected')).toBe('true');
    await page.getByTestId('outcomes-table').waitFor();
    await page.close();
  });
});
