/**
 * What each intent does, inside the transaction the commit opens: check the
 * play rules (turn, stage, clock), change the rows, and say what changed.
 * Access was decided before (see `accessFor`); refusals throw IntentError.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { schema } from '../../db/client';
import type { ExerciseClock } from '../../db/schema';
import type { Action as AccessAction, ContextOf, Seat } from '../access';
import type { ExerciseState } from '../roles';
import { attachmentsOfVersion } from '../studio/attachments';
import { extendClock, freshClock, holdClock, NO_CLOCK, startClock } from './clock';
import { advance, chanceOutcome, drawAt, holdAction, isMoving, moverOf, moverTeams, reachableEndings, stageAt, type MovingStage, type Stage } from './play';
import type { Intent, IntentOf, IntentKind } from './protocol';
import { drawSeed } from './draws';
import type { ScenarioInfo } from './scenario-info';
import { readSettings, settingsSchema, type Settings } from './settings';
import { queries } from './queries';
import { IntentError, pendingMoves, type ExerciseRow, type MoveRow, type Tx } from './state';
import type { SectionName } from './view';

export type Audience =
  | { kind: 'all' }
  | { kind: 'team'; teamId: string }
  | { kind: 'notes' }
  | { kind: 'inject'; to: string[] | 'all' }
  | { kind: 'staff' };

export type Change = {
  kind: string;
  summary: string;
  data?: Record<string, unknown>;
  /** The snapshot sections the change touched; 'all' sends everyone a fresh snapshot. */
  sections: SectionName[] | 'all';
  audience?: Audience;
  result?: Record<string, unknown>;
};

export type PlayContext = {
  tx: Tx;
  exercise: ExerciseRow;
  settings: Settings;
  scenario: ScenarioInfo;
  stage: Stage;
  actor: { id: string | null; name: string };
  seat: Seat | null;
  now: number;
};

type Command<K extends IntentKind> = (ctx: PlayContext, intent: IntentOf<K>) => Change;

// ---------------------------------------------------------------------------
// Who may send which intent: one access action each, with its context.

export function accessFor(intent: Intent, seat: Seat | null, exercise: ExerciseRow): { action: AccessAction; ctx: ContextOf<AccessAction> } {
  const base = { seat, state: exercise.state, settings: readSettings(exercise.settings) };
  const team = { ...base, teamId: seat?.teamId ?? '' };
  switch (intent.kind) {
    case 'draft':
      return { action: 'move.draft', ctx: team };
    case 'submit':
      return { action: 'move.submit', ctx: team };
    case 'note':
      return { action: 'note.write', ctx: base };
    default:
      return { action: 'exercise.run', ctx: base };
  }
}

// ---------------------------------------------------------------------------
// Shared steps.

function teamName(ctx: PlayContext, teamId: string | null): string {
  return ctx.scenario.teams.find((t) => t.id === teamId)?.name ?? teamId ?? 'Chance';
}

function update(ctx: PlayContext, patch: Partial<ExerciseRow>): void {
  ctx.tx.update(schema.exercise).set(patch).where(eq(schema.exercise.id, ctx.exercise.id)).run();
  Object.assign(ctx.exercise, patch);
  if (patch.nodeId) ctx.stage = stageAt(ctx.scenario.game, patch.nodeId);
}

function clockOf(ctx: PlayContext): ExerciseClock {
  return ctx.exercise.clock ?? NO_CLOCK;
}

function requireTurn(ctx: PlayContext, turn: number): void {
  if (turn !== ctx.exercise.turn) {
    throw new IntentError('stale-turn', `This was meant for turn ${turn}, but play is at turn ${ctx.exercise.turn}. Look at the current situation and try again.`, [
      { field: 'turn', reason: `play is at turn ${ctx.exercise.turn}` },
    ]);
  }
}

function requireState(ctx: PlayContext, states: ExerciseState[], doing: string): void {
  if (!states.includes(ctx.exercise.state)) {
    throw new IntentError('conflict', `You cannot ${doing} while the exercise is ${ctx.exercise.state}`);
  }
}

function movingStage(ctx: PlayContext): MovingStage {
  if (ctx.stage.kind === 'chance') throw new IntentError('conflict', 'Play stands at a chance node: the facilitator resolves it');
  if (ctx.stage.kind === 'terminal') throw new IntentError('conflict', 'The game has reached an outcome; nobody moves any more');
  return ctx.stage;
}

