/**
 * The compiled flat form every solver shares: nodes in breadth-first order, so the
 * children of a node are contiguous and every parent comes before its children (a
 * reverse scan is a bottom-up pass). Typed arrays only, no per-node objects:
 *   mover[i]       -1 terminal, -2 chance, t >= 0 decision of team t
 *   childStart[i]  children of i are childStart[i] .. childStart[i+1]-1
 *   aux[i]         terminal: payoff row; chance: offset of its outcome probabilities
 *                  in `prob`; decision: information-set index
 *   payoff         one row of `teams` floats per terminal
 *   prob           probabilities of the outcomes of chance nodes, in child order
 */
import type { Fraction } from './numbers';
import { toExact } from './numbers';
import { childEdges, type Game, type GameNode } from './model';
import { payoffScorer } from './scoring';
import { choiceKey } from './tree';

export const TERMINAL = -1;
export const CHANCE = -2;

export interface FlatGame {
  teams: number;
  size: number;
  mover: Int8Array;
  childStart: Int32Array;
  aux: Int32Array;
  payoff: Float64Array;
  prob: Float64Array;
  infosetCount: number;
  /** Set when compiled from a model: how flat indices map back to it. */
  source?: FlatSource;
}

export interface FlatSource {
  game: Game;
  /** Model node of every flat index. */
  nodes: GameNode[];
  /** Flat index of every model node id. */
  indexOf: Map<string, number>;
  /** Choice key (infoset id or node id) of every information-set index. */
  infosetKeys: string[];
  /** Flat index of one member of every information set. */
  infosetFirst: Int32Array;
  /** Exact payoffs and probabilities, parallel to `payoff` and `prob`. */
  payoffExact: Fraction[];
  probExact: Fraction[];
}

/** Compile a validated game. */
export function compile(game: Game): FlatGame {
  const nodes = breadthFirst(game.root);
  const size = nodes.length;
  const teams = game.teams.length;
  const teamIndex = new Map(game.teams.map((t, i) => [t.id, i]));
  const mover = new Int8Array(size);
  const childStart = new Int32Array(size + 1);
  const aux = new Int32Array(size);
  const indexOf = new Map<string, number>();
  const infosetOf = new Map<string, number>();
  const infosetKeys: string[] = [];
  const infosetFirstList: number[] = [];
  const payoffExact: Fraction[] = [];
  const probExact: Fraction[] = [];
  const score = payoffScorer(game);
  let next = 1;
  nodes.forEach((node, i) => {
    indexOf.set(node.id, i);
    childStart[i] = next;
    next += childEdges(node).length;
    if (node.kind === 'terminal') {
      mover[i] = TERMINAL;
      aux[i] = payoffExact.length / teams;
      payoffExact.push(...score(node));
    } else if (node.kind === 'chance') {
      mover[i] = CHANCE;
      aux[i] = probExact.length;
      for (const o of node.outcomes) probExact.push(toExact(o.p));
    } else {
      mover[i] = teamIndex.get(node.team)!;
      const key = choiceKey(node);
      let set = infosetOf.get(key);
      if (set === undefined) {
        set = infosetKeys.length;
        infosetOf.set(key, set);
        infosetKeys.push(key);
        infosetFirstList.push(i);
      }
      aux[i] = set;
    }
  });
  childStart[size] = next;
  return {
    teams,
    size,
    mover,
    childStart,
    aux,
    payoff: Float64Array.from(payoffExact, (f) => f.valueOf()),
    prob: Float64Array.from(probExact, (f) => f.valueOf()),
    infosetCount: infosetKeys.length,
    source: {
      game,
      nodes,
      indexOf,
      infosetKeys,
      infosetFirst: Int32Array.from(infosetFirstList),
      payoffExact,
      probExact,
    },
  };
}

function breadthFirst(root: GameNode): GameNode[] {
  const order: GameNode[] = [root];
  for (let head = 0; head < order.length; head++) {
    for (const edge of childEdges(order[head]!)) order.push(edge.next);
  }
  return order;
}

const compiled = new WeakMap<Game, FlatGame>();

/** compile(), cached per game object. */
export function compiledGame(game: Game): FlatGame {
  let flat = compiled.get(game);
  if (!flat) {
    flat = compile(game);
    compiled.set(game, flat);
  }
  return flat;
}

/** The model source of a flat game, or a clear error for a game generated flat. */
export function sourceOf(flat: FlatGame): FlatSource {
  if (!flat.source) throw new Error('this flat game was not compiled from a model, so it has no node ids or labels');
  return flat.source;
}

/** Label of the edge from the parent into flat node `child` (by position among its siblings). */
export function edgeLabel(source: FlatSource, parent: number, position: number): string {
  return childEdges(source.nodes[parent]!)[position]!.label;
}

/** True when every information set has a single member. */
export function isPerfectInformation(flat: FlatGame): boolean {
  let decisions = 0;
  for (let i = 0; i < flat.size; i++) if (flat.mover[i]! >= 0) decisions++;
  return decisions === flat.infosetCount;
}

/** Parent of every flat node (-1 for the root). */
export function parentsOf(flat: FlatGame): Int32Array {
  const parent = new Int32Array(flat.size).fill(-1);
  for (let i = 0; i < flat.size; i++) {
    for (let c = flat.childStart[i]!; c < flat.childStart[i + 1]!; c++) parent[c] = i;
  }
  return parent;
}
