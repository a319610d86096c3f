/**
 * A reduced subgame: the part of a proper subgame above its nested proper subgames, which
 * appear as leaves carrying their (already solved) values. The subgame-perfect roll-up
 * hands these to the equilibrium solvers, so the solvers need no knowledge of the tree
 * they came from.
 */
import type { Field } from './numbers';

export interface ReducedNode<T> {
  kind: 'leaf' | 'chance' | 'decision';
  /** Leaf value per team. */
  value?: T[];
  /** Chance probabilities, in child order. */
  probs?: T[];
  team?: number;
  /** Information-set index (as in the compiled game). */
  infoset?: number;
  children: number[];
}

export interface ReducedInfoset {
  team: number;
  actions: number;
  members: number[];
}

export interface ReducedGame<T> {
  teams: number;
  /** Local nodes; node 0 is the root; parents come before children. */
  nodes: ReducedNode<T>[];
  infosets: Map<number, ReducedInfoset>;
}

/** Behaviour at each information set of the reduced game. */
export type ReducedProfile<T> = Map<number, T[]>;

export interface ReducedSolution<T> {
  profile: ReducedProfile<T>;
  value: T[];
}

/** Values of all local nodes under a profile. */
export function reducedValues<T>(field: Field<T>, game: ReducedGame<T>, profile: ReducedProfile<T>): T[][] {
  const values: T[][] = new Array(game.nodes.length);
  for (let i = game.nodes.length - 1; i >= 0; i--) {
    const node = game.nodes[i]!;
    if (node.kind === 'leaf') {
      values[i] = node.value!;
      continue;
    }
    const weights = node.kind === 'chance' ? node.probs! : profile.get(node.infoset!)!;
    values[i] = Array.from({ length: game.teams }, (_, t) =>
      node.children.reduce((sum, c, k) => field.add(sum, field.mul(weights[k]!, values[c]![t]!)), field.zero),
    );
  }
  return values;
}

/** Teams that move somewhere in the reduced game, in index order. */
export function movers<T>(game: ReducedGame<T>): number[] {
  return [...new Set([...game.infosets.values()].map((h) => h.team))].sort((a, b) => a - b);
}
