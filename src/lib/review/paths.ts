/**
 * Walking the model tree: the line of play a record describes, and the play a
 * behaviour profile (an equilibrium, a forecast) leads to from any node.
 */
import type { PlayedMove } from '../exercise/record';
import { childEdges, choiceKey, nodeById, toFloat, type Game, type GameNode } from './engine';

/** choices[infoset or node id][action label] = probability, as the engine reports profiles. */
export type Choices = Record<string, Record<string, number>>;

/** Chance outcomes already drawn in play: node id to outcome label. */
export type Draws = Record<string, string>;

export class PlayMismatch extends Error {}

export type Line = { nodes: GameNode[]; labels: string[] };

/** Index of the edge a profile most likely takes at a decision node (the first among equals). */
export function likeliestEdge(node: GameNode, choices: Choices): number {
  if (node.kind !== 'decision') throw new Error(`node ${node.id} is not a decision`);
  const probabilities = choices[choiceKey(node)] ?? {};
  let best = 0;
  node.actions.forEach((action, k) => {
    if ((probabilities[action.label] ?? 0) > (probabilities[node.actions[best]!.label] ?? 0)) best = k;
  });
  return best;
}

function likeliestOutcome(node: GameNode, draws: Draws): number {
  if (node.kind !== 'chance') throw new Error(`node ${node.id} is not a chance node`);
  const drawn = node.outcomes.findIndex((o) => o.label === draws[node.id]);
  if (drawn >= 0) return drawn;
  let best = 0;
  node.outcomes.forEach((o, k) => {
    if (toFloat(o.p) > toFloat(node.outcomes[best]!.p)) best = k;
  });
  return best;
}

/** From `from` to a terminal, following the profile at decisions and the draws (else the likeliest outcome) at chance nodes. */
export function followProfile(from: GameNode, choices: Choices, draws: Draws = {}): Line {
  const nodes: GameNode[] = [from];
  const labels: string[] = [];
  let node = from;
  while (node.kind !== 'terminal') {
    const edge = childEdges(node)[node.kind === 'decision' ? likeliestEdge(node, choices) : likeliestOutcome(node, draws)]!;
    labels.push(edge.label);
    node = edge.next;
    nodes.push(node);
  }
  return { nodes, labels };
}

/** The nodes a record's moves pass through, checked to be one unbroken line from the root. */
export function playedLine(game: Game, moves: PlayedMove[]): Line {
  const nodes: GameNode[] = [game.root];
  const labels: string[] = [];
  for (const move of moves) {
    const here = nodes[nodes.length - 1]!;
    if (move.nodeId !== here.id) {
      const known = nodeById(game, move.nodeId) ? 'is not where play stood' : 'is not in the scenario tree';
      throw new PlayMismatch(`Move ${move.id} (turn ${move.turn}) was made at node "${move.nodeId}", which ${known} (expected "${here.id}")`);
    }
    const edge = childEdges(here).find((e) => e.label === move.label);
    if (!edge) throw new PlayMismatch(`Move ${move.id} (turn ${move.turn}) chose "${move.label}", which node "${here.id}" does not offer`);
    labels.push(move.label);
    nodes.push(edge.next);
  }
  return { nodes, labels };
}

/** The draws made in play, for continuing along the same chance outcomes. */
export function drawsOf(moves: PlayedMove[]): Draws {
  return Object.fromEntries(moves.filter((m) => m.kind === 'chance').map((m) => [m.nodeId, m.label]));
}
