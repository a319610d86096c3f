import fc from 'fast-check';
import { childEdges, choiceKey, indexGame, logitQre, nodeById, parsePlainGame, type Game, type GameNode, type Observation } from '../../../src/lib/engine';
import { CHANCE, TERMINAL, compiledGame, sourceOf } from '../../../src/lib/engine/compile';
import { Fraction, toExact, type Field } from '../../../src/lib/engine/numbers';
import { numbersOf } from '../../../src/lib/engine/profile';
import type { ReducedGame, ReducedInfoset, ReducedNode } from '../../../src/lib/engine/reduced';
import { scenarioGame } from '../../../src/lib/scenario';
import { demoScenario } from '../../../server/seed/demo-scenario';
export { seededRunMoves } from '../../../server/seed/demo-run';

type Pay = number | string;

/** A game from the plain tree format; fails the test on faults. */
export function plain(teams: string[], root: unknown): Game {
  const parsed = parsePlainGame({ teams, root });
  if (!parsed.ok) throw new Error(parsed.faults.map((f) => `${f.path}: ${f.message}`).join('\n'));
  return parsed.game;
}

/** A two-team simultaneous stage as a tree: the row team moves, the column team chooses in one information set. */
export function simultaneous(teams: [string, string], rows: string[], cols: string[], payoffs: [Pay, Pay][][]): Game {
  return plain(teams, {
    team: teams[0],
    actions: rows.map((r, i) => ({
      label: r,
      next: { team: teams[1], infoset: 'stage', actions: cols.map((c, j) => ({ label: c, next: { payoffs: payoffs[i]![j]! } })) },
    })),
  });
}

/** The whole game as one reduced game (no subgame decomposition): for Nash checks in tests. */
export function wholeGame<T>(game: Game, field: Field<T>): ReducedGame<T> {
  const flat = compiledGame(game);
  const { payoff, prob } = numbersOf(flat, field);
  const nodes: ReducedNode<T>[] = [];
  const infosets = new Map<number, ReducedInfoset>();
  for (let i = 0; i < flat.size; i++) {
    const children: number[] = [];
    for (let c = flat.childStart[i]!; c < flat.childStart[i + 1]!; c++) children.push(c);
    if (flat.mover[i] === TERMINAL) nodes.push({ kind: 'leaf', value: payoff.slice(flat.aux[i]! * flat.teams, (flat.aux[i]! + 1) * flat.teams), children });
    else if (flat.mover[i] === CHANCE) nodes.push({ kind: 'chance', probs: prob.slice(flat.aux[i]!, flat.aux[i]! + children.length), children });
    else {
      nodes.push({ kind: 'decision', team: flat.mover[i]!, infoset: flat.aux[i]!, children });
      const h = infosets.get(flat.aux[i]!) ?? { team: flat.mover[i]!, actions: children.length, members: [] };
      h.members.push(i);
      infosets.set(flat.aux[i]!, h);
    }
  }
  return { teams: flat.teams, nodes, infosets };
}

type Decision = Extract<GameNode, { kind: 'decision' }>;

export interface BruteForceProfile {
  /** Action index at every decision node. */
  choice: Map<GameNode, number>;
  /** What happens at every node reached with positive probability, as text: equal texts are one play. */
  play: string;
  /** Expected payoffs at the root (team order), exact. */
  payoffs: string[];
}

/**
 * Every pure strategy profile of a perfect-information game that is subgame perfect, by
 * brute force: all profiles, each checked for the one-shot deviation condition at every
 * decision node. For small trees only.
 */
export function bruteForceEquilibria(game: Game): BruteForceProfile[] {
  const decisions = indexGame(game).nodes.filter((n): n is Decision => n.kind === 'decision');
  const teamIndex = new Map(game.teams.map((t, i) => [t.id, i]));
  const found: BruteForceProfile[] = [];
  const picks = decisions.map(() => 0);
  for (;;) {
    const choice = new Map<GameNode, number>(decisions.map((d, k) => [d, picks[k]!]));
    const valueOf = profileValuer(game, choice);
    const perfect = decisions.every((d) => {
      const m = teamIndex.get(d.team)!;
      const mine = valueOf(d)[m]!;
      return childEdges(d).every((e) => valueOf(e.next)[m]!.compare(mine) <= 0);
    });
    if (perfect) found.push({ choice, play: playOf(game.root, choice), payoffs: valueOf(game.root).map((v) => v.toFraction()) });
    let k = picks.length - 1;
    while (k >= 0 && picks[k]! + 1 >= decisions[k]!.actions.length) picks[k--] = 0;
    if (k < 0) return found;
    picks[k]!++;
  }
}

