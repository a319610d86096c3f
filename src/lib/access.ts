/**
 * The one place that answers "may this user do this here?".
 *
 * API routes, pages and socket handlers all call `decide` (or `allowed`);
 * none of them re-implements a rule. Each rule returns `true` or the reason
 * for the refusal, which the caller shows to the user.
 */
import type { ExerciseRole, ExerciseState, PlatformRole } from './roles';

export type Actor = { id: string; role: PlatformRole };

/** The actor's seat in one exercise (their membership row), if any. */
export type Seat = { role: ExerciseRole; teamId: string | null; isLead: boolean };

export type ExerciseSettings = {
  /** Who on a team may submit its move: only the lead, or any member. */
  submitter?: 'lead' | 'any';
  /** Show the equilibrium recommendation and forecast to players. */
  analysisForPlayers?: boolean;
  /** Players may comment on the report draft. */
  playersMayComment?: boolean;
};

export type ExerciseContext = { seat: Seat | null; state: ExerciseState; settings: ExerciseSettings };
export type TeamContext = ExerciseContext & { teamId: string };
/** An inject and the teams it is addressed to. */
export type InjectContext = ExerciseContext & { to: string[] | 'all' };
export type ScenarioContext = { ownerId: string; facilitatesAnExercise: boolean };
/** A briefing document: its scenario, the team whose brief it belongs to (if any), the actor's seats in exercises run on the scenario. */
export type AttachmentContext = { scenario: ScenarioContext; teamId: string | null; seats: Seat[] };

type Contexts = {
  'user.manage': Record<string, never>;
  'outbox.read': Record<string, never>;
  'invitation.create': { role: PlatformRole };
  'scenario.create': Record<string, never>;
  'scenario.read': ScenarioContext;
  'scenario.edit': ScenarioContext;
  'exercise.create': ScenarioContext;
  'attachment.read': AttachmentContext;
  'exercise.view': ExerciseContext;
  'exercise.run': ExerciseContext;
  'exercise.invite': ExerciseContext;
  'team.brief.read': TeamContext;
  'team.work.read': TeamContext;
  'inject.read': InjectContext;
  'move.draft': TeamContext;
  'move.submit': TeamContext;
  'note.read': ExerciseContext;
  'note.write': ExerciseContext;
  'analysis.read': ExerciseContext;
  'review.read': ExerciseContext;
  'report.edit': ExerciseContext;
  'report.comment': ExerciseContext;
  'report.readDraft': ExerciseContext;
  'report.readIssued': ExerciseContext;
  'report.issue': ExerciseContext;
  'report.send': ExerciseContext;
};

export type Action = keyof Contexts;
export type ContextOf<A extends Action> = Contexts[A];

export type Decision = { ok: true } | { ok: false; status: 401 | 403; reason: string };

type Rule<A extends Action> = (actor: Actor, ctx: Contexts[A]) => true | string;

const isAdmin = (actor: Actor) => actor.role === 'admin';
const authors = (actor: Actor) => actor.role === 'admin' || actor.role === 'facilitator';

const inExercise = (ctx: ExerciseContext) => (ctx.seat ? true : 'You are not part of this exercise');
const seatIs =
  (...roles: ExerciseRole[]) =>
  (ctx: ExerciseContext): true | string => {
    if (!ctx.seat) return 'You are not part of this exercise';
    if (roles.includes(ctx.seat.role)) return true;
    return `Only the exercise's ${roles.map(plural).join(' and ')} may do this`;
  };
const plural = (role: ExerciseRole) => `${role}s`;

const onTeam = (ctx: TeamContext): true | string => {
  if (ctx.seat?.role !== 'player') return 'Only players submit moves';
  if (ctx.seat.teamId !== ctx.teamId) return 'You may only act for your own team';
  return true;
};

const readsScenario = (actor: Actor, ctx: ScenarioContext): true | string =>
  ctx.ownerId === actor.id || isAdmin(actor) || ctx.facilitatesAnExercise
    ? true
    : 'This scenario belongs to someone else';

