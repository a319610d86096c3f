/**
 * The snapshot, section by section, for one viewer. Every "may this viewer see
 * it" question goes to src/lib/access.ts; nothing is hidden only in the browser.
 * A `Source` reads each table once however many viewers it serves.
 */
import { and, desc, eq, gt, isNull, ne } from 'drizzle-orm';
import { db, schema } from '../../db/client';
import { allowed, decide, type Action, type ContextOf, type ExerciseContext, type Seat } from '../access';
import { EXERCISE_ROLES, type PlatformRole } from '../roles';
import { shared } from '../runtime';
import { attachmentDecision, attachmentsOfVersion, type AttachmentInfo } from '../studio/attachments';
import { analysisAt } from './analysis';
import type { Audience } from './commands';
import { NO_CLOCK } from './clock';
import { moverTeams, reachableEndings, rungIndexAt, stageAt, type MovingStage, type Stage } from './play';
import { noteOf, playedMove, playOrder } from './record';
import { scenarioInfo, type ScenarioInfo } from './scenario-info';
import { readSettings, type Settings } from './settings';
import { queries } from './queries';
import { exerciseRow, pendingMoves, revealedMoves, type ExerciseRow, type MoveRow } from './state';
import type {
  AttachmentView,
  BriefView,
  MoverStatus,
  OptionView,
  SectionName,
  SeatView,
  Snapshot,
  SituationView,
  TeamView,
} from './view';

export type Viewer = { userId: string; name: string; role: PlatformRole; seat: Seat };

export const LOG_LIMIT = 300;

/** Lazily read rows of one exercise at one moment, shared by every viewer of an update. */
export class Source {
  private memo = new Map<string, unknown>();
  constructor(readonly exerciseId: string) {}

  private once<T>(key: string, read: () => T): T {
    if (!this.memo.has(key)) this.memo.set(key, read());
    return this.memo.get(key) as T;
  }

  get exercise(): ExerciseRow {
    return this.once('exercise', () => {
      const row = exerciseRow(this.exerciseId);
      if (!row) throw new Error(`exercise ${this.exerciseId} is gone`);
      return row;
    });
  }
  get settings(): Settings {
    return this.once('settings', () => readSettings(this.exercise.settings));
  }
  get scenario(): ScenarioInfo {
    return this.once('scenario', () => scenarioInfo(this.exercise.scenarioVersionId));
  }
  get stage(): Stage {
    return this.once('stage', () => stageAt(this.scenario.game, this.exercise.nodeId!));
  }
  get pending(): MoveRow[] {
    return this.once('pending', () => pendingMoves(this.exerciseId, this.exercise.turn));
  }
  get revealed(): MoveRow[] {
    return this.once('revealed', () => playOrder(this.scenario.game, revealedMoves(this.exerciseId)));
  }
  get drafts() {
    return this.once('drafts', () => queries().drafts.all({ exerciseId: this.exerciseId }));
  }
  get injects() {
    return this.once('injects', () => queries().injects.all({ exerciseId: this.exerciseId }));
  }
  get notes() {
    return this.once('notes', () => queries().notes.all({ exerciseId: this.exerciseId }));
  }
  /** The version's briefing documents; a frozen version's list never changes, so it is read once per process. */
  get attachments(): AttachmentInfo[] {
    const versionId = this.exercise.scenarioVersionId;
    const cache = shared('exercise.attachment-cache', () => new Map<string, AttachmentInfo[]>());
    if (!cache.has(versionId)) cache.set(versionId, attachmentsOfVersion(versionId));
    return cache.get(versionId)!;
  }
  get members() {
    return this.once('members', () => queries().members.all({ exerciseId: this.exerciseId }));
  }
  get scenarioTitle(): string {
    return this.once('scenarioTitle', () => queries().scenarioTitle.get({ id: this.scenario.scenarioId })?.title ?? this.scenario.title);
  }
  log(after = 0) {
    return db()
      .select()
      .from(schema.exerciseEvent)
      .where(and(eq(schema.exerciseEvent.exerciseId, this.exerciseId), gt(schema.exerciseEvent.seq, after), ne(schema.exerciseEvent.kind, 'draft')))
      .orderBy(desc(schema.exerciseEvent.seq))
      .limit(LOG_LIMIT)
      .all()
      .reverse();
  }
}

