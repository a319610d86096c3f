/**
 * The one way exercise state changes: inside one SQLite transaction, check the
 * idempotency key, the seat and the access rule, run the command, write the
 * numbered event (the audit log) and bump the exercise's update number. Only
 * after this returns does the hub acknowledge and broadcast. A committed
 * roster or settings change is announced to the open sockets, which ask the
 * access rules again (src/lib/access-changes.ts).
 */
import { db } from '../../db/client';
import { decide, type Seat } from '../access';
import { announceAccessChange, type AccessChange } from '../access-changes';
import type { PlatformRole } from '../roles';
import { COMMANDS, accessFor, deadlinePassed, type Change, type PlayContext } from './commands';
import { stageAt } from './play';
import type { Intent } from './protocol';
import { scenarioInfo } from './scenario-info';
import { readSettings } from './settings';
import { queries } from './queries';
import { IntentError, exerciseRow, memberOf, type ExerciseRow, type Tx } from './state';

export type Actor = { id: string; name: string; role: PlatformRole };

export type Committed = {
  exerciseId: string;
  seq: number;
  duplicate: boolean;
  result: Record<string, unknown>;
  /** Null for a duplicate: nothing changed this time. */
  change: Change | null;
  exercise: ExerciseRow;
  actorName: string;
  at: number;
};

export const SYSTEM_NAME = 'Rungwise clock';

/** Run a change in a transaction against the exercise's current play state. */
export function commitChange(
  exerciseId: string,
  actor: { id: string | null; name: string },
  key: string | null,
  run: (ctx: PlayContext) => Change | null,
  now = Date.now(),
  seatCheck?: (seat: Seat | null, exercise: ExerciseRow) => void,
): Committed | null {
  const committed = db().transaction((tx) => {
    const exercise = exerciseRow(exerciseId);
    if (!exercise) throw new IntentError('not-found', 'There is no such exercise');
    if (key) {
      const prior = priorCommit(exerciseId, key);
      if (prior) {
        if (prior.actorId !== actor.id) throw new IntentError('conflict', 'This idempotency key was used by someone else; make a new one');
        return { exerciseId, seq: prior.seq, duplicate: true, result: (prior.data.result ?? {}) as Record<string, unknown>, change: null, exercise, actorName: prior.actorName, at: prior.createdAt.getTime() };
      }
    }
    const member = actor.id ? memberOf(exerciseId, actor.id) : null;
    seatCheck?.(member?.seat ?? null, exercise);
    const ctx = playContext(tx, exercise, actor, member?.seat ?? null, now);
    const change = run(ctx);
    if (!change) return null;
    const seq = exercise.seq + 1;
    const result = change.result ?? {};
    queries().insertEvent.run({
      id: crypto.randomUUID(),
      exerciseId,
      seq,
      kind: change.kind,
      actorId: actor.id,
      actorName: actor.name,
      intentKey: key,
      summary: change.summary,
      data: { ...change.data, result, ...(change.audience ? { audience: change.audience } : {}) },
      sections: change.sections === 'all' ? ['all'] : change.sections,
      createdAt: new Date(now),
    });
    queries().setSeq.run({ id: exerciseId, seq });
    return { exerciseId, seq, duplicate: false, result, change, exercise: { ...ctx.exercise, seq }, actorName: actor.name, at: now };
  });
  const access = committed?.change ? accessChangeOf(exerciseId, committed.change) : null;
  if (access) announceAccessChange(access);
  return committed;
}

/** A roster change naming a person changes that person's seat; a settings change may change everyone's access. */
function accessChangeOf(exerciseId: string, change: Change): AccessChange | null {
  if (change.kind === 'settings') return { kind: 'exercise-access', exerciseId, userId: null };
  const userId = change.data?.userId;
  if (change.kind === 'roster' && typeof userId === 'string') return { kind: 'exercise-access', exerciseId, userId };
  return null;
}

function priorCommit(exerciseId: string, key: string) {
  return queries().priorCommit.get({ exerciseId, key });
}

function playContext(tx: Tx, exercise: ExerciseRow, actor: { id: string | null; name: string }, seat: Seat | null, now: number): PlayContext {
  const scenario = scenarioInfo(exercise.scenarioVersionId);
  return {
    tx,
    exercise: { ...exercise },
    settings: readSettings(exercise.settings),
    scenario,
    stage: stageAt(scenario.game, exercise.nodeId!),
    actor,
    seat,
    now,
  };
}

/** A participant's intent: seat and access first, then the command. */
export function commitIntent(exerciseId: string, actor: Actor, key: string, intent: Intent, now = Date.now()): Committed {
  const committed = commitChange(
    exerciseId,
    actor,
    key,
    (ctx) => COMMANDS[intent.kind](ctx, intent as never),
    now,
    (seat, exercise) => {
      const { action, ctx } = accessFor(intent, seat, exercise);
      const decision = decide(actor, action, ctx);
      if (!decision.ok) throw new IntentError('forbidden', decision.reason);
    },
  );
  return committed!;
}

/** The clock's own check; null when no deadline has passed. */
export function commitDeadline(exerciseId: string, now = Date.now()): Committed | null {
  return commitChange(exerciseId, { id: null, name: SYSTEM_NAME }, null, deadlinePassed, now);
}
