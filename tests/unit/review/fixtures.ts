/** Small games from the literature and a helper that turns a line of play into a play record. */
import { type Game, type GameNode } from '../../../src/lib/engine';
import type { PlayedMove, PlayRecord } from '../../../src/lib/exercise/record';

const terminal = (id: string, a: number, b: number, outcome?: string): GameNode => ({ id, kind: 'terminal', outcome, payoffs: { first: a, second: b } });

/**
 * The four-move centipede game of McKelvey and Palfrey, "An experimental study of
 * the centipede game", Econometrica 60 (1992) 803-836 (payoffs in dollars, from memory):
 * taking at moves 1..4 pays (0.40, 0.10), (0.20, 0.80), (1.60, 0.40), (0.80, 3.20);
 * passing four times pays (6.40, 1.60). Subgame perfection: take at once (Rosenthal 1981).
 */
export const CENTIPEDE: Game = {
  teams: [
    { id: 'first', name: 'First' },
    { id: 'second', name: 'Second' },
  ],
  root: {
    id: 'n1', kind: 'decision', team: 'first', actions: [
      { label: 'Take', next: terminal('t1', 0.4, 0.1, 'First takes at once') },
      { label: 'Pass', next: {
        id: 'n2', kind: 'decision', team: 'second', actions: [
          { label: 'Take', next: terminal('t2', 0.2, 0.8, 'Second takes at move 2') },
          { label: 'Pass', next: {
            id: 'n3', kind: 'decision', team: 'first', actions: [
              { label: 'Take', next: terminal('t3', 1.6, 0.4, 'First takes at move 3') },
              { label: 'Pass', next: {
                id: 'n4', kind: 'decision', team: 'second', actions: [
                  { label: 'Take', next: terminal('t4', 0.8, 3.2, 'Second takes at move 4') },
                  { label: 'Pass', next: terminal('t5', 6.4, 1.6, 'Both pass to the end') },
                ] } },
            ] } },
        ] } },
    ],
  },
};

/**
 * The entry game of Osborne, "An Introduction to Game Theory" (Oxford UP 2004), section 5.1
 * (payoffs from memory): Out pays (1, 2); In then Acquiesce (2, 1), In then Fight (0, 0).
 * The subgame-perfect equilibrium is (In, Acquiesce); (Out, Fight) is a Nash equilibrium
 * resting on a threat that is not credible (Selten's chain-store setting).
 */
export const ENTRY: Game = {
  teams: [
    { id: 'first', name: 'Challenger' },
    { id: 'second', name: 'Incumbent' },
  ],
  root: {
    id: 'c', kind: 'decision', team: 'first', actions: [
      { label: 'In', next: {
        id: 'i', kind: 'decision', team: 'second', actions: [
          { label: 'Acquiesce', next: terminal('ia', 2, 1, 'Entry accommodated') },
          { label: 'Fight', next: terminal('if', 0, 0, 'Price war') },
        ] } },
      { label: 'Out', next: terminal('o', 1, 2, 'Challenger stays out') },
    ],
  },
};

/**
 * A made-up two-rung ladder with a chance node (no source: a hand-made check of the
 * bookkeeping). Blue may Hold or Raise; after Raise a storm (p = 1/4) or calm decides
 * whether Red meets a harbour closure; Red may Back down or Match.
 */
export const LADDER: Game = {
  teams: [
    { id: 'first', name: 'Blue' },
    { id: 'second', name: 'Red' },
  ],
  rungs: [
    { key: 'protest', name: 'Protest', intensity: 1, description: '' },
    { key: 'patrol', name: 'Patrol', intensity: 2, description: '' },
    { key: 'closure', name: 'Harbour closure', intensity: 4, description: '' },
  ],
  root: {
    id: 'b', kind: 'decision', team: 'first', actions: [
      { label: 'Hold', rung: 0, next: terminal('b.hold', 1, 1, 'Talks') },
      { label: 'Raise', rung: 1, next: {
        id: 'w', kind: 'chance', outcomes: [
          { label: 'Storm', p: '1/4', next: terminal('w.storm', 0, 0, 'Storm ends the standoff') },
          { label: 'Calm', p: '3/4', next: {
            id: 'r', kind: 'decision', team: 'second', actions: [
              { label: 'Back down', rung: 1, next: terminal('r.back', 3, -1, 'Red backs down') },
              { label: 'Match', rung: 2, next: terminal('r.match', -2, -2, 'Closure and clash') },
            ] } },
        ] } },
    ],
  },
};

/** LADDER with other payoffs for Blue's Hold and Red's Match (Blue's, Red's). */
export function ladderVariant(payoffs: { hold: [number, number]; match: [number, number] }): Game {
  const game = structuredClone(LADDER);
  const set = (node: GameNode | undefined, [a, b]: [number, number]) => {
    if (node?.kind === 'terminal') node.payoffs = { first: a, second: b };
  };
  set(find(game.root, 'b.hold'), payoffs.hold);
  set(find(game.root, 'r.match'), payoffs.match);
  return game;
}

/** A play record of `game` along the given (node id, label) pairs. */
export function playRecord(game: Game, line: [string, string][], extra: Partial<PlayRecord> = {}): PlayRecord {
  const moves: PlayedMove[] = line.map(([nodeId, label], k) => {
    const node = find(game.root, nodeId);
    const team = node?.kind === 'decision' ? node.team : null;
    return {
      id: `m${k + 1}`,
      turn: k + 1,
      nodeId,
      teamId: team,
      label,
      kind: team ? 'ladder' : 'chance',
      rationale: null,
      confidence: null,
      proposal: null,
      reason: null,
      draw: team ? null : { seed: 'fixture', value: 0.5 },
      submittedByName: null,
      at: new Date(Date.UTC(2026, 0, 5, 9, k * 10)).toISOString(),
    };
  });
  return {
    exerciseId: 'ex-1',
    title: 'Fixture run',
    state: 'ended',
    scenarioId: 's-1',
    scenarioVersionId: 'v-1',
    document: null,
    moves,
    currentNodeId: moves.length ? nodeId(game, line) : game.root.id,
    notes: [],
    injects: [],
    startedAt: '2026-01-05T09:00:00.000Z',
    endedAt: '2026-01-05T11:00:00.000Z',
    ...extra,
  };
}

function nodeId(game: Game, line: [string, string][]): string {
  let node = game.root;
  for (const [, label] of line) {
    const edges = node.kind === 'decision' ? node.actions : node.kind === 'chance' ? node.outcomes : [];
    const edge = edges.find((e) => e.label === label);
    if (!edge) return node.id; // a deliberately broken line: where it breaks
    node = edge.next;
  }
  return node.id;
}

function find(node: GameNode, id: string): GameNode | undefined {
  if (node.id === id) return node;
  const edges = node.kind === 'decision' ? node.actions : node.kind === 'chance' ? node.outcomes : [];
  for (const edge of edges) {
    const hit = find(edge.next, id);
    if (hit) return hit;
  }
  return undefined;
}