// ---------------------------------------------------------------------------
// Access helpers: every visibility question is an access decision.

function context(source: Source, viewer: Viewer): ExerciseContext {
  return { seat: viewer.seat, state: source.exercise.state, settings: source.settings };
}

function may<A extends Action>(source: Source, viewer: Viewer, action: A, extra: Partial<ContextOf<A>> = {}): boolean {
  return allowed({ id: viewer.userId, role: viewer.role }, action, { ...context(source, viewer), ...extra } as ContextOf<A>);
}

const seesTeamWork = (s: Source, v: Viewer, teamId: string) => may(s, v, 'team.work.read', { teamId });
/** Rationale and confidence of revealed moves: the team itself, the facilitators and the observers. */
const seesReasoning = (s: Source, v: Viewer, teamId: string | null) => teamId === null || seesTeamWork(s, v, teamId) || may(s, v, 'note.read');

export function inAudience(source: Source, viewer: Viewer, audience: Audience | undefined): boolean {
  if (!audience || audience.kind === 'all') return true;
  if (audience.kind === 'team') return seesTeamWork(source, viewer, audience.teamId);
  if (audience.kind === 'notes') return may(source, viewer, 'note.read');
  if (audience.kind === 'inject') return may(source, viewer, 'inject.read', { to: audience.to });
  return may(source, viewer, 'exercise.run');
}

function attachmentView(a: AttachmentInfo): AttachmentView {
  return { id: a.id, filename: a.filename, contentType: a.contentType, size: a.size };
}

function readable(viewer: Viewer, attachments: AttachmentInfo[]): AttachmentView[] {
  return attachments.filter((a) => attachmentDecision({ id: viewer.userId, role: viewer.role }, a.id).ok).map(attachmentView);
}

// ---------------------------------------------------------------------------
// Sections.

function teamsView(source: Source): TeamView[] {
  return source.scenario.teams.map((team) => {
    const players = source.members.filter((m) => m.m.role === 'player' && m.m.teamId === team.id);
    return { id: team.id, name: team.name, colour: team.colour, lead: players.find((p) => p.m.isLead)?.name ?? null, members: players.map((p) => p.name) };
  });
}

function exerciseView(source: Source, viewer: Viewer): Snapshot['exercise'] {
  const e = source.exercise;
  const s = source.settings;
  const settings = may(source, viewer, 'exercise.run')
    ? s
    : { submitter: s.submitter, turnSeconds: s.turnSeconds, atDeadline: s.atDeadline, ...(may(source, viewer, 'note.write') ? { tags: s.tags } : {}) };
  return {
    id: e.id,
    title: e.title,
    state: e.state,
    scenarioTitle: source.scenarioTitle,
    setting: source.scenario.setting,
    teams: teamsView(source),
    settings,
    startedAt: e.startedAt?.getTime() ?? null,
    endedAt: e.endedAt?.getTime() ?? null,
  };
}

function seatView(source: Source, viewer: Viewer): SeatView {
  const teamCtx = { ...context(source, viewer), teamId: viewer.seat.teamId ?? '' };
  const actor = { id: viewer.userId, role: viewer.role };
  const submit = decide(actor, 'move.submit', teamCtx);
  return {
    userId: viewer.userId,
    name: viewer.name,
    role: viewer.seat.role,
    teamId: viewer.seat.teamId,
    isLead: viewer.seat.isLead,
    may: {
      draft: allowed(actor, 'move.draft', teamCtx),
      submit: submit.ok,
      run: may(source, viewer, 'exercise.run'),
      note: may(source, viewer, 'note.write'),
      analysis: may(source, viewer, 'analysis.read'),
    },
    submitRefusal: submit.ok ? null : submit.reason,
  };
}

function optionsOf(stage: MovingStage, teamId: string): OptionView[] {
  return (stage.movers.find((m) => m.team === teamId)?.options ?? []).map((a) => ({
    label: a.label,
    description: a.rung?.description ?? null,
    rungName: a.rung?.name ?? null,
    intensity: a.rung?.intensity ?? null,
    move: a.move ?? null,
  }));
}

