/**
 * The fast paths of the lambda fit, the QRE and the payoff intervals give the answers of a
 * straightforward reference (no published source: these compare our code with itself).
 *  - A QRE workspace solved again at new lambdas re-computes only the subtrees where a
 *    changed team moves; it must equal a fresh solve exactly.
 *  - fitLogit evaluates the likelihood on one workspace and refines each lambda by Brent's
 *    method; the reference evaluates every trial with a fresh logitQre and refines by
 *    golden-section search (24 steps), as fitLogit did before.
 *  - The numerical payoff intervals keep one live roll-up, stop re-solving where a part's
 *    value is unchanged, skip searches no choice can feel, and try the doubling steps four
 *    apart; the reference builds a new roll-up for every trial payoff and tries every step.
 */
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { childEdges, choiceKey, fitLogit, isPerfectInformation, logitQre, qreFlat, sensitivity, TERMINAL, type DecisionNode, type Game, type Observation } from '../../../src/lib/engine';
import { compiledGame, sourceOf } from '../../../src/lib/engine/compile';
import { floatField } from '../../../src/lib/engine/numbers';
import { QreWorkspace } from '../../../src/lib/engine/solvers/qre';
import { RollUpSession } from '../../../src/lib/engine/solvers/subgame-perfect';
import { parseScenario, scenarioGame } from '../../../src/lib/scenario';
import { plain } from './helpers';

const TEAMS = ['A', 'B', 'C'];

type Plain =
  | { payoffs: number[] }
  | { team: string; infoset?: string; stage?: true; actions: { label: string; next: Plain }[] }
  | { chance: { label: string; p: string; next: Plain }[] };

const labels = (n: number) => Array.from({ length: n }, (_, k) => `a${k}`);

/** Random trees of decisions, chance nodes and two-team simultaneous stages (small integer payoffs, so ties happen). */
function tree(teams: number, depth: number): fc.Arbitrary<Plain> {
  const leaf = fc.array(fc.integer({ min: -4, max: 4 }), { minLength: teams, maxLength: teams }).map((payoffs): Plain => ({ payoffs }));
  if (depth === 0) return leaf;
  const child = tree(teams, depth - 1);
  const decision = fc
    .record({ team: fc.nat(teams - 1), children: fc.array(child, { minLength: 1, maxLength: 3 }) })
    .map(({ team, children }): Plain => ({ team: TEAMS[team]!, actions: children.map((next, k) => ({ label: `a${k}`, next })) }));
  const chance = fc.array(fc.tuple(fc.integer({ min: 1, max: 4 }), child), { minLength: 2, maxLength: 3 }).map((outcomes): Plain => {
    const total = outcomes.reduce((s, [w]) => s + w, 0);
    return { chance: outcomes.map(([w, next], k) => ({ label: `c${k}`, p: `${w}/${total}`, next })) };
  });
  const stage = fc
    .record({ row: fc.nat(teams - 1), shift: fc.integer({ min: 1, max: teams - 1 }), rows: fc.integer({ min: 2, max: 3 }), cols: fc.integer({ min: 2, max: 3 }) })
    .chain(({ row, shift, rows, cols }) =>
      fc.array(child, { minLength: rows * cols, maxLength: rows * cols }).map(
        (cells): Plain => ({
          team: TEAMS[row]!,
          stage: true,
          actions: labels(rows).map((label, i) => ({
            label,
            next: { team: TEAMS[(row + shift) % teams]!, actions: labels(cols).map((l, j) => ({ label: l, next: cells[i * cols + j]! })) },
          })),
        }),
      ),
    );
  return fc.oneof({ weight: 1, arbitrary: leaf }, { weight: 2, arbitrary: decision }, { weight: 1, arbitrary: chance }, { weight: 2, arbitrary: stage });
}

