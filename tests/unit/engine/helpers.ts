import { parsePlainGame, type Game } from '../../../src/lib/engine';
import { CHANCE, TERMINAL, compiledGame } from '../../../src/lib/engine/compile';
import type { Field } from '../../../src/lib/engine/numbers';
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