function requireMover(ctx: PlayContext, teamId: string): MovingStage {
  const stage = movingStage(ctx);
  const teams = moverTeams(stage);
  if (!teams.includes(teamId)) {
    const movers = teams.map((t) => teamName(ctx, t)).join(' and ');
    throw new IntentError('conflict', `It is not ${teamName(ctx, teamId)}'s move: ${movers} ${teams.length > 1 ? 'move' : 'moves'} this turn`);
  }
  return stage;
}

function requireAction(stage: MovingStage, teamId: string, label: string, field: string): string {
  const actions = moverOf(stage, teamId)?.actions ?? [];
  if (actions.includes(label)) return label;
  throw new IntentError('invalid', `"${label}" is not one of the options open at this turn`, [{ field, reason: `choose one of: ${actions.join(', ')}` }]);
}

function pending(ctx: PlayContext): MoveRow[] {
  return pendingMoves(ctx.exercise.id, ctx.exercise.turn);
}

function pendingOf(ctx: PlayContext, teamId: string): MoveRow | undefined {
  return pending(ctx).find((m) => m.teamId === teamId);
}

function clearDrafts(ctx: PlayContext): void {
  ctx.tx.delete(schema.exerciseDraft).where(eq(schema.exerciseDraft.exerciseId, ctx.exercise.id)).run();
}

/** Move play to a node: the next turn, a fresh clock, no drafts; an outcome ends the exercise. */
function enterNode(ctx: PlayContext, nodeId: string): void {
  const stage = stageAt(ctx.scenario.game, nodeId);
  const live = ctx.exercise.state === 'live';
  const clock = isMoving(stage) ? freshClock(ctx.settings.turnSeconds, live, ctx.now) : NO_CLOCK;
  const ending = stage.kind === 'terminal' ? { state: 'ended' as const, endedAt: new Date(ctx.now) } : {};
  update(ctx, { nodeId, turn: ctx.exercise.turn + 1, clock, ...ending });
  clearDrafts(ctx);
}

/** Put the sealed moves of the stage in effect and go on to where they lead. */
function resolveStage(ctx: PlayContext): { nodeId: string; labels: string[] } {
  const stage = movingStage(ctx);
  const moves = pending(ctx);
  const choices = Object.fromEntries(moves.map((m) => [m.teamId!, m.label!]));
  const { nodeId, steps } = advance(ctx.scenario.game, stage, choices);
  for (const step of steps) {
    const move = moves.find((m) => m.teamId === step.teamId)!;
    ctx.tx
      .update(schema.exerciseMove)
      .set({ status: 'revealed', nodeId: step.nodeId, revealedAt: new Date(ctx.now) })
      .where(eq(schema.exerciseMove.id, move.id))
      .run();
  }
  enterNode(ctx, nodeId);
  return { nodeId, labels: steps.map((s) => `${teamName(ctx, s.teamId)}: ${s.label}`) };
}

function allSealed(ctx: PlayContext): boolean {
  const stage = movingStage(ctx);
  const moves = pending(ctx);
  return moverTeams(stage).every((t) => moves.some((m) => m.teamId === t && m.status === 'sealed'));
}

/** A sequential turn takes effect as soon as its move is decided; a simultaneous one waits for the reveal. */
function resolveIfSequential(ctx: PlayContext): string | null {
  if (ctx.stage.kind !== 'decision' || !allSealed(ctx)) return null;
  return resolveStage(ctx).labels.join('; ');
}

const PLAY_SECTIONS: SectionName[] = ['exercise', 'me', 'situation', 'clock', 'moves', 'drafts', 'authored', 'analysis'];

function insertMove(ctx: PlayContext, values: Partial<MoveRow> & Pick<MoveRow, 'kind' | 'status'>): string {
  const id = crypto.randomUUID();
  ctx.tx
    .insert(schema.exerciseMove)
    .values({ id, exerciseId: ctx.exercise.id, turn: ctx.exercise.turn, stageNodeId: ctx.stage.nodeId, createdAt: new Date(ctx.now), ...values })
    .run();
  return id;
}

// ---------------------------------------------------------------------------
// Team intents.