/** Give each stage's second movers one information set of their own. */
function numberStages(node: Plain, counter = { next: 0 }): Plain {
  if ('payoffs' in node) return node;
  if ('chance' in node) return { chance: node.chance.map((o) => ({ ...o, next: numberStages(o.next, counter) })) };
  const { stage, ...rest } = node;
  const infoset = stage ? `h${counter.next++}` : undefined;
  return {
    ...rest,
    actions: node.actions.map((a) => {
      const next = numberStages(a.next, counter);
      return { ...a, next: infoset && 'actions' in next ? { ...next, infoset } : next };
    }),
  };
}

const gamesOfDepth = (depth: number) =>
  fc.integer({ min: 2, max: 3 }).chain((teams) => tree(teams, depth).map((root) => plain(TEAMS.slice(0, teams), numberStages(root))));
const games = gamesOfDepth(3);

describe('a QRE workspace solved again', () => {
  it('gives exactly what a fresh solve gives, whichever lambdas change between solves', () => {
    const lambda = fc.constantFrom(0, 0.3, 1, 2.5, 8, 40);
    fc.assert(
      fc.property(games, fc.array(fc.array(lambda, { minLength: 3, maxLength: 3 }), { minLength: 2, maxLength: 6 }), (game, trials) => {
        const flat = compiledGame(game);
        const workspace = new QreWorkspace(flat);
        for (const trial of trials) {
          const lambdas = trial.slice(0, flat.teams);
          const reused = workspace.solve(lambdas);
          const fresh = qreFlat(flat, lambdas);
          expect(Array.from(reused.probs)).toEqual(Array.from(fresh.probs));
          expect(Array.from(reused.value)).toEqual(Array.from(fresh.value));
          expect(reused.converged).toBe(fresh.converged);
        }
      }),
      { numRuns: 120 },
    );
  });
});

/** Maximum-likelihood lambdas the straightforward way: a fresh logitQre per trial, grid then 24 golden-section steps. */
function referenceFit(game: Game, observations: Observation[]) {
  const nodeOf = (o: Observation) => sourceOf(compiledGame(game)).nodes.find((n) => n.id === o.node) as DecisionNode;
  const keyOf = (o: Observation) => choiceKey(nodeOf(o));
  const teamOf = (o: Observation) => game.teams.findIndex((t) => t.id === nodeOf(o).team);
  const likelihood = (lambdas: number[], team?: number) => {
    const { behaviour } = logitQre(game, { lambda: Object.fromEntries(game.teams.map((t, i) => [t.id, lambdas[i]!])) });
    return observations.reduce((sum, o) => (team === undefined || teamOf(o) === team ? sum + Math.log(behaviour[keyOf(o)]![o.label]!) : sum), 0);
  };
  const flat = compiledGame(game);
  const range = Math.max(...flat.payoff) - Math.min(...flat.payoff);
  let maxLambda = 200 / Math.max(range, 1e-9);
  const observed = game.teams.map((_, t) => observations.some((o) => teamOf(o) === t));
  for (let widening = 0; ; widening++) {
    const lambdas = game.teams.map(() => 0);
    for (let sweep = 0; sweep < 2; sweep++) {
      game.teams.forEach((_, t) => {
        if (observed[t]) lambdas[t] = goldenMaximum((x) => likelihood(lambdas.map((l, s) => (s === t ? x : l))), maxLambda);
      });
    }
    if (!lambdas.some((l) => l > 0.99 * maxLambda) || widening === 3) return { lambdas, likelihood };
    maxLambda *= 10;
  }
}

/** The one-team search fitLogit made before Brent's method: a geometric grid, then 24 golden-section steps. */
function goldenMaximum(f: (x: number) => number, max: number): number {
  const grid = [0, ...Array.from({ length: 16 }, (_, k) => max * 10 ** (-3 + (3 * k) / 15))];
  const values = grid.map(f);
  let best = 0;
  values.forEach((v, k) => {
    if (v > values[best]!) best = k;
  });
  let a = grid[Math.max(0, best - 1)]!;
  let b = grid[Math.min(grid.length - 1, best + 1)]!;
  const phi = (Math.sqrt(5) - 1) / 2;
  let [c, d] = [b - phi * (b - a), a + phi * (b - a)];
  let [fc, fd] = [f(c), f(d)];
  for (let k = 0; k < 24; k++) {
    if (fc > fd) {
      [b, d, fd] = [d, c, fc];
      c = b - phi * (b - a);
      fc = f(c);
    } else {
      [a, c, fc] = [c, d, fd];
      d = a + phi * (b - a);
      fd = f(d);
    }
  }
  const refined = (a + b) / 2;
  return f(refined) >= values[best]! ? refined : grid[best]!;
}

