import { describe, expect, it } from 'vitest';
import { ACTIONS, decide, type Actor, type ExerciseContext, type Seat } from '../../src/lib/access';
import type { ExerciseRole } from '../../src/lib/roles';

const admin: Actor = { id: 'a', role: 'admin' };
const facilitator: Actor = { id: 'f', role: 'facilitator' };
const member: Actor = { id: 'm', role: 'member' };

const seat = (role: ExerciseRole, extra: Partial<Seat> = {}): Seat => ({ role, teamId: null, isLead: false, ...extra });
const live = (s: Seat | null, settings: ExerciseContext['settings'] = {}): ExerciseContext => ({ seat: s, state: 'live', settings });

describe('access: platform actions', () => {
  const matrix: [string, Actor, boolean][] = [
    ['admin manages users', admin, true],
    ['facilitator manages users', facilitator, false],
    ['member manages users', member, false],
  ];
  it.each(matrix)('%s', (_label, actor, expected) => {
    expect(decide(actor, 'user.manage', {}).ok).toBe(expected);
    expect(decide(actor, 'outbox.read', {}).ok).toBe(expected);
  });

  it('only admins invite other roles than member; facilitators invite members; members invite nobody', () => {
    expect(decide(admin, 'invitation.create', { role: 'admin' }).ok).toBe(true);
    expect(decide(admin, 'invitation.create', { role: 'facilitator' }).ok).toBe(true);
    expect(decide(facilitator, 'invitation.create', { role: 'member' }).ok).toBe(true);
    expect(decide(facilitator, 'invitation.create', { role: 'facilitator' })).toMatchObject({ ok: false, status: 403 });
    expect(decide(facilitator, 'invitation.create', { role: 'admin' }).ok).toBe(false);
    expect(decide(member, 'invitation.create', { role: 'member' })).toMatchObject({ ok: false, status: 403 });
  });

  it('scenarios: authors create; owner, admin and the exercise facilitators read; only owner and admin edit', () => {
    expect(decide(member, 'scenario.create', {}).ok).toBe(false);
    expect(decide(facilitator, 'scenario.create', {}).ok).toBe(true);
    const own = { ownerId: 'f', facilitatesAnExercise: false };
    const foreign = { ownerId: 'x', facilitatesAnExercise: false };
    const facilitated = { ownerId: 'x', facilitatesAnExercise: true };
    expect(decide(facilitator, 'scenario.read', own).ok).toBe(true);
    expect(decide(facilitator, 'scenario.read', foreign).ok).toBe(false);
    expect(decide(member, 'scenario.read', foreign).ok).toBe(false);
    expect(decide(facilitator, 'scenario.read', facilitated).ok).toBe(true);
    expect(decide(facilitator, 'scenario.edit', facilitated).ok).toBe(false);
    expect(decide(admin, 'scenario.edit', foreign).ok).toBe(true);
    expect(decide(facilitator, 'exercise.create', own).ok).toBe(true);
    expect(decide(member, 'exercise.create', { ownerId: 'm', facilitatesAnExercise: false }).ok).toBe(false);
  });

  it('briefing documents: scenario readers and exercise members; a team’s documents to that team and the facilitators only', () => {
    const foreign = { ownerId: 'x', facilitatesAnExercise: false };
    const general = (seats: Seat[]) => ({ scenario: foreign, teamId: null, seats });
    const blueOnly = (seats: Seat[]) => ({ scenario: foreign, teamId: 'blue', seats });
    const bluePlayer = seat('player', { teamId: 'blue' });
    const redPlayer = seat('player', { teamId: 'red' });
    expect(decide(facilitator, 'attachment.read', { scenario: { ownerId: 'f', facilitatesAnExercise: false }, teamId: 'blue', seats: [] }).ok).toBe(true);
    expect(decide(admin, 'attachment.read', blueOnly([])).ok).toBe(true);
    expect(decide(facilitator, 'attachment.read', { scenario: { ownerId: 'x', facilitatesAnExercise: true }, teamId: 'red', seats: [] }).ok).toBe(true);
    expect(decide(member, 'attachment.read', general([])).ok).toBe(false);
    expect(decide(member, 'attachment.read', general([seat('sponsor')])).ok).toBe(true);
    expect(decide(member, 'attachment.read', general([redPlayer])).ok).toBe(true);
    expect(decide(member, 'attachment.read', blueOnly([bluePlayer])).ok).toBe(true);
    expect(decide(member, 'attachment.read', blueOnly([seat('facilitator')])).ok).toBe(true);
    expect(decide(member, 'attachment.read', blueOnly([redPlayer, seat('observer'), seat('sponsor')]))).toMatchObject({ ok: false, status: 403 });
    expect(decide(member, 'attachment.read', blueOnly([]))).toMatchObject({ ok: false, status: 403 });
  });

  it('a signed-out actor gets 401 for every action', () => {
    for (const action of ACTIONS) {
      expect(decide(null, action, {} as never)).toMatchObject({ ok: false, status: 401 });
    }
  });
});