function situationView(source: Source, viewer: Viewer): SituationView {
  const stage = source.stage;
  const game = source.scenario.game;
  const rungIndex = rungIndexAt(game, stage.nodeId) ?? source.scenario.startRung;
  const rung = rungIndex === null ? null : (game.rungs?.[rungIndex] ?? null);
  const base: SituationView = {
    turn: source.exercise.turn,
    nodeId: stage.nodeId,
    kind: stage.kind,
    rung: rung ? { name: rung.name, description: rung.description, intensity: rung.intensity } : null,
    movers: [],
    options: {},
    chance: null,
    outcome: null,
    sealed: [],
    endings: null,
  };
  if (stage.kind === 'chance') return { ...base, chance: stage.outcomes.map((o) => ({ label: o.label, p: o.exact })) };
  if (stage.kind === 'terminal') {
    const payoffs = may(source, viewer, 'analysis.read') ? Object.fromEntries(Object.entries(stage.payoffs).map(([t, v]) => [t, v.value.toFixed(2)])) : null;
    return { ...base, outcome: { text: stage.outcome ?? 'The game has reached an outcome', payoffs } };
  }
  const movers = moverTeams(stage).map((teamId) => {
    const move = source.pending.find((m) => m.teamId === teamId);
    const private_ = seesTeamWork(source, viewer, teamId);
    const drafting = source.drafts.some((d) => d.teamId === teamId && d.turn === source.exercise.turn);
    let status: MoverStatus = move ? 'submitted' : 'waiting';
    if (private_ && move?.status === 'proposed') status = 'proposed';
    if (private_ && !move && drafting) status = 'drafting';
    return { teamId, status, at: move ? move.createdAt.getTime() : null };
  });
  const options = Object.fromEntries(
    moverTeams(stage).filter((t) => seesTeamWork(source, viewer, t) || may(source, viewer, 'note.read')).map((t) => [t, optionsOf(stage, t)]),
  );
  const sealed = source.pending
    .filter((m) => seesTeamWork(source, viewer, m.teamId!))
    .map((m) => ({
      moveId: m.id,
      teamId: m.teamId!,
      kind: m.kind as 'ladder' | 'adjudicated',
      status: m.status as 'proposed' | 'sealed',
      label: m.label,
      proposal: m.proposal,
      rationale: m.rationale,
      confidence: m.confidence,
      reason: m.reason,
      submittedByName: m.submittedByName,
      at: m.createdAt.getTime(),
    }));
  const endings = may(source, viewer, 'exercise.run') ? reachableEndings(game, stage.nodeId).map((t) => ({ nodeId: t.id, text: t.outcome ?? t.id })) : null;
  return { ...base, movers, options, sealed, endings };
}

function clockView(source: Source): Snapshot['clock'] {
  const clock = source.exercise.clock ?? NO_CLOCK;
  return { status: clock.status, deadlineAt: clock.deadlineAt, leftMs: clock.leftMs, turnSeconds: source.settings.turnSeconds, rule: source.settings.atDeadline };
}

function movesView(source: Source, viewer: Viewer): Snapshot['moves'] {
  return source.revealed.map((row) => {
    const move = playedMove(row);
    if (seesReasoning(source, viewer, row.teamId)) return move;
    return { ...move, rationale: null, confidence: null };
  });
}

function draftsView(source: Source, viewer: Viewer): Snapshot['drafts'] {
  return source.drafts
    .filter((d) => d.turn === source.exercise.turn && seesTeamWork(source, viewer, d.teamId))
    .map((d) => ({ teamId: d.teamId, turn: d.turn, label: d.label, proposal: d.proposal, rationale: d.rationale, confidence: d.confidence, updatedByName: d.updatedByName, updatedAt: d.updatedAt.getTime() }));
}

