/**
 * Rows and lookups the exercise service shares: the exercise, a user's seat,
 * the moves of a turn, and the error type every refusal of an intent uses.
 */
import { schema, type Db } from '../../db/client';
import { queries } from './queries';
import type { Seat } from '../access';
import type { ErrorCode, FieldReason } from './protocol';

export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type ExerciseRow = typeof schema.exercise.$inferSelect;
export type MoveRow = typeof schema.exerciseMove.$inferSelect;
export type EventRow = typeof schema.exerciseEvent.$inferSelect;

/** A refusal of an intent: a code the client can act on, a sentence for the person, the fields at fault. */
export class IntentError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields: FieldReason[] = [],
  ) {
    super(message);
  }
}

export const HTTP_STATUS: Record<ErrorCode, number> = {
  'bad-json': 400,
  'too-large': 413,
  'bad-version': 400,
  'unknown-type': 400,
  invalid: 400,
  'not-ready': 409,
  forbidden: 403,
  conflict: 409,
  'stale-turn': 409,
  'not-found': 404,
  'rate-limited': 429,
  'server-error': 500,
};

export function exerciseRow(exerciseId: string): ExerciseRow | undefined {
  return queries().exercise.get({ id: exerciseId });
}

export type Member = { userId: string; name: string; seat: Seat };

/** The user's seat in the exercise, or null (also for deactivated accounts). */
export function memberOf(exerciseId: string, userId: string): Member | null {
  const row = queries().member.get({ exerciseId, userId });
  if (!row || row.deactivatedAt) return null;
  return { userId, name: row.name, seat: { role: row.m.role, teamId: row.m.teamId, isLead: row.m.isLead } };
}

/** Moves of a turn that are not in effect yet (proposed or sealed). */
export function pendingMoves(exerciseId: string, turn: number): MoveRow[] {
  return queries().pendingMoves.all({ exerciseId, turn });
}

export function revealedMoves(exerciseId: string): MoveRow[] {
  return queries().revealedMoves.all({ exerciseId });
}