const draft: Command<'draft'> = (ctx, intent) => {
  requireTurn(ctx, intent.turn);
  const teamId = ctx.seat!.teamId!;
  const stage = requireMover(ctx, teamId);
  if (pendingOf(ctx, teamId)) throw new IntentError('conflict', 'Your team has submitted its move for this turn already');
  if (intent.label !== null) requireAction(stage, teamId, intent.label, 'label');
  queries().upsertDraft.run({
    exerciseId: ctx.exercise.id,
    teamId,
    turn: ctx.exercise.turn,
    label: intent.label,
    proposal: intent.proposal || null,
    rationale: intent.rationale,
    confidence: intent.confidence,
    updatedBy: ctx.actor.id,
    updatedByName: ctx.actor.name,
    updatedAt: new Date(ctx.now),
  });
  return {
    kind: 'draft',
    summary: `${ctx.actor.name} updated ${teamName(ctx, teamId)}'s draft`,
    data: { teamId },
    sections: ['drafts', 'situation'],
    audience: { kind: 'team', teamId },
  };
};

const submit: Command<'submit'> = (ctx, intent) => {
  requireTurn(ctx, intent.turn);
  const teamId = ctx.seat!.teamId!;
  const stage = requireMover(ctx, teamId);
  if (pendingOf(ctx, teamId)) throw new IntentError('conflict', 'Your team has submitted its move for this turn already');
  if (clockOf(ctx).status === 'expired') {
    throw new IntentError('conflict', 'The deadline for this turn has passed: the facilitator decides your team’s move');
  }
  const common = {
    teamId,
    rationale: intent.rationale || null,
    confidence: intent.confidence,
    submittedBy: ctx.actor.id,
    submittedByName: ctx.actor.name,
  };
  const name = teamName(ctx, teamId);
  if ('proposal' in intent.choice) {
    const moveId = insertMove(ctx, { ...common, kind: 'adjudicated', status: 'proposed', proposal: intent.choice.proposal });
    ctx.tx.delete(schema.exerciseDraft).where(and(eq(schema.exerciseDraft.exerciseId, ctx.exercise.id), eq(schema.exerciseDraft.teamId, teamId))).run();
    return {
      kind: 'propose',
      summary: `${name} proposed a move off the ladder; the facilitator adjudicates it`,
      data: { teamId, moveId },
      sections: ['situation', 'drafts'],
      result: { moveId, status: 'proposed' },
    };
  }
  const label = requireAction(stage, teamId, intent.choice.action, 'choice.action');
  const moveId = insertMove(ctx, { ...common, kind: 'ladder', status: 'sealed', label });
  const resolved = resolveIfSequential(ctx);
  if (!resolved) {
    ctx.tx.delete(schema.exerciseDraft).where(and(eq(schema.exerciseDraft.exerciseId, ctx.exercise.id), eq(schema.exerciseDraft.teamId, teamId))).run();
  }
  return {
    kind: 'submit',
    summary: resolved ? `${name} moved: ${label}` : `${name} submitted its move (sealed until the reveal)`,
    data: { teamId, moveId },
    sections: resolved ? PLAY_SECTIONS : ['situation', 'drafts'],
    result: { moveId, status: resolved ? 'revealed' : 'sealed' },
  };
};

// ---------------------------------------------------------------------------
// Facilitator intents.

const reveal: Command<'reveal'> = (ctx, intent) => {
  requireTurn(ctx, intent.turn);
  requireState(ctx, ['live', 'paused'], 'reveal moves');
  const stage = movingStage(ctx);
  const moves = pending(ctx);
  const missing = moverTeams(stage).filter((t) => !moves.some((m) => m.teamId === t));
  if (missing.length > 0) throw new IntentError('conflict', `Waiting for ${missing.map((t) => teamName(ctx, t)).join(' and ')}`);
  const proposed = moves.filter((m) => m.status === 'proposed');
  if (proposed.length > 0) {
    throw new IntentError('conflict', `Adjudicate ${proposed.map((m) => teamName(ctx, m.teamId)).join(' and ')}'s proposal first`);
  }
  const { labels } = resolveStage(ctx);
  return { kind: 'reveal', summary: `Revealed turn ${intent.turn}: ${labels.join('; ')}`, sections: PLAY_SECTIONS };
};

