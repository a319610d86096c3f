/**
 * Pure Nash equilibria of a small game with any number of teams and imperfect
 * information, by enumerating every pure profile and checking each team's best response
 * (computed by dynamic programming over its information sets, valid under perfect recall).
 */
import type { Field } from '../numbers';
import { reducedValues, type ReducedGame, type ReducedProfile, type ReducedSolution } from '../reduced';

/** Largest amount of work (profiles times nodes) the enumeration takes on. */
export const PURE_ENUMERATION_BUDGET = 20_000_000;

export class MethodDoesNotApply extends Error {}

export function pureEquilibria<T>(field: Field<T>, game: ReducedGame<T>): ReducedSolution<T>[] {
  const sets = [...game.infosets.entries()];
  const profiles = sets.reduce((n, [, h]) => n * h.actions, 1);
  if (profiles * game.nodes.length > PURE_ENUMERATION_BUDGET) {
    throw new MethodDoesNotApply(
      `this part of the game has ${profiles} pure strategy profiles for more than two teams with imperfect information; ` +
        'only small games of that kind can be searched for pure equilibria',
    );
  }
  const picks = sets.map(() => 0);
  const found: ReducedSolution<T>[] = [];
  for (;;) {
    const profile: ReducedProfile<T> = new Map(
      sets.map(([id, h], s) => [id, Array.from({ length: h.actions }, (_, k) => (k === picks[s] ? field.one : field.zero))]),
    );
    const values = reducedValues(field, game, profile);
    const root = values[0]!;
    const stable = teamsThatMove(game).every((t) => field.cmp(bestResponseValue(field, game, profile, t), root[t]!) <= 0);
    if (stable) found.push({ profile, value: root });
    let s = sets.length - 1;
    while (s >= 0 && picks[s]! + 1 >= sets[s]![1].actions) picks[s--] = 0;
    if (s < 0) return found;
    picks[s]!++;
  }
}

function teamsThatMove<T>(game: ReducedGame<T>): number[] {
  return [...new Set([...game.infosets.values()].map((h) => h.team))];
}

/**
 * The best payoff team t can reach against the others' behaviour: at each of t's
 * information sets pick the action maximising the reach-weighted continuation value.
 */
export function bestResponseValue<T>(field: Field<T>, game: ReducedGame<T>, profile: ReducedProfile<T>, team: number): T {
  const reach = othersReach(field, game, profile, team);
  const value = new Map<number, T>();
  const choice = new Map<number, number>();
  const valueOf = (i: number): T => {
    const known = value.get(i);
    if (known !== undefined) return known;
    const node = game.nodes[i]!;
    let v: T;
    if (node.kind === 'leaf') v = node.value![team]!;
    else if (node.kind === 'decision' && node.team === team) v = valueOf(node.children[choiceAt(node.infoset!)]!);
    else {
      const weights = node.kind === 'chance' ? node.probs! : profile.get(node.infoset!)!;
      v = node.children.reduce((sum, c, k) => (field.cmp(weights[k]!, field.zero) === 0 ? sum : field.add(sum, field.mul(weights[k]!, valueOf(c)))), field.zero);
    }
    value.set(i, v);
    return v;
  };
  const choiceAt = (infoset: number): number => {
    const known = choice.get(infoset);
    if (known !== undefined) return known;
    const h = game.infosets.get(infoset)!;
    let best = 0;
    let bestValue: T | null = null;
    for (let k = 0; k < h.actions; k++) {
      const total = h.members.reduce((sum, x) => field.add(sum, field.mul(reach[x]!, valueOf(game.nodes[x]!.children[k]!))), field.zero);
      if (bestValue === null || field.cmp(total, bestValue) > 0) {
        best = k;
        bestValue = total;
      }
    }
    choice.set(infoset, best);
    return best;
  };
  return valueOf(0);
}

/** Probability of reaching each node from chance and the other teams' moves only. */
function othersReach<T>(field: Field<T>, game: ReducedGame<T>, profile: ReducedProfile<T>, team: number): T[] {
  const reach: T[] = new Array(game.nodes.length).fill(field.zero);
  reach[0] = field.one;
  game.nodes.forEach((node, i) => {
    if (node.kind === 'leaf') return;
    node.children.forEach((c, k) => {
      const w = node.kind === 'chance' ? node.probs![k]! : node.team === team ? field.one : profile.get(node.infoset!)![k]!;
      reach[c] = field.mul(reach[i]!, w);
    });
  });
  return reach;
}
