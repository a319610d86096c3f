/** The exercise a report belongs to, and the reader's seat in it, as the access rules need them. */
import { and, eq } from 'drizzle-orm';
import { db, schema } from '../../db/client';
import type { ExerciseContext, ExerciseSettings } from '../access';
import { HttpError, requireActor } from '../http';

export type ExerciseAccess = {
  exercise: { id: string; title: string; state: schema.ExerciseState; scenarioId: string; scenarioVersionId: string; startedAt: Date | null; endedAt: Date | null };
  ctx: ExerciseContext;
};

export function exerciseAccess(userId: string, exerciseId: string): ExerciseAccess {
  const found = db()
    .select({ exercise: schema.exercise, scenarioId: schema.scenarioVersion.scenarioId })
    .from(schema.exercise)
    .innerJoin(schema.scenarioVersion, eq(schema.scenarioVersion.id, schema.exercise.scenarioVersionId))
    .where(eq(schema.exercise.id, exerciseId))
    .get();
  if (!found) throw new HttpError(404, 'No such exercise');
  const row = found.exercise;
  const seat = db()
    .select({ role: schema.membership.role, teamId: schema.membership.teamId, isLead: schema.membership.isLead })
    .from(schema.membership)
    .where(and(eq(schema.membership.exerciseId, exerciseId), eq(schema.membership.userId, userId)))
    .get();
  return {
    exercise: { id: row.id, title: row.title, state: row.state, scenarioId: found.scenarioId, scenarioVersionId: row.scenarioVersionId, startedAt: row.startedAt, endedAt: row.endedAt },
    ctx: { seat: seat ?? null, state: row.state, settings: row.settings as ExerciseSettings },
  };
}

/** The signed-in actor and their access to the exercise named in the route. */
export function exerciseFromRoute(locals: App.Locals, params: Record<string, string | undefined>) {
  const actor = requireActor(locals);
  return { actor, ...exerciseAccess(actor.id, params.id ?? '') };
}

/** The version number in the route: a whole number from 1. */
export function versionNumber(params: Record<string, string | undefined>): number {
  const number = Number(params.number);
  if (!Number.isInteger(number) || number < 1) throw new HttpError(400, 'The version must be a whole number from 1', [{ field: 'number', reason: 'not a whole number from 1' }]);
  return number;
}

/** E-mail addresses of the exercise's sponsors, for the send form. */
export function sponsorAddresses(exerciseId: string): { name: string; email: string }[] {
  return db()
    .select({ name: schema.user.name, email: schema.user.email })
    .from(schema.membership)
    .innerJoin(schema.user, eq(schema.user.id, schema.membership.userId))
    .where(and(eq(schema.membership.exerciseId, exerciseId), eq(schema.membership.role, 'sponsor')))
    .all();
}

/** For pages: the access record, or null for an exercise that does not exist (the page shows its own refusal). */
export function exerciseAccessForPage(userId: string, exerciseId: string | undefined): ExerciseAccess | null {
  try {
    return exerciseAccess(userId, exerciseId ?? '');
  } catch (error) {
    if (error instanceof HttpError && error.status === 404) return null;
    throw error;
  }
}