const adjudicate: Command<'adjudicate'> = (ctx, intent) => {
  requireTurn(ctx, intent.turn);
  requireState(ctx, ['live', 'paused'], 'adjudicate');
  const stage = requireMover(ctx, intent.teamId);
  const existing = pendingOf(ctx, intent.teamId);
  if (existing?.status === 'sealed') throw new IntentError('conflict', `${teamName(ctx, intent.teamId)}'s move is decided already`);
  const name = teamName(ctx, intent.teamId);
  if ('outcome' in intent.decision) return endAtOutcome(ctx, intent, intent.decision.outcome, existing);
  const label = requireAction(stage, intent.teamId, intent.decision.action, 'decision.action');
  let moveId = existing?.id;
  if (existing) {
    ctx.tx.update(schema.exerciseMove).set({ label, status: 'sealed', reason: intent.reason }).where(eq(schema.exerciseMove.id, existing.id)).run();
  } else {
    moveId = insertMove(ctx, { teamId: intent.teamId, kind: 'adjudicated', status: 'sealed', label, reason: intent.reason, submittedByName: null });
  }
  const resolved = resolveIfSequential(ctx);
  return {
    kind: 'adjudicate',
    summary: `${ctx.actor.name} decided ${name}'s move as "${label}": ${intent.reason}`,
    data: { teamId: intent.teamId, moveId },
    sections: resolved ? PLAY_SECTIONS : ['situation', 'drafts'],
    result: { moveId, status: resolved ? 'revealed' : 'sealed' },
  };
};

function endAtOutcome(ctx: PlayContext, intent: IntentOf<'adjudicate'>, outcomeId: string, existing: MoveRow | undefined): Change {
  const ending = reachableEndings(ctx.scenario.game, ctx.stage.nodeId).find((t) => t.id === outcomeId);
  if (!ending) {
    throw new IntentError('invalid', 'That outcome cannot be reached from where play stands', [{ field: 'decision.outcome', reason: 'not a reachable outcome' }]);
  }
  const others = pending(ctx).filter((m) => m.id !== existing?.id);
  if (others.length > 0) {
    ctx.tx
      .update(schema.exerciseMove)
      .set({ status: 'undone', undoneAt: new Date(ctx.now), undoReason: 'The facilitator ended the game at an outcome in this turn' })
      .where(inArray(schema.exerciseMove.id, others.map((m) => m.id)))
      .run();
  }
  const label = `Ended at: ${ending.outcome ?? ending.id}`;
  const values = { label, status: 'revealed' as const, reason: intent.reason, nodeId: ctx.stage.nodeId, outcomeNodeId: ending.id, revealedAt: new Date(ctx.now) };
  let moveId = existing?.id;
  if (existing) ctx.tx.update(schema.exerciseMove).set(values).where(eq(schema.exerciseMove.id, existing.id)).run();
  else moveId = insertMove(ctx, { teamId: intent.teamId, kind: 'adjudicated', submittedByName: null, ...values });
  enterNode(ctx, ending.id);
  return {
    kind: 'adjudicate',
    summary: `${ctx.actor.name} ended the game for ${teamName(ctx, intent.teamId)}'s move at "${ending.outcome ?? ending.id}": ${intent.reason}`,
    data: { teamId: intent.teamId, moveId, outcomeNodeId: ending.id },
    sections: PLAY_SECTIONS,
    result: { moveId, status: 'revealed' },
  };
}

