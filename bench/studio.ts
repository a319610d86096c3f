/**
 * npm run bench:studio: how long the Studio's analyses take on the demo scenario
 * (each through the solver pool, as the page runs them), and how long Chromium
 * takes to lay out and paint a canvas of 2,000 visible nodes. Figures, not tests.
 */
import { chromium } from 'playwright-core';
import { buildIfNeeded } from '../server/build';
import { closeSolverPool, runSolve } from '../server/solver/pool';
import type { GameNode } from '../src/lib/engine';
import { mulberry32, simultaneousStage, indexGame } from '../src/lib/engine';
import { parseScenario, SCENARIO_FORMAT, type Scenario } from '../src/lib/scenario';
import { engineJob } from '../src/lib/studio/analysis';
import type { StudioJob } from '../src/lib/studio/analysis-types';
import { rebuild } from '../src/lib/studio/regenerate';
import { DEMO, signIn, startApp } from '../tests/support/app';
import { CHROMIUM } from '../tests/support/chromium';
import { demoScenario } from '../server/seed/demo-scenario';

type Row = { name: string; ms: number; note?: string };
const rows: Row[] = [];

async function timed(name: string, run: () => Promise<unknown> | unknown, note?: string): Promise<void> {
  const start = performance.now();
  await run();
  rows.push({ name, ms: performance.now() - start, ...(note ? { note } : {}) });
}

async function demoAnalyses(): Promise<void> {
  const scenario = demoScenario();
  const game = { teams: scenario.teams, root: scenario.tree };
  const nodes = indexGame(game).nodes.length;
  const stage = indexGame(game).nodes.find((n) => n.kind === 'decision' && simultaneousStage(game, n.id)?.movers.length === 2)!;
  const movers = simultaneousStage(game, stage.id)!.movers;
  const jobs: [string, StudioJob][] = [
    ['equilibria (first 8 listed, all counted)', { analysis: 'equilibria', maxListed: 8 }],
    ['threats and promises (3 marks)', { analysis: 'credibility' }],
    ['payoff tolerance (every payoff)', { analysis: 'sensitivity' }],
    ['payoff uncertainty, 2,000 samples', { analysis: 'monte-carlo', samples: 2_000, seed: 7 }],
    ['behavioural forecast, logit QRE at lambda 1', { analysis: 'qre', lambda: 1 }],
    ['quarter-law forecast at one stage', { analysis: 'belief', nodeId: stage.id, team: movers[0]!.team, restrained: movers[0]!.actions[0]!, lambda: 1 }],
    [
      'agreement lens, 31 values of gamma',
      { analysis: 'agreement', stage: { rowTeam: movers[0]!.team, colTeam: movers[1]!.team, payoffs: [[[3, 3], [0, 5]], [[5, 0], [1, 1]]] }, gamma: Math.PI / 4, steps: 30 },
    ],
  ];
  // The first job starts a worker thread; time it apart so the others show the analysis alone.
  await timed('solver pool: first worker start and a small job', () => runSolve(engineJob(scenario, { analysis: 'qre', lambda: 0 })));
  for (const [name, job] of jobs) await timed(`demo (${nodes} nodes): ${name}`, () => runSolve(engineJob(scenario, job)));
  await timed('demo: check the document (parseScenario)', () => parseScenario(scenario));
  const renamed = { ...scenario, ladder: { ...scenario.ladder!, rungs: scenario.ladder!.rungs.map((r, i) => (i === 0 ? { ...r, name: 'Formal protest' } : r)) } };
  await timed('demo: rebuild the tree after a rung is renamed, replaying hand edits', () => rebuild(scenario, renamed));
  await closeSolverPool();
}

/** A binary tree of 2,047 nodes: two teams in turn, seeded payoffs. */
function binaryTree(depth: number): GameNode {
  const rng = mulberry32(11);
  const build = (id: string, level: number): GameNode => {
    if (level === depth) return { id, kind: 'terminal', payoffs: { azure: Math.round(rng() * 20 - 10), umber: Math.round(rng() * 20 - 10) } };
    return {
      id,
      kind: 'decision',
      team: level % 2 === 0 ? 'azure' : 'umber',
      actions: [
        { label: 'Press', next: build(`${id}.press`, level + 1) },
        { label: 'Hold', next: build(`${id}.hold`, level + 1) },
      ],
    };
  };
  return build('n', 0);
}

