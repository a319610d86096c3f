/** What the home page lists for one user. */
import { and, desc, eq, isNull } from 'drizzle-orm';
import { db, schema } from '../db/client';
import type { SessionUser } from './auth';

export function scenariosOf(user: SessionUser) {
  return db()
    .select({ id: schema.scenario.id, title: schema.scenario.title, updatedAt: schema.scenario.updatedAt })
    .from(schema.scenario)
    .where(and(eq(schema.scenario.ownerId, user.id), isNull(schema.scenario.archivedAt)))
    .orderBy(desc(schema.scenario.updatedAt))
    .all();
}

export function exercisesOf(user: SessionUser) {
  return db()
    .select({
      id: schema.exercise.id,
      title: schema.exercise.title,
      state: schema.exercise.state,
      role: schema.membership.role,
      teamId: schema.membership.teamId,
      createdAt: schema.exercise.createdAt,
    })
    .from(schema.membership)
    .innerJoin(schema.exercise, eq(schema.exercise.id, schema.membership.exerciseId))
    .where(eq(schema.membership.userId, user.id))
    .orderBy(desc(schema.exercise.createdAt))
    .all();
}
