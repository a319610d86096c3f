/**
 * npm run bench: speed of the game engine, with the targets beside the measured figures.
 * Trees are generated from fixed seeds, so runs are comparable.
 */
import {
  backwardInduction,
  buildLadder,
  compiledGame,
  fitLogit,
  monteCarlo,
  mulberry32,
  qreFlat,
  sensitivity,
  solveFlat,
  supportEnumeration,
  type FlatGame,
  type Game,
  type GameNode,
  type LadderSpec,
  type PayoffRange,
  type Rng,
} from '../src/lib/engine';
import { CHANCE, TERMINAL } from '../src/lib/engine';
import { scenarioGame } from '../src/lib/scenario';
import { seededRunMoves } from '../server/seed/demo-run';
import { demoScenario } from '../server/seed/demo-scenario';

interface Row {
  name: string;
  measured: string;
  target: string;
  ok?: boolean;
}

const rows: Row[] = [];

/** Best wall time of `runs` calls after one warm-up call, in milliseconds. */
function time<T>(runs: number, f: () => T): { ms: number; result: T } {
  let result = f();
  let best = Infinity;
  for (let k = 0; k < runs; k++) {
    const start = performance.now();
    result = f();
    best = Math.min(best, performance.now() - start);
  }
  return { ms: best, result };
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

/**
 * A random perfect-information flat tree built breadth-first straight into typed arrays:
 * two teams, decision nodes with 2-3 actions, about 5% chance nodes with 2 outcomes.
 */
function flatTree(target: number, rng: Rng): FlatGame {
  const teams = 2;
  const mover = new Int8Array(target);
  const childStart = new Int32Array(target + 1);
  const aux = new Int32Array(target);
  const payoffs: number[] = [];
  const probs: number[] = [];
  let size = 1;
  let infosets = 0;
  for (let i = 0; i < size; i++) {
    const chance = rng() < 0.05;
    const k = chance ? 2 : 2 + Math.floor(rng() * 2);
    childStart[i] = size;
    // The first nodes always branch, so the random growth cannot die out early.
    const internal = size + k <= target && (i < 64 || rng() < 0.62);
    if (!internal) {
      mover[i] = TERMINAL;
      aux[i] = payoffs.length / teams;
      for (let t = 0; t < teams; t++) payoffs.push(Math.round(rng() * 1000) / 10);
      continue;
    }
    if (chance) {
      mover[i] = CHANCE;
      aux[i] = probs.length;
      const p = 0.25 + rng() / 2;
      probs.push(p, 1 - p);
    } else {
      mover[i] = Math.floor(rng() * teams);
      aux[i] = infosets++;
    }
    size += k;
  }
  childStart[size] = size;
  return {
    teams,
    size,
    mover: mover.slice(0, size),
    childStart: childStart.slice(0, size + 1),
    aux: aux.slice(0, size),
    payoff: Float64Array.from(payoffs),
    prob: Float64Array.from(probs),
    infosetCount: infosets,
  };
}

const flatBytes = (f: FlatGame) => f.mover.byteLength + f.childStart.byteLength + f.aux.byteLength + f.payoff.byteLength + f.prob.byteLength;

/** A random perfect-information model tree with exact payoffs and probabilities, built breadth-first like flatTree. */
function modelTree(target: number, rng: Rng): Game {
  const root = { id: 'n' } as GameNode;
  const queue: GameNode[] = [root];
  for (let head = 0; head < queue.length; head++) {
    const node = queue[head] as unknown as Record<string, unknown>;
    const chance = rng() < 0.05;
    const k = chance ? 2 : 2 + Math.floor(rng() * 2);
    const internal = queue.length + k <= target && (head < 64 || rng() < 0.62);
    if (!internal) {
      Object.assign(node, { kind: 'terminal', payoffs: { Blue: `${Math.floor(rng() * 200) - 100}/${1 + Math.floor(rng() * 9)}`, Red: `${Math.floor(rng() * 200) - 100}/7` } });
      continue;
    }
    const children = Array.from({ length: k }, (_, a) => ({ id: `${node.id as string}.${a}` }) as GameNode);
    queue.push(...children);
    if (chance) Object.assign(node, { kind: 'chance', outcomes: [{ label: 'heads', p: '1/3', next: children[0] }, { label: 'tails', p: '2/3', next: children[1] }] });
    else Object.assign(node, { kind: 'decision', team: rng() < 0.5 ? 'Blue' : 'Red', actions: children.map((next, a) => ({ label: `a${a}`, next })) });
  }
  return { teams: [{ id: 'Blue', name: 'Blue' }, { id: 'Red', name: 'Red' }], root };
}

function countNodes(node: GameNode): number {
  let n = 0;
  const stack = [node];
  while (stack.length > 0) {
    const x = stack.pop()!;
    n++;
    if (x.kind === 'decision') for (const a of x.actions) stack.push(a.next);
    if (x.kind === 'chance') for (const o of x.outcomes) stack.push(o.next);
  }
  return n;
}

function floatInduction() {
  const flat = flatTree(1_200_000, mulberry32(1));
  const { ms, result } = time(5, () => solveFlat(flat));
  const rate = flat.size / (ms / 1000);
  const bytes = (flatBytes(flat) + result.value.byteLength + result.choice.byteLength) / flat.size;
  rows.push({ name: `float backward induction, ${flat.size.toLocaleString('en')} nodes: speed`, measured: `${(rate / 1e6).toFixed(1)} M nodes/s (${ms.toFixed(1)} ms)`, target: '>= 5 M nodes/s', ok: rate >= 5e6 });
  rows.push({ name: '  memory (flat tree + solution arrays)', measured: `${bytes.toFixed(1)} bytes/node`, target: '<= 40 bytes/node', ok: bytes <= 40 });
}

function exactInduction() {
  const game = modelTree(100_000, mulberry32(2));
  const nodes = countNodes(game.root);
  const compileStart = performance.now();
  compiledGame(game);
  const compileMs = performance.now() - compileStart;
  const { ms } = time(2, () => backwardInduction(game, { exact: true }));
  rows.push({
    name: `exact backward induction, ${nodes.toLocaleString('en')} nodes`,
    measured: `${(ms / 1000).toFixed(2)} s (${Math.round(nodes / (ms / 1000)).toLocaleString('en')} nodes/s; compile ${(compileMs / 1000).toFixed(2)} s)`,
    target: '-',
  });
}

function bimatrix() {
  const rng = mulberry32(3);
  const matrix = () => Array.from({ length: 8 }, () => Array.from({ length: 8 }, () => Math.floor(rng() * 101) - 50));
  const times: number[] = [];
  let counts: number[] = [];
  for (let k = 0; k < 20; k++) {
    const game = { rowLabels: [...'abcdefgh'], colLabels: [...'abcdefgh'], rowPayoff: matrix(), colPayoff: matrix() };
    supportEnumeration(game);
    const start = performance.now();
    const result = supportEnumeration(game, { exact: true });
    times.push(performance.now() - start);
    counts = [...counts, result.equilibria.length];
  }
  const ms = median(times);
  rows.push({
    name: 'all equilibria of an 8x8 bimatrix (exact), median of 20 games',
    measured: `${ms.toFixed(1)} ms (max ${Math.max(...times).toFixed(1)} ms; ${Math.min(...counts)}-${Math.max(...counts)} equilibria)`,
    target: '< 50 ms',
    ok: ms < 50,
  });
}

function qre() {
  const flat = flatTree(100_000, mulberry32(4));
  const { ms } = time(3, () => qreFlat(flat, [1, 1]));
  rows.push({ name: `logit QRE at one lambda, ${flat.size.toLocaleString('en')} nodes, perfect information`, measured: `${ms.toFixed(1)} ms`, target: '< 2 s', ok: ms < 2000 });
  const ladder = bigLadder();
  const game = compiledGame(ladder);
  const imperfect = time(1, () => qreFlat(game, [1, 1, 1]));
  rows.push({
    name: `  same, ${game.size.toLocaleString('en')}-node ladder, ${imperfect.result.steps} subgames with simultaneous moves`,
    measured: `${imperfect.ms.toFixed(0)} ms${imperfect.result.converged ? '' : ' (not converged)'}`,
    target: '< 2 s',
    ok: imperfect.ms < 2000,
  });
}

/** The demo ladder stretched to five rounds: about 245,000 nodes, with a simultaneous stage in round 2. */
function bigLadder(): Game {
  const scenario = demoScenario();
  const spec: LadderSpec = { ...scenario.ladder!, rounds: 5 };
  const built = buildLadder(spec, scenario.teams, scenario.attributes.map((a) => a.key), 300_000);
  if (!built.ok) throw new Error(built.faults[0]!.message);
  return scenarioGame({ ...scenario, ladder: spec, tree: built.root });
}

function terminalsOf(game: Game, count: number): string[] {
  const ids: string[] = [];
  const stack = [game.root];
  while (stack.length > 0 && ids.length < count) {
    const x = stack.pop()!;
    if (x.kind === 'terminal') ids.push(x.id);
    if (x.kind === 'decision') for (const a of x.actions) stack.push(a.next);
    if (x.kind === 'chance') for (const o of x.outcomes) stack.push(o.next);
  }
  return ids;
}

function monteCarloRuns() {
  const game = modelTree(10_000, mulberry32(5));
  const nodes = countNodes(game.root);
  const ranges: PayoffRange[] = terminalsOf(game, 20).map((terminalId) => ({ terminalId, team: 'Blue', distribution: { kind: 'uniform', low: -20, high: 20 } }));
  const { ms } = time(1, () => monteCarlo(game, ranges, { samples: 10_000, seed: 6 }));
  rows.push({ name: `Monte Carlo, 10,000 samples, ${nodes.toLocaleString('en')}-node tree (20 ranges)`, measured: `${(ms / 1000).toFixed(2)} s`, target: '-' });
  const scenario = demoScenario();
  const demo = scenarioGame(scenario);
  const demoRanges = scenario.payoffRanges.map((r) => ({ terminalId: r.nodeId, team: r.team, distribution: r.distribution }));
  const onDemo = time(1, () => monteCarlo(demo, demoRanges, { samples: 10_000, seed: 6 }));
  rows.push({ name: '  same on the Serrin Strait demo (simultaneous stages)', measured: `${(onDemo.ms / 1000).toFixed(2)} s`, target: '-' });
}

/** The two analyses the Review and the Studio wait on, on the demo; each run compiles a fresh copy, as a pool worker does. */
function demoAnalyses() {
  const demo = scenarioGame(demoScenario());
  const moves = seededRunMoves(demo);
  const nodes = compiledGame(demo).size.toLocaleString('en');
  const fit = time(3, () => fitLogit(structuredClone(demo), moves));
  const lambdas = Object.values(fit.result.teams).map((t) => t.lambda.toPrecision(4)).join(', ');
  rows.push({ name: `logit lambda fit, Serrin Strait demo (${nodes} nodes, ${moves.length} moves of 3 teams)`, measured: `${fit.ms.toFixed(0)} ms (lambdas ${lambdas})`, target: '< 1 s', ok: fit.ms < 1000 });
  const intervals = time(1, () => sensitivity(structuredClone(demo)));
  const found = intervals.result.intervals.filter((i) => i.approximate && (i.low !== null || i.high !== null)).length;
  rows.push({
    name: `payoff intervals, every payoff of the demo (${intervals.result.intervals.length.toLocaleString('en')}, simultaneous stages)`,
    measured: `${(intervals.ms / 1000).toFixed(2)} s (${found} with a bound found)`,
    target: '< 5 s',
    ok: intervals.ms < 5000,
  });
}

function print() {
  const header: Row = { name: 'benchmark', measured: 'measured', target: 'target' };
  const width = (key: 'name' | 'measured' | 'target') => Math.max(...[header, ...rows].map((r) => r[key].length));
  const line = (r: Row) => `${r.name.padEnd(width('name'))}  ${r.measured.padEnd(width('measured'))}  ${r.target.padEnd(width('target'))}  ${r.ok === undefined ? '' : r.ok ? 'met' : 'MISSED'}`;
  console.log(line(header));
  console.log('-'.repeat(width('name') + width('measured') + width('target') + 12));
  for (const r of rows) console.log(line(r));
  console.log(`\nNode ${process.version}, ${new Date().toISOString().slice(0, 10)}`);
}

for (const [name, run] of [
  ['float backward induction', floatInduction],
  ['exact backward induction', exactInduction],
  ['8x8 bimatrix', bimatrix],
  ['logit QRE', qre],
  ['Monte Carlo', monteCarloRuns],
  ['demo lambda fit and payoff intervals', demoAnalyses],
] as const) {
  process.stderr.write(`running: ${name}\n`);
  run();
}
print();