/** Moves of one team at random decision nodes of the game, or none when the team never moves. */
function movesOf(game: Game, team: number, picks: [number, number][]): Observation[] {
  const decisions = sourceOf(compiledGame(game)).nodes.filter((n) => n.kind === 'decision' && n.team === game.teams[team % game.teams.length]!.id);
  if (decisions.length === 0) return [];
  return picks.map(([n, a]) => {
    const node = decisions[n % decisions.length]!;
    return { node: node.id, label: node.kind === 'decision' ? node.actions[a % node.actions.length]!.label : '' };
  });
}

/** The teams' moves along a line of labels from the root (chance outcomes are passed through). */
function movesAlong(game: Game, line: string[]): Observation[] {
  const moves: Observation[] = [];
  let node = game.root;
  for (const label of line) {
    const edge = childEdges(node).find((e) => e.label === label)!;
    if (node.kind === 'decision') moves.push({ node: node.id, label });
    node = edge.next;
  }
  return moves;
}

function demoGame(): Game {
  const parsed = parseScenario(JSON.parse(readFileSync('scenarios/serrin-strait.json', 'utf8')));
  if (!parsed.ok) throw new Error('demo scenario does not parse');
  return scenarioGame(parsed.scenario);
}

function expectSameFit(game: Game, observations: Observation[]): number {
  const fast = fitLogit(game, observations);
  const { lambdas, likelihood } = referenceFit(game, observations);
  let pinned = 0;
  expect(fast.logLikelihood).toBeCloseTo(likelihood(lambdas), 6);
  game.teams.forEach((team, t) => {
    expect(fast.teams[team.id]!.logLikelihood).toBeCloseTo(likelihood(lambdas, t), 6);
    // Pinned down: moving this lambda by 1% costs more than 1e-8 of likelihood.
    const moved = (factor: number) => likelihood(lambdas.map((l, s) => (s === t ? l * factor : l)));
    if (Math.min(likelihood(lambdas) - moved(0.99), likelihood(lambdas) - moved(1.01)) < 1e-8) return;
    pinned++;
    expect(fast.teams[team.id]!.lambda).toBeCloseTo(lambdas[t]!, -Math.log10(1e-4 * lambdas[t]!));
  });
  return pinned;
}

describe('the lambda fit', () => {
  // With one team observed the fit is one search per sweep, so the two must meet. With
  // several, each search starts from the others' previous results, and where the
  // likelihood is flat (play as rational as can be told) the two may stop at different
  // points of the flat and carry that on: the several-team check is the demo's.
  it("finds one team's likelihood and lambda as the straightforward search does", () => {
    const picks = fc.array(fc.tuple(fc.nat(40), fc.nat(2)), { minLength: 1, maxLength: 8 });
    let pinned = 0;
    fc.assert(
      fc.property(games, fc.nat(2), picks, (game, team, chosen) => {
        const observations = movesOf(game, team, chosen);
        fc.pre(observations.length > 0);
        pinned += expectSameFit(game, observations);
      }),
      { numRuns: 80 },
    );
    expect(pinned).toBeGreaterThan(20);
  });

  it('finds the three teams\' lambdas of the demo exercise as the straightforward search does', () => {
    const demo = demoGame();
    // The line of play of the seeded run (server/seed/exercises.ts).
    const line = ['Climb to Exclusion zone', 'Hold at Exclusion zone', 'Stand aside', 'Collision between patrol vessels', 'Step down to Exclusion zone', 'Climb to Partial blockade', 'Broker a settlement'];
    const observations = movesAlong(demo, line);
    const fast = fitLogit(demo, observations);
    const { lambdas, likelihood } = referenceFit(demo, observations);
    expect(fast.logLikelihood).toBeCloseTo(likelihood(lambdas), 6);
    demo.teams.forEach((team, t) => {
      expect(fast.teams[team.id]!.logLikelihood).toBeCloseTo(likelihood(lambdas, t), 6);
      expect(Math.abs(fast.teams[team.id]!.lambda / lambdas[t]! - 1)).toBeLessThan(1e-4);
    });
  });
});