async function canvas(): Promise<void> {
  buildIfNeeded();
  const app = await startApp({ seed: true });
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu'] });
  try {
    const client = await signIn(app, DEMO.facilitator);
    const document: Scenario = {
      format: SCENARIO_FORMAT,
      title: 'Canvas bench',
      setting: 'A generated tree for the benchmark.',
      teams: [
        { id: 'azure', name: 'Azure', objectives: [] },
        { id: 'umber', name: 'Umber', objectives: [] },
      ],
      attributes: [],
      weights: {},
      tree: binaryTree(10),
      marks: [],
      payoffRanges: [],
      injects: [],
      attachments: [],
    };
    const created = await client.json('/api/scenarios', { method: 'POST', json: { document } });
    if (created.status !== 201) throw new Error(`could not create the bench scenario: ${JSON.stringify(created.body).slice(0, 300)}`);
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    await context.addCookies(client.cookie.split('; ').map((pair) => ({ name: pair.slice(0, pair.indexOf('=')), value: pair.slice(pair.indexOf('=') + 1), url: app.url })));
    const page = await context.newPage();
    await page.goto(`${app.url}/studio/${created.body.scenarioId}#tree`);
    await page.getByTestId('tree-canvas').waitFor();
    await page.getByTestId('equilibrium-path').waitFor({ timeout: 60_000 });

    const paintedAfter = (since: number) =>
      page.waitForFunction(
        (t) => performance.getEntriesByName('rungwise:canvas-painted').some((e) => e.startTime > t && ((e as PerformanceMark).detail as number) >= 2_000),
        since,
        { timeout: 60_000 },
      );
    const since = await page.evaluate(() => performance.now());
    await page.getByRole('button', { name: 'Unfold all' }).click();
    await paintedAfter(since);
    const unfold = await page.evaluate((t) => {
      const painted = performance.getEntriesByName('rungwise:canvas-painted').find((e) => e.startTime > t)!;
      const start = performance.getEntriesByName('rungwise:layout-start').filter((e) => e.startTime > t).at(-1)!;
      const end = performance.getEntriesByName('rungwise:layout-end').filter((e) => e.startTime > t).at(-1)!;
      return { layout: end.startTime - start.startTime, painted: painted.startTime - t };
    }, since);
    rows.push({ name: 'canvas: lay out 2,047 visible nodes (tidy tree)', ms: unfold.layout });
    rows.push({ name: 'canvas: unfold to 2,047 nodes, click to painted', ms: unfold.painted });
    const shown = await page.getByTestId('tree-count').textContent();

    const fitStart = await page.evaluate(() => performance.now());
    await page.getByRole('button', { name: 'Fit' }).click();
    await page.waitForTimeout(600);
    const inDom = await page.locator('.react-flow__node').count();
    rows.push({ name: `canvas: fit all in view (${inDom} nodes drawn)`, ms: (await page.evaluate(() => performance.now())) - fitStart, note: 'includes a 200 ms animation and a 600 ms wait' });

    // Pan with the mouse for 60 frames and time the frames.
    const box = (await page.getByTestId('tree-canvas').boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.down();
    // A string, so that no bundler helper (tsx names functions) reaches the page.
    const frames = page.evaluate<number[]>(`new Promise((done) => {
      const times = [];
      let last = performance.now();
      requestAnimationFrame(function tick(now) {
        times.push(now - last);
        last = now;
        if (times.length < 60) requestAnimationFrame(tick);
        else done(times);
      });
    })`);
    for (let k = 0; k < 60; k++) await page.mouse.move(box.x + box.width / 2 + k * 4, box.y + box.height / 2 + k * 2);
    await page.mouse.up();
    const times = (await frames).sort((a, b) => a - b);
    rows.push({ name: 'canvas: panning 2,047 nodes, median frame', ms: times[Math.floor(times.length / 2)]!, note: `slowest ${times.at(-1)!.toFixed(0)} ms; ${shown}` });
    await context.close();
  } finally {
    await browser.close();
    await app.stop();
  }
}

await demoAnalyses();
await canvas();
const width = Math.max(...rows.map((r) => r.name.length));
console.log('\nRungwise Studio benchmark (wall time; the machine has 2 cores)\n');
for (const r of rows) console.log(`${r.name.padEnd(width)}  ${r.ms.toFixed(1).padStart(9)} ms${r.note ? `   ${r.note}` : ''}`);
console.log('\nAnalysis figures follow from the demo scenario’s assumed payoffs; they measure speed only.');