const chance: Command<'chance'> = (ctx, intent) => {
  requireTurn(ctx, intent.turn);
  requireState(ctx, ['live', 'paused'], 'resolve a chance node');
  if (ctx.stage.kind !== 'chance') throw new IntentError('conflict', 'Play does not stand at a chance node');
  const { game } = ctx.scenario;
  const nodeId = ctx.stage.nodeId;
  if (intent.outcome !== undefined) {
    const chosen = chanceOutcome(game, nodeId, intent.outcome);
    if (!chosen) {
      throw new IntentError('invalid', `"${intent.outcome}" is not an outcome of this chance node`, [
        { field: 'outcome', reason: `choose one of: ${ctx.stage.outcomes.map((o) => o.label).join(', ')}` },
      ]);
    }
    const moveId = insertMove(ctx, { kind: 'chance', status: 'revealed', label: chosen.label, nodeId, reason: intent.reason!, revealedAt: new Date(ctx.now), submittedByName: ctx.actor.name });
    enterNode(ctx, chosen.nodeId);
    return { kind: 'chance', summary: `${ctx.actor.name} chose the chance outcome "${chosen.label}": ${intent.reason}`, data: { moveId }, sections: PLAY_SECTIONS, result: { moveId, label: chosen.label } };
  }
  const index = ctx.exercise.draws;
  const seed = drawSeed(ctx.exercise.chanceSeed!, index);
  const drawn = drawAt(game, nodeId, seed);
  const moveId = insertMove(ctx, { kind: 'chance', status: 'revealed', label: drawn.label, nodeId, drawSeed: String(seed), drawValue: drawn.value, revealedAt: new Date(ctx.now) });
  update(ctx, { draws: index + 1 });
  enterNode(ctx, drawn.nodeId);
  return {
    kind: 'chance',
    summary: `Seeded draw no. ${index + 1} (mulberry32 seed ${seed}) gave ${drawn.value.toFixed(6)}: "${drawn.label}"`,
    data: { moveId, seed: String(seed), value: drawn.value },
    sections: PLAY_SECTIONS,
    result: { moveId, label: drawn.label, seed: String(seed), value: drawn.value },
  };
};

const clock: Command<'clock'> = (ctx, intent) => {
  requireState(ctx, ['briefing', 'live', 'paused'], 'work the clock');
  movingStage(ctx);
  const current = clockOf(ctx);
  if (current.status === 'none') throw new IntentError('conflict', 'This exercise has no turn clock; set a turn length in the settings first');
  let next = current;
  if (intent.action === 'start') {
    if (ctx.exercise.state !== 'live') throw new IntentError('conflict', 'The clock runs only while the exercise is live');
    if (current.status === 'expired') throw new IntentError('conflict', 'Time is up for this turn; extend the clock to give more');
    next = startClock(current, ctx.now);
  } else if (intent.action === 'hold') {
    next = holdClock(current, ctx.now);
  } else {
    next = extendClock(current, intent.seconds!, ctx.now);
    if (current.status === 'expired' && ctx.exercise.state !== 'live') next = holdClock(next, ctx.now, true);
  }
  update(ctx, { clock: next });
  const words = { start: 'started the clock', hold: 'held the clock', extend: `added ${intent.seconds} s to the clock` };
  return { kind: 'clock', summary: `${ctx.actor.name} ${words[intent.action]}`, sections: ['clock', 'situation'] };
};

const PHASES: Record<ExerciseState, ExerciseState[]> = {
  draft: ['briefing', 'live'],
  briefing: ['live', 'draft'],
  live: ['paused', 'ended'],
  paused: ['live', 'ended'],
  ended: [],
};

const phase: Command<'phase'> = (ctx, intent) => {
  const from = ctx.exercise.state;
  if (!PHASES[from].includes(intent.to)) {
    throw new IntentError('conflict', from === 'ended' ? 'The exercise has ended' : `An exercise that is ${from} cannot become ${intent.to}`);
  }
  const current = clockOf(ctx);
  const patch: Partial<ExerciseRow> = { state: intent.to };
  if (intent.to === 'live' && !ctx.exercise.startedAt) patch.startedAt = new Date(ctx.now);
  if (intent.to === 'live' && current.status === 'held' && current.resumeOnLive) patch.clock = startClock(current, ctx.now);
  if (intent.to === 'paused' || intent.to === 'briefing' || intent.to === 'draft') patch.clock = holdClock(current, ctx.now, current.status === 'running' || current.resumeOnLive);
  if (intent.to === 'ended') Object.assign(patch, { endedAt: new Date(ctx.now), clock: NO_CLOCK });
  update(ctx, patch);
  const words: Record<ExerciseState, string> = { draft: 'returned the exercise to set-up', briefing: 'opened the briefing', live: from === 'paused' ? 'resumed play' : 'started play', paused: 'paused play', ended: 'ended the exercise' };
  return {
    kind: 'phase',
    summary: `${ctx.actor.name} ${words[intent.to]}${intent.reason ? `: ${intent.reason}` : ''}`,
    data: { from, to: intent.to },
    sections: ['exercise', 'me', 'clock', 'situation'],
  };
};