function tried<T>(f: () => T): T | null {
  try {
    return f();
  } catch {
    return null;
  }
}

/** Payoff intervals the straightforward way: a new roll-up for every trial payoff, every doubling step tried. */
function referenceIntervals(game: Game) {
  const flat = compiledGame(game);
  const payoff = Array.from(flat.payoff);
  const prob = Array.from(flat.prob);
  const session = (values: number[]) => new RollUpSession(flat, floatField, { payoff: values, prob });
  const base = session(payoff);
  const scale = Math.max(Math.max(...payoff) - Math.min(...payoff), 1);
  const resolution = 10 ** Math.floor(Math.log10(scale * 1e-6));
  const decimals = Math.max(0, -Math.round(Math.log10(resolution)));
  const out: { terminalId: string; team: string; low: number | null; high: number | null; monotone: boolean }[] = [];
  for (let z = 0; z < flat.size; z++) {
    if (flat.mover[z] !== TERMINAL) continue;
    const chain = base.chainAbove(z);
    const signature = base.playSignature(chain);
    for (let t = 0; t < flat.teams; t++) {
      const row = flat.aux[z]! * flat.teams + t;
      const x0 = payoff[row]!;
      const same = (x: number) => session(payoff.map((v, k) => (k === row ? x : v))).playSignature(chain) === signature;
      const bound = (direction: 1 | -1) => {
        const steps = Array.from({ length: 17 }, (_, k) => (scale / 1024) * 2 ** k);
        const kept = steps.map((s) => same(x0 + direction * s));
        const first = kept.indexOf(false);
        const monotone = first < 0 || kept.slice(first).every((k) => !k);
        if (first < 0) return { value: null, monotone };
        let [inside, outside] = [first === 0 ? 0 : steps[first - 1]!, steps[first]!];
        while (outside - inside > resolution / 4) {
          const mid = (inside + outside) / 2;
          if (same(x0 + direction * mid)) inside = mid;
          else outside = mid;
        }
        return { value: Number((x0 + (direction * (inside + outside)) / 2).toFixed(decimals)), monotone };
      };
      const [high, low] = [bound(1), bound(-1)];
      out.push({ terminalId: sourceOf(flat).nodes[z]!.id, team: game.teams[t]!.id, low: low.value, high: high.value, monotone: low.monotone && high.monotone });
    }
  }
  return out;
}

describe('numerical payoff intervals', () => {
  it('are those of the straightforward search wherever play, once changed, stays changed along the doubling steps', () => {
    let compared = 0;
    fc.assert(
      fc.property(gamesOfDepth(2), (game) => {
        fc.pre(!isPerfectInformation(compiledGame(game)) && compiledGame(game).size <= 40);
        const reference = tried(() => referenceIntervals(game));
        // Float support enumeration can miss the equilibria of a nearly degenerate stage met at some trial payoff; such games say nothing here.
        fc.pre(reference !== null);
        const fast = sensitivity(game).intervals;
        reference.forEach((expected, k) => {
          expect(fast[k]).toMatchObject({ terminalId: expected.terminalId, team: expected.team });
          if (!expected.monotone) return;
          compared++;
          expect({ low: fast[k]!.low, high: fast[k]!.high }).toEqual({ low: expected.low, high: expected.high });
        });
      }),
      { numRuns: 20 },
    );
    expect(compared).toBeGreaterThan(100);
  }, 60_000);
});
