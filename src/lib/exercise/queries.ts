/**
 * The live exercise's hot queries as prepared statements: every intent and every
 * broadcast runs them, and building a query through the ORM costs more than running
 * it. Prepared once per database handle; a transaction runs them on the same connection.
 */
import { and, eq, inArray, sql } from 'drizzle-orm';
import { db, schema, type Db } from '../../db/client';

const id = sql.placeholder('id');
const exerciseId = sql.placeholder('exerciseId');

function prepare(handle: Db) {
  const { exercise, membership, user, exerciseMove: move, exerciseEvent: event, exerciseDraft: draft, exerciseInject: inject, exerciseNote: note, scenario } = schema;
  return {
    exercise: handle.select().from(exercise).where(eq(exercise.id, id)).prepare(),
    member: handle
      .select({ m: membership, name: user.name, deactivatedAt: user.deactivatedAt })
      .from(membership)
      .innerJoin(user, eq(user.id, membership.userId))
      .where(and(eq(membership.exerciseId, exerciseId), eq(membership.userId, sql.placeholder('userId'))))
      .prepare(),
    members: handle
      .select({ m: membership, name: user.name, email: user.email })
      .from(membership)
      .innerJoin(user, eq(user.id, membership.userId))
      .where(eq(membership.exerciseId, exerciseId))
      .orderBy(membership.createdAt)
      .prepare(),
    priorCommit: handle
      .select()
      .from(event)
      .where(and(eq(event.exerciseId, exerciseId), eq(event.intentKey, sql.placeholder('key'))))
      .prepare(),
    pendingMoves: handle
      .select()
      .from(move)
      .where(and(eq(move.exerciseId, exerciseId), eq(move.turn, sql.placeholder('turn')), inArray(move.status, ['proposed', 'sealed'])))
      .orderBy(move.createdAt)
      .prepare(),
    revealedMoves: handle
      .select()
      .from(move)
      .where(and(eq(move.exerciseId, exerciseId), eq(move.status, 'revealed')))
      .orderBy(move.turn, move.revealedAt, move.createdAt)
      .prepare(),
    drafts: handle.select().from(draft).where(eq(draft.exerciseId, exerciseId)).prepare(),
    injects: handle.select().from(inject).where(eq(inject.exerciseId, exerciseId)).orderBy(inject.createdAt).prepare(),
    notes: handle.select().from(note).where(eq(note.exerciseId, exerciseId)).orderBy(note.createdAt).prepare(),
    scenarioTitle: handle.select({ title: scenario.title }).from(scenario).where(eq(scenario.id, id)).prepare(),
    insertEvent: handle
      .insert(event)
      .values({
        id: sql.placeholder('id'),
        exerciseId,
        seq: sql.placeholder('seq'),
        kind: sql.placeholder('kind'),
        actorId: sql.placeholder('actorId'),
        actorName: sql.placeholder('actorName'),
        intentKey: sql.placeholder('intentKey'),
        summary: sql.placeholder('summary'),
        data: sql.placeholder('data'),
        sections: sql.placeholder('sections'),
        createdAt: sql.placeholder('createdAt'),
      })
      .prepare(),
    upsertDraft: handle
      .insert(draft)
      .values({
        exerciseId,
        teamId: sql.placeholder('teamId'),
        turn: sql.placeholder('turn'),
        label: sql.placeholder('label'),
        proposal: sql.placeholder('proposal'),
        rationale: sql.placeholder('rationale'),
        confidence: sql.placeholder('confidence'),
        updatedBy: sql.placeholder('updatedBy'),
        updatedByName: sql.placeholder('updatedByName'),
        updatedAt: sql.placeholder('updatedAt'),
      })
      .onConflictDoUpdate({
        target: [draft.exerciseId, draft.teamId],
        set: {
          turn: sql`excluded.turn`,
          label: sql`excluded.label`,
          proposal: sql`excluded.proposal`,
          rationale: sql`excluded.rationale`,
          confidence: sql`excluded.confidence`,
          updatedBy: sql`excluded.updated_by`,
          updatedByName: sql`excluded.updated_by_name`,
          updatedAt: sql`excluded.updated_at`,
        },
      })
      .prepare(),
    setSeq: handle.update(exercise).set({ seq: sql`${sql.placeholder('seq')}` }).where(eq(exercise.id, id)).prepare(),
  };
}

export type Queries = ReturnType<typeof prepare>;

const cache = new WeakMap<Db, Queries>();

export function queries(): Queries {
  const handle = db();
  let prepared = cache.get(handle);
  if (!prepared) {
    prepared = prepare(handle);
    cache.set(handle, prepared);
  }
  return prepared;
}
