/**
 * The exercise service: create an exercise on a scenario version (freezing
 * it), put people on its roster, apply intents, and read what one person may
 * see. Every change goes through commitChange (one transaction, one numbered
 * event) and then to the hub (publish) for acknowledgement and broadcast.
 */
import { and, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import { z } from 'zod';
import { db, schema } from '../../db/client';
import { authorize, HttpError } from '../http';
import { invite } from '../invitations';
import { loadConfig } from '../config';
import { sendMail } from '../mail';
import { exerciseSeatMail } from '../mail-templates';
import { EXERCISE_ROLES, type ExerciseRole } from '../roles';
import type { SessionUser } from '../auth';
import { freezeVersion, scenarioContext } from '../studio/library';
import { allowed } from '../access';
import { freshClock } from './clock';
import { commitChange, commitIntent, type Actor, type Committed } from './commit';
import { newChanceSeed } from './draws';
import { stageAt, isMoving } from './play';
import type { Intent } from './protocol';
import { publish } from './publish';
import { readScenario } from './scenario-info';
import { DEFAULT_SETTINGS, readSettings, settingsPatchSchema, settingsSchema } from './settings';
import { snapshot, Source, type Viewer } from './sections';
import { HTTP_STATUS, IntentError, memberOf, type ExerciseRow, type Tx } from './state';
import type { Seat } from '../access';
import type { Scenario } from '../scenario';
import type { Snapshot } from './view';

export const createExerciseInput = z.object({
  scenarioVersionId: z.string().min(1, 'choose a scenario version'),
  title: z.string().trim().min(3, 'give the exercise a title of 3 characters or more').max(200, 'at most 200 characters'),
  settings: settingsPatchSchema.default({}),
});

/** Create an exercise in set-up (draft), its creator seated as facilitator; the version is frozen for good. */
export function createExercise(
  actor: SessionUser,
  input: z.infer<typeof createExerciseInput>,
  now = Date.now(),
  options: { chanceSeed?: string } = {},
): { id: string } {
  const version = db().select().from(schema.scenarioVersion).where(eq(schema.scenarioVersion.id, input.scenarioVersionId)).get();
  if (!version) throw new HttpError(404, 'There is no such scenario version', [{ field: 'scenarioVersionId', reason: 'unknown version' }]);
  const scenario = db().select().from(schema.scenario).where(eq(schema.scenario.id, version.scenarioId)).get()!;
  authorize(actor, 'exercise.create', scenarioContext(actor, scenario));
  const settings = settingsSchema.parse({ ...DEFAULT_SETTINGS, ...input.settings });
  const id = crypto.randomUUID();
  db().transaction((tx) => {
    freezeVersion(tx, version.id, actor.id);
    const game = readScenario(version.id, version.scenarioId, version.document as Scenario).game;
    const rootStage = stageAt(game, game.root.id);
    tx.insert(schema.exercise)
      .values({
        id,
        scenarioVersionId: version.id,
        title: input.title,
        state: 'draft',
        settings,
        createdBy: actor.id,
        createdAt: new Date(now),
        nodeId: game.root.id,
        turn: 1,
        seq: 1,
        chanceSeed: options.chanceSeed ?? newChanceSeed(),
        clock: isMoving(rootStage) ? freshClock(settings.turnSeconds, false, now) : null,
      })
      .run();
    tx.insert(schema.membership).values({ id: crypto.randomUUID(), exerciseId: id, userId: actor.id, role: 'facilitator', createdAt: new Date(now) }).run();
    tx.insert(schema.exerciseEvent)
      .values({
        id: crypto.randomUUID(),
        exerciseId: id,
        seq: 1,
        kind: 'created',
        actorId: actor.id,
        actorName: actor.name,
        summary: `${actor.name} created the exercise on “${scenario.title}” version ${version.number}`,
        data: { scenarioVersionId: version.id },
        sections: ['all'],
        createdAt: new Date(now),
      })
      .run();
  });
  return { id };
}

export type ExerciseListEntry = {
  id: string;
  title: string;
  state: string;
  role: ExerciseRole;
  teamId: string | null;
  scenarioTitle: string;
  scenarioVersionId: string;
  versionNumber: number;
  participants: number;
  createdAt: string;
};

export function exercisesFor(user: SessionUser): ExerciseListEntry[] {
  return db()
    .select({
      id: schema.exercise.id,
      title: schema.exercise.title,
      state: schema.exercise.state,
      role: schema.membership.role,
      teamId: schema.membership.teamId,
      scenarioTitle: schema.scenario.title,
      scenarioVersionId: schema.exercise.scenarioVersionId,
      versionNumber: schema.scenarioVersion.number,
      participants: sql<number>`(select count(*) from ${schema.membership} m where m.exercise_id = ${schema.exercise.id})`,
      createdAt: schema.exercise.createdAt,
    })
    .from(schema.membership)
    .innerJoin(schema.exercise, eq(schema.exercise.id, schema.membership.exerciseId))
    .innerJoin(schema.scenarioVersion, eq(schema.scenarioVersion.id, schema.exercise.scenarioVersionId))
    .innerJoin(schema.scenario, eq(schema.scenario.id, schema.scenarioVersion.scenarioId))
    .where(eq(schema.membership.userId, user.id))
    .orderBy(desc(schema.exercise.createdAt))
    .all()
    .map((row) => ({ ...row, participants: Number(row.participants), createdAt: row.createdAt.toISOString() }));
}

/** The scenario versions this person may start an exercise on: each scenario's versions, newest first. */
export function creatableVersions(user: SessionUser): { id: string; label: string; scenarioTitle: string; frozen: boolean }[] {
  const scenarios = db().select().from(schema.scenario).where(isNull(schema.scenario.archivedAt)).orderBy(desc(schema.scenario.updatedAt)).all();
  return scenarios
    .filter((scenario) => allowed(user, 'exercise.create', scenarioContext(user, scenario)))
    .flatMap((scenario) =>
      db()
        .select({ id: schema.scenarioVersion.id, number: schema.scenarioVersion.number, status: schema.scenarioVersion.status })
        .from(schema.scenarioVersion)
        .where(eq(schema.scenarioVersion.scenarioId, scenario.id))
        .orderBy(desc(schema.scenarioVersion.number))
        .all()
        .map((v) => ({
          id: v.id,
          scenarioTitle: scenario.title,
          label: `version ${v.number} (${v.status === 'frozen' ? 'frozen' : 'draft, frozen on use'})`,
          frozen: v.status === 'frozen',
        })),
    );
}

// ---------------------------------------------------------------------------
// Reading.

export function viewerFor(exerciseId: string, user: SessionUser): Viewer | null {
  const member = memberOf(exerciseId, user.id);
  return member ? { userId: user.id, name: member.name, role: user.role, seat: member.seat } : null;
}

/** The person's seat; refuses (404 / 403) like every other read of the exercise. */
export function requireViewer(exerciseId: string, user: SessionUser): Viewer {
  const exercise = db().select({ id: schema.exercise.id }).from(schema.exercise).where(eq(schema.exercise.id, exerciseId)).get();
  if (!exercise) throw new HttpError(404, 'There is no such exercise');
  const viewer = viewerFor(exerciseId, user);
  const source = new Source(exerciseId);
  authorize(user, 'exercise.view', { seat: viewer?.seat ?? null, state: source.exercise.state, settings: source.settings });
  return viewer!;
}

export function snapshotFor(exerciseId: string, user: SessionUser): { seq: number; view: Snapshot } {
  const viewer = requireViewer(exerciseId, user);
  const source = new Source(exerciseId);
  return { seq: source.exercise.seq, view: snapshot(source, viewer) };
}

// ---------------------------------------------------------------------------
// Changing.

export function applyIntent(exerciseId: string, actor: Actor, key: string, intent: Intent, now = Date.now()): Committed {
  const committed = commitIntent(exerciseId, actor, key, intent, now);
  publish(committed);
  return committed;
}

export const seatInput = z
  .object({
    email: z.email('Enter a valid e-mail address').max(254),
    role: z.enum(EXERCISE_ROLES),
    teamId: z.string().min(1).nullable().default(null),
    isLead: z.boolean().default(false),
  })
  .refine((s) => (s.role === 'player') === (s.teamId !== null), { path: ['teamId'], message: 'players need a team; other seats have none' })
  .refine((s) => !s.isLead || s.role === 'player', { path: ['isLead'], message: 'only a player can lead a team' });
export type SeatInput = z.infer<typeof seatInput>;

const ROLE_WORDS: Record<ExerciseRole, string> = { facilitator: 'as a facilitator', player: 'as a player', observer: 'as an observer', sponsor: 'as a sponsor' };

function seatLabel(input: SeatInput, teamName: string | undefined, title: string): string {
  const seat = input.role === 'player' ? `on the ${teamName} team${input.isLead ? ' (lead)' : ''}` : ROLE_WORDS[input.role];
  return `${seat} of the exercise “${title}”`;
}

/** Roster changes need the right to invite; checked inside the change's transaction. */
const invitesRoster = (user: SessionUser) => (seat: Seat | null, exercise: ExerciseRow) => {
  authorize(user, 'exercise.invite', { seat, state: exercise.state, settings: readSettings(exercise.settings) });
};

/**
 * Seat a person: an existing account goes straight onto the roster (and is told
 * by e-mail); an unknown address gets an invitation whose acceptance seats it.
 */
export async function seatPerson(
  exerciseId: string,
  user: SessionUser,
  input: SeatInput,
  now = Date.now(),
  options: { notify?: boolean } = {},
): Promise<{ seated: 'member' | 'invited'; seq: number; notified: boolean }> {
  const source = new Source(exerciseId);
  invitesRoster(user)(requireViewer(exerciseId, user).seat, source.exercise);
  const team = source.scenario.teams.find((t) => t.id === input.teamId);
  if (input.teamId !== null && !team) throw new HttpError(400, 'There is no such team in this scenario', [{ field: 'teamId', reason: 'unknown team' }]);
  const email = input.email.toLowerCase();
  const person = db().select().from(schema.user).where(eq(schema.user.email, email)).get();
  const label = seatLabel(input, team?.name, source.exercise.title);
  if (!person) {
    await invite(user, { email, role: 'member' }, { exerciseId, exerciseRole: input.role, teamId: input.teamId, label });
    const committed = rosterChange(exerciseId, user, `${user.name} invited ${email} ${label.replace(/ of the exercise.*$/, '')}`, now);
    return { seated: 'invited', seq: committed.seq, notified: true };
  }
  if (person.deactivatedAt) throw new HttpError(409, 'This account is deactivated', [{ field: 'email', reason: 'deactivated account' }]);
  const committed = asHttp(() => commitChange(
    exerciseId,
    user,
    null,
    (ctx) => {
      putOnRoster(ctx.tx, exerciseId, person.id, input, now);
      return { kind: 'roster', summary: `${user.name} seated ${person.name} ${label.replace(/ of the exercise.*$/, '')}`, data: { userId: person.id }, sections: 'all' };
    },
    now,
    invitesRoster(user),
  ))!;
  publish(committed);
  if (options.notify === false) return { seated: 'member', seq: committed.seq, notified: false };
  const link = `${loadConfig().publicUrl}/exercises/${exerciseId}`;
  const notified = await sendMail({ to: email, ...exerciseSeatMail(user.name, source.exercise.title, label.replace(/ of the exercise.*$/, ''), link) })
    .then(() => true)
    .catch((error: unknown) => {
      console.error('[live] could not mail the new seat', error);
      return false;
    });
  return { seated: 'member', seq: committed.seq, notified };
}

function putOnRoster(tx: Tx, exerciseId: string, userId: string, input: SeatInput, now: number): void {
  if (input.isLead) {
    tx.update(schema.membership).set({ isLead: false }).where(and(eq(schema.membership.exerciseId, exerciseId), eq(schema.membership.teamId, input.teamId!))).run();
  }
  const values = { role: input.role, teamId: input.teamId, isLead: input.isLead };
  tx.insert(schema.membership)
    .values({ id: crypto.randomUUID(), exerciseId, userId, createdAt: new Date(now), ...values })
    .onConflictDoUpdate({ target: [schema.membership.exerciseId, schema.membership.userId], set: values })
    .run();
}

function rosterChange(exerciseId: string, user: SessionUser, summary: string, now: number): Committed {
  const committed = asHttp(() => commitChange(exerciseId, user, null, () => ({ kind: 'roster', summary, sections: ['roster'], audience: { kind: 'staff' } }), now, invitesRoster(user)))!;
  publish(committed);
  return committed;
}

export function unseatPerson(exerciseId: string, user: SessionUser, membershipId: string, now = Date.now()): { seq: number } {
  requireViewer(exerciseId, user);
  const committed = asHttp(() => commitChange(
    exerciseId,
    user,
    null,
    (ctx) => {
      const row = ctx.tx
        .select({ m: schema.membership, name: schema.user.name })
        .from(schema.membership)
        .innerJoin(schema.user, eq(schema.user.id, schema.membership.userId))
        .where(and(eq(schema.membership.id, membershipId), eq(schema.membership.exerciseId, exerciseId)))
        .get();
      if (!row) throw new IntentError('not-found', 'This person is not on the roster');
      if (row.m.role === 'facilitator') {
        const facilitators = ctx.tx.select({ id: schema.membership.id }).from(schema.membership).where(and(eq(schema.membership.exerciseId, exerciseId), eq(schema.membership.role, 'facilitator'))).all();
        if (facilitators.length <= 1) throw new IntentError('conflict', 'An exercise keeps at least one facilitator');
      }
      ctx.tx.delete(schema.membership).where(eq(schema.membership.id, membershipId)).run();
      return { kind: 'roster', summary: `${user.name} took ${row.name} off the roster`, data: { userId: row.m.userId }, sections: 'all' };
    },
    now,
    invitesRoster(user),
  ))!;
  publish(committed);
  return { seq: committed.seq };
}


/** An invitation with a seat was accepted (src/lib/invitations.ts made the membership): log it and tell the screens. */
export function seatAccepted(exerciseId: string, person: { id: string; name: string }, now = Date.now()): void {
  try {
    publish(commitChange(exerciseId, { id: person.id, name: person.name }, null, () => ({ kind: 'roster', summary: `${person.name} accepted the invitation and joined`, data: { userId: person.id }, sections: 'all' }), now));
  } catch (error) {
    console.error(`[live] could not log the accepted seat in exercise ${exerciseId}`, error);
  }
}

/** Roster and log calls answer over HTTP: an intent's refusal becomes the matching HTTP error. */
function asHttp<T>(run: () => T): T {
  try {
    return run();
  } catch (error) {
    if (error instanceof IntentError) throw new HttpError(HTTP_STATUS[error.code], error.message, error.fields);
    throw error;
  }
}

export function auditLog(exerciseId: string, user: SessionUser, after = 0) {
  const viewer = requireViewer(exerciseId, user);
  const source = new Source(exerciseId);
  authorize(user, 'exercise.run', { seat: viewer.seat, state: source.exercise.state, settings: source.settings });
  return db()
    .select()
    .from(schema.exerciseEvent)
    .where(and(eq(schema.exerciseEvent.exerciseId, exerciseId), gt(schema.exerciseEvent.seq, after)))
    .orderBy(schema.exerciseEvent.seq)
    .all()
    .map((e) => ({ seq: e.seq, kind: e.kind, actorName: e.actorName, summary: e.summary, data: e.data, at: e.createdAt.toISOString() }));
}
