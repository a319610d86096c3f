/**
 * The line of play of the seeded finished run (exercises.ts) as the Review fits it: the
 * teams' own ladder moves; the adjudicated hold and the chance draw are passed through.
 * For the tests and the benches that measure the Review's lambda fit on the demo.
 */
import { childEdges, type Game, type Observation } from '../../src/lib/engine';

const LINE: [label: string, fitted: boolean][] = [
  ['Climb to Exclusion zone', true],
  ['Hold at Exclusion zone', false],
  ['Stand aside', true],
  ['Collision between patrol vessels', false],
  ['Step down to Exclusion zone', true],
  ['Climb to Partial blockade', true],
  ['Broker a settlement', true],
];

export function seededRunMoves(game: Game): Observation[] {
  const moves: Observation[] = [];
  let node = game.root;
  for (const [label, fitted] of LINE) {
    const edge = childEdges(node).find((e) => e.label === label);
    if (!edge) throw new Error(`the demo tree has no "${label}" at ${node.id}`);
    if (fitted) moves.push({ node: node.id, label });
    node = edge.next;
  }
  return moves;
}
