/** The scenarios the home page lists for one user (its exercises are exercise/service.ts's exercisesFor). */
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
