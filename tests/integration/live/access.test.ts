/**
 * Who may do and see what in a live exercise, over HTTP and over the socket, for every
 * seat: each refusal is proven on both channels, and each seat's snapshot holds only
 * what its role may see.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Intent } from '../../../src/lib/exercise/protocol';
import type { Snapshot } from '../../../src/lib/exercise/view';
import { anonymous, DEMO, signIn, startApp, type App, type Client } from '../../support/app';
import { exerciseIdByTitle, optionWith, RawSocket } from './support';

type Role = 'facilitator' | 'blueLead' | 'blueMember' | 'redLead' | 'mediator' | 'observer' | 'sponsor';
const PEOPLE: Record<Role, keyof typeof DEMO> = {
  facilitator: 'facilitator',
  blueLead: 'blue',
  blueMember: 'blue2',
  redLead: 'red',
  mediator: 'mediator',
  observer: 'observer',
  sponsor: 'sponsor',
};
const ROLES = Object.keys(PEOPLE) as Role[];

let app: App;
let id: string;
const clients = {} as Record<Role, Client>;
const sockets = {} as Record<Role, RawSocket>;
let outsider: Client;
let velmoraHold = '';

beforeAll(async () => {
  app = await startApp();
  for (const role of ROLES) clients[role] = await signIn(app, DEMO[PEOPLE[role]]);
  outsider = await signIn(app, DEMO.admin);
  id = await exerciseIdByTitle(clients.facilitator, 'run 2');
  for (const role of ROLES) {
    sockets[role] = await RawSocket.open(app, clients[role], `/ws/exercise/${id}`);
    await sockets[role].hello();
  }
  expect(await sockets.facilitator.intent({ kind: 'phase', to: 'live' })).toMatchObject({ type: 'ack' });
  const { body } = await clients.facilitator.json<{ view: Snapshot }>(`/api/exercises/${id}`);
  velmoraHold = optionWith(body.view, 'velmora', 'hold');
});
afterAll(async () => {
  for (const s of Object.values(sockets)) s.close();
  await app?.stop();
});

const FACILITATORS_ONLY = "Only the exercise's facilitators may do this";
const runIntents = (): [string, Intent][] => [
  ['reveal', { kind: 'reveal', turn: 1 }],
  ['adjudicate', { kind: 'adjudicate', turn: 1, teamId: 'velmora', decision: { action: velmoraHold }, reason: 'because I say so' }],
  ['chance', { kind: 'chance', turn: 1 }],
  ['clock', { kind: 'clock', action: 'extend', seconds: 600 }],
  ['phase', { kind: 'phase', to: 'ended' }],
  ['inject', { kind: 'inject', title: 'Forged', body: 'A fake inject', to: 'all', attachmentIds: [], authoredId: null }],
  ['undo', { kind: 'undo', turn: 1, reason: 'no reason at all' }],
  ['settings', { kind: 'settings', patch: { analysisForPlayers: true } }],
];

/** Refused on both channels with this status / socket code and reason. */
async function expectRefused(role: Role, intent: Intent, status: number, code: string, reason?: string | RegExp) {
  const overSocket = await sockets[role].intent(intent);
  expect(overSocket, `${role} ${intent.kind} over the socket`).toMatchObject({ type: 'error', code });
  const overHttp = await clients[role].json(`/api/exercises/${id}/intents`, { method: 'POST', json: { key: `k-${crypto.randomUUID()}`, intent } });
  expect(overHttp.status, `${role} ${intent.kind} over HTTP`).toBe(status);
  expect(overHttp.body.code).toBe(code);
  if (reason) {
    expect(overSocket.message).toMatch(reason);
    expect(overHttp.body.error).toMatch(reason);
  }
}

