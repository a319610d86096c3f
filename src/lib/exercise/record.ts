/**
 * The record of one exercise's play, as Review and the after-action report
 * read it. The live-exercise code owns how it is stored and implements
 * `loadPlayRecord` (at the end of this file); readers depend only on these types.
 */
import { eq } from 'drizzle-orm';
import { db, schema } from '../../db/client';
import type { Game } from '../engine';
import { indexGame, nodeById } from '../engine';
import { scenarioInfo } from './scenario-info';
import { revealedMoves, type MoveRow } from './state';
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
  /** Set when the facilitator ended the game at an outcome by adjudication (see AdjudicatedEnding). */
  ending?: AdjudicatedEnding | null;
  notes: ObserverNote[];
  injects: InjectRecord[];
  startedAt: string | null;
  endedAt: string | null;
};

/**
 * An adjudication that ended the game at an outcome instead of mapping the
 * proposal onto an action. It is not in `moves` (no edge of the tree leads
 * there from where play stood); `currentNodeId` is then `outcomeNodeId`.
 */
export type AdjudicatedEnding = {
  moveId: string;
  turn: number;
  /** Where play stood when the facilitator ended it. */
  nodeId: string;
  teamId: string | null;
  /** The terminal node the game was ended at. */
  outcomeNodeId: string;
  outcome: string;
  proposal: string | null;
  reason: string | null;
  at: string;
};

// ---------------------------------------------------------------------------
// Reading the record from the live exercise's tables.


type NoteRow = typeof schema.exerciseNote.$inferSelect;
type InjectRow = typeof schema.exerciseInject.$inferSelect;

/** Moves in the order they took effect: by turn, and within a simultaneous turn by depth in the tree. */
export function playOrder(game: Game, moves: MoveRow[]): MoveRow[] {
  const index = indexGame(game);
  const depth = (id: string | null) => {
    let d = 0;
    for (let node = id ? nodeById(game, id) : undefined; node; node = index.parentOf.get(node)?.parent) d++;
    return d;
  };
  return [...moves].sort((a, b) => a.turn - b.turn || depth(a.nodeId) - depth(b.nodeId));
}

export function playedMove(row: MoveRow): PlayedMove {
  return {
    id: row.id,
    turn: row.turn,
    nodeId: row.nodeId ?? row.stageNodeId,
    teamId: row.teamId,
    label: row.label ?? '',
    kind: row.kind,
    rationale: row.rationale,
    confidence: row.confidence,
    proposal: row.proposal,
    reason: row.reason,
    draw: row.drawSeed !== null && row.drawValue !== null ? { seed: row.drawSeed, value: row.drawValue } : null,
    submittedByName: row.submittedByName,
    at: (row.revealedAt ?? row.createdAt).toISOString(),
  };
}

export function noteOf(row: NoteRow): ObserverNote {
  return { id: row.id, turn: row.turn, moveId: row.moveId, tags: row.tags, text: row.text, authorName: row.authorName, at: row.createdAt.toISOString() };
}

function injectOf(row: InjectRow): InjectRecord {
  return { id: row.id, turn: row.turn, title: row.title, body: row.body, to: row.audience, at: row.createdAt.toISOString() };
}

function endingOf(row: MoveRow, game: Game): AdjudicatedEnding {
  const node = nodeById(game, row.outcomeNodeId!);
  return {
    moveId: row.id,
    turn: row.turn,
    nodeId: row.nodeId ?? row.stageNodeId,
    teamId: row.teamId,
    outcomeNodeId: row.outcomeNodeId!,
    outcome: (node?.kind === 'terminal' ? node.outcome : undefined) ?? row.outcomeNodeId!,
    proposal: row.proposal,
    reason: row.reason,
    at: (row.revealedAt ?? row.createdAt).toISOString(),
  };
}

/** The whole record of one exercise's play, for Review and the report. Throws for an unknown id. */
export function loadPlayRecord(exerciseId: string): PlayRecord {
  const exercise = db().select().from(schema.exercise).where(eq(schema.exercise.id, exerciseId)).get();
  if (!exercise) throw new Error(`There is no exercise ${exerciseId}`);
  const scenario = scenarioInfo(exercise.scenarioVersionId);
  const revealed = playOrder(scenario.game, revealedMoves(exerciseId));
  const ending = revealed.find((m) => m.outcomeNodeId !== null);
  const notes = db().select().from(schema.exerciseNote).where(eq(schema.exerciseNote.exerciseId, exerciseId)).orderBy(schema.exerciseNote.createdAt).all();
  const injects = db().select().from(schema.exerciseInject).where(eq(schema.exerciseInject.exerciseId, exerciseId)).orderBy(schema.exerciseInject.createdAt).all();
  return {
    exerciseId,
    title: exercise.title,
    state: exercise.state,
    scenarioId: scenario.scenarioId,
    scenarioVersionId: exercise.scenarioVersionId,
    document: scenario.document,
    moves: revealed.filter((m) => m.outcomeNodeId === null).map(playedMove),
    ending: ending ? endingOf(ending, scenario.game) : null,
    currentNodeId: exercise.nodeId ?? scenario.game.root.id,
    notes: notes.map(noteOf),
    injects: injects.map(injectOf),
    startedAt: exercise.startedAt?.toISOString() ?? null,
    endedAt: exercise.endedAt?.toISOString() ?? null,
  };
}
