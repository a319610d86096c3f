/**
 * Rows and lookups the exercise service shares: the exercise, a user's seat,
 * the moves of a turn, and the error type every refusal of an intent uses.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { db, schema, type Db } from '../../db/client';
import type { Seat } from '../access';
import type { ErrorCode, FieldReason } from './protocol';

export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type Runner = Db | Tx;
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
  'server-error': 500,
};

export function exerciseRow(runner: Runner, exerciseId: string): ExerciseRow | undefined {
  return runner.select().from(schema.exercise).where(eq(schema.exercise.id, exerciseId)).get();
}

export type Member = { userId: string; name: string; seat: Seat };

/** The user's seat in the exercise, or null (also for deactivated accounts). */
export function memberOf(runner: Runner, exerciseId: string, userId: string): Member | null {
  const row = runner
    .select({ m: schema.membership, name: schema.user.name, deactivatedAt: schema.user.deactivatedAt })
    .from(schema.membership)
    .innerJoin(schema.user, eq(schema.user.id, schema.membership.userId))
    .where(and(eq(schema.membership.exerciseId, exerciseId), eq(schema.membership.userId, userId)))
    .get();
  if (!row || row.deactivatedAt) return null;
  return { userId, name: row.name, seat: { role: row.m.role, teamId: row.m.teamId, isLead: row.m.isLead } };
}

/** Moves of a turn that are not in effect yet (proposed or sealed). */
export function pendingMoves(runner: Runner, exerciseId: string, turn: number): MoveRow[] {
  return runner
    .select()
    .from(schema.exerciseMove)
    .where(
      and(
        eq(schema.exerciseMove.exerciseId, exerciseId),
        eq(schema.exerciseMove.turn, turn),
        inArray(schema.exerciseMove.status, ['proposed', 'sealed']),
      ),
    )
    .orderBy(schema.exerciseMove.createdAt)
    .all();
}

export function revealedMoves(runner: Runner, exerciseId: string): MoveRow[] {
  return runner
    .select()
    .from(schema.exerciseMove)
    .where(and(eq(schema.exerciseMove.exerciseId, exerciseId), eq(schema.exerciseMove.status, 'revealed')))
    .orderBy(schema.exerciseMove.turn, schema.exerciseMove.revealedAt, schema.exerciseMove.createdAt)
    .all();
}