describe('live exercise: refusals on both channels', () => {
  it.each(ROLES.filter((r) => r !== 'facilitator'))('%s may not run the exercise', async (role) => {
    for (const [, intent] of runIntents()) await expectRefused(role, intent, 403, 'forbidden', FACILITATORS_ONLY);
  });

  it('observers, sponsors and facilitators do not submit or draft moves', async () => {
    const submit: Intent = { kind: 'submit', turn: 1, choice: { action: velmoraHold }, rationale: '', confidence: null };
    const draft: Intent = { kind: 'draft', turn: 1, label: velmoraHold, proposal: null, rationale: '', confidence: null };
    for (const role of ['observer', 'sponsor', 'facilitator'] as const) {
      await expectRefused(role, submit, 403, 'forbidden', 'Only players submit moves');
      await expectRefused(role, draft, 403, 'forbidden', 'Only players submit moves');
    }
  });

  it('a team member submits only if the facilitator lets any member submit; other teams move only in their turn', async () => {
    const submit: Intent = { kind: 'submit', turn: 1, choice: { action: velmoraHold }, rationale: '', confidence: null };
    await expectRefused('blueMember', submit, 403, 'forbidden', 'Only the team lead submits the move');
    await expectRefused('redLead', submit, 409, 'conflict', /not Ostrakh's move/);
    await expectRefused('mediator', submit, 409, 'conflict', /not Lantern Isles Council's move/);
    await expectRefused('blueLead', { ...submit, turn: 7 } as Intent, 409, 'stale-turn', /meant for turn 7/);
    await expectRefused('blueLead', { ...submit, choice: { action: 'Nuke the moon' } } as Intent, 400, 'invalid', /not one of the options/);
  });

  it('players and sponsors write no observer notes; observers and facilitators do', async () => {
    const note: Intent = { kind: 'note', turn: 1, moveId: null, tags: ['signalling'], text: 'Seen from the gallery' };
    for (const role of ['blueLead', 'blueMember', 'redLead', 'mediator', 'sponsor'] as const) {
      await expectRefused(role, note, 403, 'forbidden', 'Only the exercise\'s facilitators and observers may do this');
    }
    expect(await sockets.observer.intent(note)).toMatchObject({ type: 'ack' });
    expect(await sockets.facilitator.intent({ ...note, text: 'Facilitator note' })).toMatchObject({ type: 'ack' });
    expect(await sockets.blueMember.intent({ kind: 'draft', turn: 1, label: velmoraHold, proposal: null, rationale: 'our secret plan', confidence: 40 })).toMatchObject({ type: 'ack' });
    expect(await sockets.facilitator.intent({ kind: 'inject', title: 'To everyone', body: 'The weather turns.', to: 'all', attachmentIds: [], authoredId: null })).toMatchObject({ type: 'ack' });
    expect(await sockets.facilitator.intent({ kind: 'inject', title: 'For Ostrakh', body: 'Your harbour is closed.', to: ['ostrakh'], attachmentIds: [], authoredId: null })).toMatchObject({ type: 'ack' });
  });

  it('people outside the exercise get nothing of it, on any channel', async () => {
    await expect(RawSocket.open(app, outsider, `/ws/exercise/${id}`)).rejects.toMatchObject({ status: 403 });
    await expect(RawSocket.open(app, anonymous(app), `/ws/exercise/${id}`)).rejects.toMatchObject({ status: 401 });
    await expect(RawSocket.open(app, outsider, `/ws/exercise/not-an-exercise`)).rejects.toMatchObject({ status: 403 });
    const intent = { key: `k-${crypto.randomUUID()}`, intent: { kind: 'reveal', turn: 1 } };
    for (const [client, status] of [
      [outsider, 403],
      [anonymous(app), 401],
    ] as const) {
      expect((await client.json(`/api/exercises/${id}`)).status).toBe(status);
      expect((await client.json(`/api/exercises/${id}/intents`, { method: 'POST', json: intent })).status).toBe(status);
      expect((await client.json(`/api/exercises/${id}/log`)).status).toBe(status);
      expect((await client.json(`/api/exercises/${id}/roster`, { method: 'POST', json: { email: 'x@rungwise.example', role: 'observer' } })).status).toBe(status);
      expect((await client.fetch(`/exercises/${id}`)).status).toBe(status === 401 ? 302 : 403);
    }
    const list = await outsider.json<{ exercises: unknown[] }>('/api/exercises');
    expect(list.body.exercises).toEqual([]);
  });

  it('only facilitators read the audit log and change the roster', async () => {
    expect((await clients.facilitator.json(`/api/exercises/${id}/log`)).status).toBe(200);
    for (const role of ROLES.filter((r) => r !== 'facilitator')) {
      expect((await clients[role].json(`/api/exercises/${id}/log`)).status, role).toBe(403);
      const seat = await clients[role].json(`/api/exercises/${id}/roster`, { method: 'POST', json: { email: DEMO.admin, role: 'observer' } });
      expect(seat.status, role).toBe(403);
    }
  });
});

describe('live exercise: each seat sees only its share', () => {
  const snapshotOf = async (role: Role) => (await clients[role].json<{ view: Snapshot }>(`/api/exercises/${id}`)).body.view;

  it('players: their own brief, draft and injects; no notes, log, roster or analysis', async () => {
    const blue = await snapshotOf('blueLead');
    expect(blue.briefs.map((b) => b.teamId)).toEqual([null, 'velmora']);
    expect(blue.drafts.map((d) => [d.teamId, d.rationale])).toEqual([['velmora', 'our secret plan']]);
    expect(blue.injects.map((i) => i.title)).toEqual(['To everyone']);
    expect([blue.notes, blue.log, blue.roster, blue.authored, blue.analysis]).toEqual([null, null, null, null, null]);
    expect(blue.me).toMatchObject({ role: 'player', teamId: 'velmora', isLead: true, may: { submit: true, run: false, note: false } });

    const red = await snapshotOf('redLead');
    expect(red.briefs.map((b) => b.teamId)).toEqual([null, 'ostrakh']);
    expect(red.drafts).toEqual([]);
    expect(red.situation.movers).toEqual([{ teamId: 'velmora', status: 'waiting', at: null }]);
    expect(red.situation.options).toEqual({});
    expect(red.injects.map((i) => i.title)).toEqual(['To everyone', 'For Ostrakh']);
    expect(JSON.stringify(red)).not.toContain('our secret plan');
    expect(red.me.submitRefusal).toBeNull();
  });

  it('observers: notes, analysis and every inject, but no team briefs or drafts', async () => {
    const observer = await snapshotOf('observer');
    expect(observer.notes!.map((n) => n.text)).toEqual(['Seen from the gallery', 'Facilitator note']);
    expect(observer.briefs.map((b) => b.teamId)).toEqual([null]);
    expect(observer.drafts).toEqual([]);
    expect(observer.injects).toHaveLength(2);
    expect(observer.analysis).not.toBeNull();
    expect(observer.analysis!.caution).toContain('not a prediction');
    expect([observer.log, observer.roster]).toEqual([null, null]);
  });

  it('sponsors: the exercise and its revealed moves, nothing else', async () => {
    const sponsor = await snapshotOf('sponsor');
    expect(sponsor.injects).toEqual([]);
    expect(sponsor.drafts).toEqual([]);
    expect(sponsor.briefs.map((b) => b.teamId)).toEqual([null]);
    expect([sponsor.notes, sponsor.log, sponsor.roster, sponsor.analysis]).toEqual([null, null, null, null]);
    expect(sponsor.me.may).toEqual({ draft: false, submit: false, run: false, note: false, analysis: false });
  });

  it('facilitators: everything, including the drafting team’s status', async () => {
    const facilitator = await snapshotOf('facilitator');
    expect(facilitator.situation.movers).toEqual([{ teamId: 'velmora', status: 'drafting', at: null }]);
    expect(facilitator.drafts).toHaveLength(1);
    expect(facilitator.briefs).toHaveLength(4);
    expect(facilitator.roster!.members.length).toBeGreaterThanOrEqual(7);
    expect(facilitator.log!.length).toBeGreaterThan(0);
  });

  it('players see the analysis once the facilitator turns it on', async () => {
    expect(await sockets.facilitator.intent({ kind: 'settings', patch: { analysisForPlayers: true } })).toMatchObject({ type: 'ack' });
    const blue = await snapshotOf('blueLead');
    expect(blue.analysis).not.toBeNull();
    expect(blue.analysis!.caution).toContain('aid to discussion');
  });
});