const inject: Command<'inject'> = (ctx, intent) => {
  requireState(ctx, ['briefing', 'live', 'paused'], 'send injects');
  const teamIds = new Set(ctx.scenario.teams.map((t) => t.id));
  if (intent.to !== 'all') {
    intent.to.forEach((t, i) => {
      if (!teamIds.has(t)) throw new IntentError('invalid', `There is no team "${t}" in this exercise`, [{ field: `to.${i}`, reason: 'unknown team' }]);
    });
  }
  if (intent.authoredId !== null) {
    if (!ctx.scenario.injects.some((a) => a.id === intent.authoredId)) {
      throw new IntentError('invalid', 'The scenario has no such inject', [{ field: 'authoredId', reason: 'unknown inject' }]);
    }
    const released = ctx.tx
      .select({ id: schema.exerciseInject.id })
      .from(schema.exerciseInject)
      .where(and(eq(schema.exerciseInject.exerciseId, ctx.exercise.id), eq(schema.exerciseInject.authoredId, intent.authoredId)))
      .get();
    if (released) throw new IntentError('conflict', 'This inject was sent already');
  }
  checkAttachments(ctx, intent.attachmentIds);
  const id = crypto.randomUUID();
  ctx.tx
    .insert(schema.exerciseInject)
    .values({
      id,
      exerciseId: ctx.exercise.id,
      turn: ctx.exercise.turn,
      nodeId: ctx.stage.nodeId,
      authoredId: intent.authoredId,
      title: intent.title,
      body: intent.body,
      audience: intent.to,
      attachmentIds: intent.attachmentIds,
      sentBy: ctx.actor.id,
      createdAt: new Date(ctx.now),
    })
    .run();
  const to = intent.to === 'all' ? 'all teams' : intent.to.map((t) => teamName(ctx, t)).join(', ');
  return {
    kind: 'inject',
    summary: `${ctx.actor.name} sent the inject "${intent.title}" to ${to}`,
    data: { injectId: id, to: intent.to },
    sections: ['injects', 'authored'],
    audience: { kind: 'inject', to: intent.to },
    result: { injectId: id },
  };
};

function checkAttachments(ctx: PlayContext, ids: string[]): void {
  if (ids.length === 0) return;
  const known = new Set(attachmentsOfVersion(ctx.exercise.scenarioVersionId).map((a) => a.id));
  ids.forEach((id, i) => {
    if (!known.has(id)) throw new IntentError('invalid', 'An attachment is not one of this scenario version’s documents', [{ field: `attachmentIds.${i}`, reason: 'unknown document' }]);
  });
}

const undo: Command<'undo'> = (ctx, intent) => {
  requireTurn(ctx, intent.turn);
  requireState(ctx, ['live', 'paused', 'ended'], 'undo');
  const previous = ctx.exercise.turn - 1;
  const last = ctx.tx
    .select()
    .from(schema.exerciseMove)
    .where(and(eq(schema.exerciseMove.exerciseId, ctx.exercise.id), eq(schema.exerciseMove.turn, previous), eq(schema.exerciseMove.status, 'revealed')))
    .all();
  if (previous < 1 || last.length === 0) throw new IntentError('conflict', 'Nothing to undo: no turn has been played yet');
  const undone = [...last, ...pending(ctx)];
  ctx.tx
    .update(schema.exerciseMove)
    .set({ status: 'undone', undoneAt: new Date(ctx.now), undoReason: intent.reason })
    .where(inArray(schema.exerciseMove.id, undone.map((m) => m.id)))
    .run();
  const stageNodeId = last[0]!.stageNodeId;
  const stage = stageAt(ctx.scenario.game, stageNodeId);
  const wasEnded = ctx.exercise.state === 'ended';
  const state = wasEnded ? 'paused' : ctx.exercise.state;
  const clockNext = stage.kind === 'chance' ? NO_CLOCK : freshClock(ctx.settings.turnSeconds, state === 'live', ctx.now);
  update(ctx, { nodeId: stageNodeId, turn: previous, clock: clockNext, state, endedAt: null });
  clearDrafts(ctx);
  return {
    kind: 'undo',
    summary: `${ctx.actor.name} undid turn ${previous} (${last.map((m) => `${teamName(ctx, m.teamId)}: ${m.label}`).join('; ')}): ${intent.reason}`,
    data: { turn: previous, moveIds: undone.map((m) => m.id) },
    sections: PLAY_SECTIONS,
  };
};