function injectsView(source: Source, viewer: Viewer): Snapshot['injects'] {
  return source.injects
    .filter((i) => may(source, viewer, 'inject.read', { to: i.audience }))
    .map((i) => ({
      id: i.id,
      turn: i.turn,
      title: i.title,
      body: i.body,
      to: i.audience,
      attachments: readable(viewer, source.attachments.filter((a) => i.attachmentIds.includes(a.id))),
      at: i.createdAt.getTime(),
      marking: 'EXERCISE' as const,
    }));
}

function briefsView(source: Source, viewer: Viewer): BriefView[] {
  const shared: BriefView = {
    teamId: null,
    teamName: 'Every team',
    setting: source.scenario.setting,
    brief: source.scenario.brief,
    attachments: readable(viewer, source.attachments.filter((a) => a.teamId === null)),
  };
  const teams = source.scenario.teams
    .filter((t) => may(source, viewer, 'team.brief.read', { teamId: t.id }))
    .map((t) => ({ teamId: t.id, teamName: t.name, setting: null, brief: t.brief, attachments: readable(viewer, source.attachments.filter((a) => a.teamId === t.id)) }));
  return [shared, ...teams];
}

function authoredView(source: Source): NonNullable<Snapshot['authored']> {
  const released = new Set(source.injects.map((i) => i.authoredId).filter(Boolean));
  return source.scenario.injects.map((a) => ({ ...a, released: released.has(a.id), due: a.nodeId === source.stage.nodeId }));
}

function rosterView(source: Source): NonNullable<Snapshot['roster']> {
  const teamOrder = source.scenario.teams.map((t) => t.id);
  const rank = (m: (typeof source.members)[number]) => [EXERCISE_ROLES.indexOf(m.m.role), teamOrder.indexOf(m.m.teamId ?? ''), m.m.isLead ? 0 : 1];
  const byRank = (a: (typeof source.members)[number], b: (typeof source.members)[number]) => {
    const [x, y] = [rank(a), rank(b)];
    return x[0]! - y[0]! || x[1]! - y[1]! || x[2]! - y[2]! || a.name.localeCompare(b.name);
  };
  const members = [...source.members]
    .sort(byRank)
    .map((m) => ({ membershipId: m.m.id, userId: m.m.userId, name: m.name, email: m.email, role: m.m.role, teamId: m.m.teamId, isLead: m.m.isLead }));
  const invitations = db()
    .select()
    .from(schema.invitation)
    .where(and(eq(schema.invitation.exerciseId, source.exerciseId), isNull(schema.invitation.acceptedAt), isNull(schema.invitation.revokedAt)))
    .all()
    .map((i) => ({ id: i.id, email: i.email, role: i.exerciseRole, teamId: i.teamId, expiresAt: i.expiresAt.getTime() }));
  return { members, invitations };
}

const BUILDERS: { [K in SectionName]: (source: Source, viewer: Viewer) => Snapshot[K] } = {
  exercise: exerciseView,
  me: seatView,
  situation: situationView,
  clock: clockView,
  moves: movesView,
  drafts: draftsView,
  injects: injectsView,
  briefs: briefsView,
  notes: (s, v) => (may(s, v, 'note.read') ? s.notes.map(noteOf) : null),
  authored: (s, v) => (may(s, v, 'exercise.run') ? authoredView(s) : null),
  log: (s, v) => (may(s, v, 'exercise.run') ? s.log().map((e) => ({ seq: e.seq, kind: e.kind, actorName: e.actorName, summary: e.summary, at: e.createdAt.getTime() })) : null),
  roster: (s, v) => (may(s, v, 'exercise.invite') ? rosterView(s) : null),
  analysis: (s, v) => (may(s, v, 'analysis.read') ? analysisAt(s.scenario, s.stage, s.settings.forecastLambda) : null),
};

export function sections(source: Source, viewer: Viewer, names: readonly SectionName[]): Partial<Snapshot> {
  const out: Partial<Snapshot> = {};
  for (const name of names) (out as Record<string, unknown>)[name] = BUILDERS[name](source, viewer);
  return out;
}

export function snapshot(source: Source, viewer: Viewer): Snapshot {
  return sections(source, viewer, Object.keys(BUILDERS) as SectionName[]) as Snapshot;
}

