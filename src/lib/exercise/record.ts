/**
 * The record of one exercise's play, as Review and the after-action report
 * read it. The live-exercise code owns how it is stored and implements
 * `loadPlayRecord`; readers depend only on these types.
 */
import type { ExerciseState } from '../roles';

export type PlayedMoveKind =
  /** A team chose an action of the tree. */
  | 'ladder'
  /** The facilitator mapped a free-text proposal (or a decision at a deadline) onto an action, with a reason. */
  | 'adjudicated'
  /** The server's seeded draw, or the facilitator's choice with a reason, at a chance node. */
  | 'chance';

export type PlayedMove = {
  id: string;
  /** 1-based turn number in the order of play. */
  turn: number;
  /** The tree node the move was made at. */
  nodeId: string;
  /** The moving team; null at a chance node. */
  teamId: string | null;
  /** The action (or chance outcome) label taken at nodeId. */
  label: string;
  kind: PlayedMoveKind;
  rationale: string | null;
  /** 0 to 100, as the team gave it. */
  confidence: number | null;
  /** The team's free-text proposal, for adjudicated moves. */
  proposal: string | null;
  /** The facilitator's reason, for adjudicated moves and chosen chance outcomes. */
  reason: string | null;
  /** For chance draws: the seed and the number drawn. */
  draw: { seed: string; value: number } | null;
  submittedByName: string | null;
  /** ISO time the move took effect (revealed). */
  at: string;
};

export type ObserverNote = {
  id: string;
  turn: number | null;
  moveId: string | null;
  tags: string[];
  text: string;
  authorName: string;
  at: string;
};

export type InjectRecord = {
  id: string;
  turn: number | null;
  title: string;
  body: string;
  /** Team ids, or 'all'. */
  to: string[] | 'all';
  at: string;
};

export type PlayRecord = {
  exerciseId: string;
  title: string;
  state: ExerciseState;
  scenarioId: string;
  scenarioVersionId: string;
  /** The frozen scenario document (src/lib/scenario.ts) the exercise was run on. */
  document: unknown;
  /** Moves in the order they took effect; undone moves are left out. */
  moves: PlayedMove[];
  /** Where play stands (or ended): the current node id. */
  currentNodeId: string;
  notes: ObserverNote[];
  injects: InjectRecord[];
  startedAt: string | null;
  endedAt: string | null;
};
