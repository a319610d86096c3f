/**
 * The runs of one scenario a reader may compare: the scenario's author and
 * administrators see every run; others see the runs whose review they may read.
 */
import { and, desc, eq, inArray } from 'drizzle-orm';
import { db, schema } from '../../db/client';
import { allowed, decide, type ExerciseSettings, type ScenarioContext } from '../access';
import type { SessionUser } from '../auth';
import { HttpError } from '../http';
import { compareReviews, type RunsOverview } from '../review';
import { exerciseReview } from './analysis';

const PLAYED: schema.ExerciseState[] = ['live', 'paused', 'ended'];

export type ScenarioRuns = { scenario: { id: string; title: string }; overview: RunsOverview; skipped: { title: string; reason: string }[] };

function seatsOf(userId: string, exerciseIds: string[]) {
  if (exerciseIds.length === 0) return new Map<string, { role: schema.ExerciseRole; teamId: string | null; isLead: boolean }>();
  const rows = db()
    .select({ exerciseId: schema.membership.exerciseId, role: schema.membership.role, teamId: schema.membership.teamId, isLead: schema.membership.isLead })
    .from(schema.membership)
    .where(and(eq(schema.membership.userId, userId), inArray(schema.membership.exerciseId, exerciseIds)))
    .all();
  return new Map(rows.map((r) => [r.exerciseId, { role: r.role, teamId: r.teamId, isLead: r.isLead }]));
}

type Readable = { scenario: { id: string; title: string }; exercises: { id: string; title: string }[] };

/** The scenario and the played runs of it this reader may compare; refuses with the access rule's reason. */
export function readableRuns(actor: SessionUser, scenarioId: string): Readable {
  const scenario = db().select().from(schema.scenario).where(eq(schema.scenario.id, scenarioId)).get();
  if (!scenario) throw new HttpError(404, 'No such scenario');
  const exercises = db()
    .select({ id: schema.exercise.id, title: schema.exercise.title, state: schema.exercise.state, settings: schema.exercise.settings })
    .from(schema.exercise)
    .innerJoin(schema.scenarioVersion, eq(schema.scenarioVersion.id, schema.exercise.scenarioVersionId))
    .where(eq(schema.scenarioVersion.scenarioId, scenarioId))
    .orderBy(desc(schema.exercise.createdAt))
    .all();
  const seats = seatsOf(actor.id, exercises.map((e) => e.id));
  const scenarioCtx: ScenarioContext = { ownerId: scenario.ownerId, facilitatesAnExercise: [...seats.values()].some((s) => s.role === 'facilitator') };
  const decision = decide(actor, 'scenario.read', scenarioCtx);
  if (!decision.ok) throw new HttpError(decision.status, decision.reason);
  const seesAll = allowed(actor, 'scenario.edit', scenarioCtx);
  const readable = exercises.filter(
    (e) => PLAYED.includes(e.state) && (seesAll || allowed(actor, 'review.read', { seat: seats.get(e.id) ?? null, state: e.state, settings: e.settings as ExerciseSettings })),
  );
  return { scenario: { id: scenario.id, title: scenario.title }, exercises: readable.map((e) => ({ id: e.id, title: e.title })) };
}

export async function scenarioRuns(actor: SessionUser, scenarioId: string): Promise<ScenarioRuns> {
  const { scenario, exercises } = readableRuns(actor, scenarioId);
  const reviewed: Parameters<typeof compareReviews>[0] = [];
  const skipped: ScenarioRuns['skipped'] = [];
  for (const e of exercises) {
    try {
      const { review, record } = await exerciseReview(e.id);
      reviewed.push({ review, record });
    } catch (error) {
      skipped.push({ title: e.title, reason: error instanceof Error ? error.message : String(error) });
    }
  }
  return { scenario, overview: compareReviews(reviewed), skipped };
}