const rules: { [A in Action]: Rule<A> } = {
  'user.manage': (actor) => isAdmin(actor) || 'Only administrators manage users',
  'outbox.read': (actor) => isAdmin(actor) || 'Only administrators read the outbox',
  'invitation.create': (actor, { role }) => {
    if (isAdmin(actor)) return true;
    if (actor.role !== 'facilitator') return 'Only administrators and facilitators send invitations';
    return role === 'member' || 'Facilitators may invite members only; ask an administrator for other roles';
  },
  'scenario.create': (actor) => authors(actor) || 'Only facilitators and administrators author scenarios',
  'scenario.read': readsScenario,
  'scenario.edit': (actor, ctx) =>
    ctx.ownerId === actor.id || isAdmin(actor) || 'Only the scenario’s author may edit it',
  'exercise.create': (actor, ctx) => {
    if (!authors(actor)) return 'Only facilitators and administrators start exercises';
    return readsScenario(actor, ctx);
  },
  'attachment.read': (actor, { scenario, teamId, seats }) => {
    if (readsScenario(actor, scenario) === true) return true;
    if (teamId === null) return seats.length > 0 || 'This document belongs to someone else’s scenario';
    const onItsTeam = seats.some((s) => s.role === 'facilitator' || (s.role === 'player' && s.teamId === teamId));
    return onItsTeam || 'This document belongs to one team’s brief: only that team and the facilitators see it';
  },
  'exercise.view': (_actor, ctx) => inExercise(ctx),
  'exercise.run': (_actor, ctx) => seatIs('facilitator')(ctx),
  'exercise.invite': (_actor, ctx) => seatIs('facilitator')(ctx),
  'team.brief.read': (_actor, ctx) => {
    if (ctx.seat?.role === 'facilitator') return true;
    if (ctx.seat?.role === 'player' && ctx.seat.teamId === ctx.teamId) return true;
    return 'A team’s brief is for that team and the facilitators only';
  },
  'team.work.read': (_actor, ctx) => {
    if (ctx.seat?.role === 'facilitator') return true;
    if (ctx.seat?.role === 'player' && ctx.seat.teamId === ctx.teamId) return true;
    return 'A team’s drafts and sealed moves are for that team and the facilitators only';
  },
  'inject.read': (_actor, ctx) => {
    if (ctx.seat?.role === 'facilitator' || ctx.seat?.role === 'observer') return true;
    if (ctx.seat?.role !== 'player') return 'Injects go to the teams, the facilitators and the observers';
    const forTeam = ctx.to === 'all' || (ctx.seat.teamId !== null && ctx.to.includes(ctx.seat.teamId));
    return forTeam || 'This inject was sent to other teams';
  },
  'move.draft': (_actor, ctx) => {
    const team = onTeam(ctx);
    if (team !== true) return team;
    return ctx.state === 'live' || 'Moves can be drafted only while the exercise is live';
  },
  'move.submit': (_actor, ctx) => {
    const team = onTeam(ctx);
    if (team !== true) return team;
    if (ctx.state !== 'live') return 'Moves can be submitted only while the exercise is live';
    if ((ctx.settings.submitter ?? 'lead') === 'lead' && !ctx.seat?.isLead) return 'Only the team lead submits the move';
    return true;
  },
  'note.read': (_actor, ctx) => seatIs('facilitator', 'observer')(ctx),
  'note.write': (_actor, ctx) => seatIs('facilitator', 'observer')(ctx),
  'analysis.read': (_actor, ctx) =>
    ctx.seat?.role === 'player' && ctx.settings.analysisForPlayers
      ? true
      : seatIs('facilitator', 'observer')(ctx),
  'review.read': (_actor, ctx) => seatIs('facilitator', 'observer')(ctx),
  'report.edit': (_actor, ctx) => seatIs('facilitator', 'observer')(ctx),
  'report.comment': (_actor, ctx) =>
    ctx.seat?.role === 'player' && ctx.settings.playersMayComment ? true : seatIs('facilitator', 'observer')(ctx),
  'report.readDraft': (_actor, ctx) =>
    ctx.seat?.role === 'player' && ctx.settings.playersMayComment ? true : seatIs('facilitator', 'observer')(ctx),
  'report.readIssued': (_actor, ctx) => seatIs('facilitator', 'observer', 'sponsor')(ctx),
  'report.issue': (_actor, ctx) => seatIs('facilitator')(ctx),
  'report.send': (_actor, ctx) => seatIs('facilitator')(ctx),
};

export function decide<A extends Action>(actor: Actor | null, action: A, ctx: Contexts[A]): Decision {
  if (!actor) return { ok: false, status: 401, reason: 'Sign in first' };
  const verdict = rules[action](actor, ctx);
  return verdict === true ? { ok: true } : { ok: false, status: 403, reason: verdict };
}

export function allowed<A extends Action>(actor: Actor | null, action: A, ctx: Contexts[A]): boolean {
  return decide(actor, action, ctx).ok;
}

export const ACTIONS = Object.keys(rules) as Action[];