const note: Command<'note'> = (ctx, intent) => {
  intent.tags.forEach((tag, i) => {
    if (!ctx.settings.tags.includes(tag)) {
      throw new IntentError('invalid', `"${tag}" is not one of this exercise's tags`, [{ field: `tags.${i}`, reason: `use one of: ${ctx.settings.tags.join(', ')}` }]);
    }
  });
  if (intent.turn !== null && intent.turn > ctx.exercise.turn) {
    throw new IntentError('invalid', `Turn ${intent.turn} has not been reached`, [{ field: 'turn', reason: `play is at turn ${ctx.exercise.turn}` }]);
  }
  let turn = intent.turn;
  if (intent.moveId !== null) {
    const move = ctx.tx.select().from(schema.exerciseMove).where(and(eq(schema.exerciseMove.id, intent.moveId), eq(schema.exerciseMove.exerciseId, ctx.exercise.id))).get();
    if (!move || move.status !== 'revealed') throw new IntentError('invalid', 'There is no such move in this exercise', [{ field: 'moveId', reason: 'unknown move' }]);
    turn = move.turn;
  }
  const id = crypto.randomUUID();
  ctx.tx
    .insert(schema.exerciseNote)
    .values({ id, exerciseId: ctx.exercise.id, turn, moveId: intent.moveId, tags: intent.tags, text: intent.text, authorId: ctx.actor.id!, authorName: ctx.actor.name, createdAt: new Date(ctx.now) })
    .run();
  return { kind: 'note', summary: `${ctx.actor.name} wrote an observer note`, data: { noteId: id }, sections: ['notes'], audience: { kind: 'notes' }, result: { noteId: id } };
};

const settings: Command<'settings'> = (ctx, intent) => {
  const merged = settingsSchema.safeParse({ ...ctx.settings, ...intent.patch });
  if (!merged.success) throw new IntentError('invalid', 'These settings do not fit together', merged.error.issues.map((i) => ({ field: `patch.${i.path.join('.')}`, reason: i.message })));
  const patch: Partial<ExerciseRow> = { settings: merged.data };
  if (intent.patch.turnSeconds !== undefined && isMoving(ctx.stage) && clockOf(ctx).status !== 'running') {
    patch.clock = freshClock(merged.data.turnSeconds, false, ctx.now);
  }
  update(ctx, patch);
  ctx.settings = merged.data;
  return { kind: 'settings', summary: `${ctx.actor.name} changed the settings (${Object.keys(intent.patch).join(', ')})`, data: { patch: intent.patch }, sections: 'all' };
};

// ---------------------------------------------------------------------------
// The clock's own change: what happens at a deadline.

export function deadlinePassed(ctx: PlayContext): Change | null {
  const current = clockOf(ctx);
  if (current.status !== 'running' || current.deadlineAt === null || current.deadlineAt > ctx.now) return null;
  if (!isMoving(ctx.stage)) return null;
  const held: string[] = [];
  if (ctx.settings.atDeadline === 'hold') {
    for (const mover of ctx.stage.movers) {
      if (pendingOf(ctx, mover.team)) continue;
      const label = holdAction(mover);
      if (!label) continue;
      insertMove(ctx, { teamId: mover.team, kind: 'adjudicated', status: 'sealed', label, reason: 'Time ran out; by this exercise’s rule the team holds its position', submittedByName: null });
      held.push(`${teamName(ctx, mover.team)}: ${label}`);
    }
  }
  update(ctx, { clock: { ...current, status: 'expired' } });
  const resolved = resolveIfSequential(ctx);
  const what = held.length > 0 ? `held ${held.join('; ')}` : 'the facilitator decides the missing moves';
  return {
    kind: 'deadline',
    summary: `Time ran out for turn ${ctx.exercise.turn - (resolved ? 1 : 0)}: ${what}`,
    sections: resolved || held.length > 0 ? PLAY_SECTIONS : ['clock', 'situation'],
  };
}

export const COMMANDS: { [K in IntentKind]: Command<K> } = { draft, submit, reveal, adjudicate, chance, clock, phase, inject, undo, note, settings };