function profileValuer(game: Game, choice: Map<GameNode, number>): (node: GameNode) => Fraction[] {
  const values = new Map<GameNode, Fraction[]>();
  const valueOf = (node: GameNode): Fraction[] => {
    const known = values.get(node);
    if (known) return known;
    let v: Fraction[];
    if (node.kind === 'terminal') v = game.teams.map((t) => toExact(node.payoffs![t.id]!));
    else if (node.kind === 'chance') {
      v = game.teams.map(() => new Fraction(0));
      for (const o of node.outcomes) valueOf(o.next).forEach((x, t) => (v[t] = v[t]!.add(x.mul(toExact(o.p)))));
    } else v = valueOf(node.actions[choice.get(node)!]!.next);
    values.set(node, v);
    return v;
  };
  return valueOf;
}

function playOf(node: GameNode, choice: Map<GameNode, number>): string {
  if (node.kind === 'terminal') return node.id;
  if (node.kind === 'decision') return `${node.id}=${choice.get(node)}(${playOf(node.actions[choice.get(node)!]!.next, choice)})`;
  const reached = node.outcomes.filter((o) => toExact(o.p).compare(0) > 0);
  return `${node.id}[${reached.map((o) => playOf(o.next, choice)).join(',')}]`;
}

const TEAMS = ['A', 'B', 'C'];

export type Plain =
  | { payoffs: number[] }
  | { team: string; infoset?: string; stage?: true; actions: { label: string; next: Plain }[] }
  | { chance: { label: string; p: string; next: Plain }[] };

const labels = (n: number) => Array.from({ length: n }, (_, k) => `a${k}`);

/** Random trees of decisions, chance nodes and two-team simultaneous stages (small integer payoffs, so ties happen). */
export function tree(teams: number, depth: number): fc.Arbitrary<Plain> {
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

/** Random games of two or three teams: decisions, chance and simultaneous stages down to `depth`. */
export const gamesOfDepth = (depth: number) =>
  fc.integer({ min: 2, max: 3 }).chain((teams) => tree(teams, depth).map((root) => plain(TEAMS.slice(0, teams), numberStages(root))));


/** The demo scenario's game (scenarios/serrin-strait.json). */
export function demoGame(): Game {
  return scenarioGame(demoScenario());
}

/** Moves at decision nodes picked by [node, action] numbers (modulo what there is), of one team or, without `team`, of any. */
export function movesAt(game: Game, picks: [number, number][], team?: number): Observation[] {
  const decisions = sourceOf(compiledGame(game)).nodes.filter(
    (n): n is Extract<GameNode, { kind: 'decision' }> => n.kind === 'decision' && (team === undefined || n.team === game.teams[team % game.teams.length]!.id),
  );
  if (decisions.length === 0) return [];
  return picks.map(([n, a]) => {
    const node = decisions[n % decisions.length]!;
    return { node: node.id, label: node.actions[a % node.actions.length]!.label };
  });
}

/**
 * Log-likelihood of moves under a fresh logitQre at per-team lambdas (team order); of one
 * team's moves with `team`. -Infinity where the QRE cannot be traced, as in fitLogit.
 */
export function freshLikelihood(game: Game, observations: Observation[], lambdas: number[], team?: number): number {
  const { behaviour, converged } = logitQre(game, { lambda: Object.fromEntries(game.teams.map((t, i) => [t.id, lambdas[i]!])) });
  if (!converged) return -Infinity;
  return observations.reduce((sum, o) => {
    const node = nodeById(game, o.node!) as Extract<GameNode, { kind: 'decision' }>;
    if (team !== undefined && node.team !== game.teams[team]!.id) return sum;
    return sum + Math.log(behaviour[choiceKey(node)]![o.label]!);
  }, 0);
}
