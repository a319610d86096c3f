import { childEdges, indexGame, parsePlainGame, type Game, type GameNode } from '../../../src/lib/engine';
import { CHANCE, TERMINAL, compiledGame } from '../../../src/lib/engine/compile';
import { Fraction, toExact, type Field } from '../../../src/lib/engine/numbers';
import { numbersOf } from '../../../src/lib/engine/profile';
import type { ReducedGame, ReducedInfoset, ReducedNode } from '../../../src/lib/engine/reduced';

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