describe('access: exercise actions by seat', () => {
  const blueLead = seat('player', { teamId: 'blue', isLead: true });
  const blueMember = seat('player', { teamId: 'blue' });
  const seats: Record<string, Seat | null> = {
    facilitator: seat('facilitator'),
    blueLead,
    blueMember,
    redLead: seat('player', { teamId: 'red', isLead: true }),
    observer: seat('observer'),
    sponsor: seat('sponsor'),
    outsider: null,
  };
  // Expected answers, written out by hand: rows are actions, columns the seats above.
  const expected: Record<string, Record<keyof typeof seats, boolean>> = {
    'exercise.view': { facilitator: true, blueLead: true, blueMember: true, redLead: true, observer: true, sponsor: true, outsider: false },
    'exercise.run': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: false, sponsor: false, outsider: false },
    'exercise.invite': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: false, sponsor: false, outsider: false },
    'note.read': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: false, outsider: false },
    'note.write': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: false, outsider: false },
    'analysis.read': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: false, outsider: false },
    'review.read': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: false, outsider: false },
    'report.edit': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: false, outsider: false },
    'report.comment': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: false, outsider: false },
    'report.readDraft': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: false, outsider: false },
    'report.readIssued': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: true, sponsor: true, outsider: false },
    'report.issue': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: false, sponsor: false, outsider: false },
    'report.send': { facilitator: true, blueLead: false, blueMember: false, redLead: false, observer: false, sponsor: false, outsider: false },
  };
  for (const [action, row] of Object.entries(expected)) {
    it.each(Object.entries(row))(`${action}: %s → %s`, (who, allowed) => {
      const decision = decide(member, action as 'exercise.view', live(seats[who]!));
      expect(decision.ok).toBe(allowed);
      if (!allowed) expect(decision).toMatchObject({ status: 403 });
    });
  }

  // Team-scoped actions, acting for Blue.
  const teamExpected: Record<string, Record<keyof typeof seats, boolean>> = {
    'team.brief.read': { facilitator: true, blueLead: true, blueMember: true, redLead: false, observer: false, sponsor: false, outsider: false },
    'team.work.read': { facilitator: true, blueLead: true, blueMember: true, redLead: false, observer: false, sponsor: false, outsider: false },
    'move.draft': { facilitator: false, blueLead: true, blueMember: true, redLead: false, observer: false, sponsor: false, outsider: false },
    'move.submit': { facilitator: false, blueLead: true, blueMember: false, redLead: false, observer: false, sponsor: false, outsider: false },
  };
  for (const [action, row] of Object.entries(teamExpected)) {
    it.each(Object.entries(row))(`${action} for Blue: %s → %s`, (who, allowed) => {
      expect(decide(member, action as 'move.submit', { ...live(seats[who]!), teamId: 'blue' }).ok).toBe(allowed);
    });
  }

  it('injects: facilitators and observers read all; players those sent to everyone or to their team; sponsors none', () => {
    const toBlue = { to: ['blue'] as string[] };
    const toAll = { to: 'all' as const };
    const expectations: [keyof typeof seats, typeof toBlue | typeof toAll, boolean][] = [
      ['facilitator', toBlue, true],
      ['observer', toBlue, true],
      ['blueMember', toBlue, true],
      ['redLead', toBlue, false],
      ['redLead', toAll, true],
      ['sponsor', toAll, false],
      ['outsider', toAll, false],
    ];
    for (const [who, inject, expected] of expectations) {
      expect(decide(member, 'inject.read', { ...live(seats[who]!), ...inject }).ok, `${who}`).toBe(expected);
    }
  });

  it('any team member submits when the facilitator allows it', () => {
    expect(decide(member, 'move.submit', { ...live(blueMember, { submitter: 'any' }), teamId: 'blue' }).ok).toBe(true);
  });

  it('no moves outside live play', () => {
    for (const state of ['draft', 'briefing', 'paused', 'ended'] as const) {
      const ctx = { seat: blueLead, state, settings: {}, teamId: 'blue' };
      expect(decide(member, 'move.submit', ctx)).toMatchObject({ ok: false, status: 403 });
      expect(decide(member, 'move.draft', ctx).ok).toBe(false);
    }
  });

  it('players see analysis and comment on the report only when the facilitator allows it', () => {
    expect(decide(member, 'analysis.read', live(blueLead, { analysisForPlayers: true })).ok).toBe(true);
    expect(decide(member, 'report.comment', live(blueLead, { playersMayComment: true })).ok).toBe(true);
    expect(decide(member, 'report.readDraft', live(blueLead, { playersMayComment: true })).ok).toBe(true);
    expect(decide(member, 'report.edit', live(blueLead, { playersMayComment: true })).ok).toBe(false);
    expect(decide(member, 'analysis.read', live(seat('sponsor'), { analysisForPlayers: true })).ok).toBe(false);
  });

  it('platform admins without a seat see nothing of an exercise', () => {
    expect(decide(admin, 'exercise.view', live(null)).ok).toBe(false);
    expect(decide(admin, 'note.read', live(null)).ok).toBe(false);
  });

  it('refusals say why', () => {
    const refusal = decide(member, 'move.submit', { ...live(seats.redLead!), teamId: 'blue' });
    expect(refusal).toEqual({ ok: false, status: 403, reason: 'You may only act for your own team' });
  });
});
