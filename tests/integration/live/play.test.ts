/**
 * A whole exercise over real sockets with the real browser client: two teams (and the
 * mediator), a sequential turn, the seeded chance draw, a sealed simultaneous turn with an
 * off-ladder proposal the facilitator adjudicates, a dropped connection that resumes from
 * its last update number, injects, and play to the outcome. Then the deadlines.
 */
import Fraction from 'fraction.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mulberry32 } from '../../../src/lib/engine';
import { IntentRefused, type LiveClient } from '../../../src/lib/exercise/live-client';
import type { Snapshot } from '../../../src/lib/exercise/view';
import { anonymous, DEMO, signIn, startApp, type App, type Client } from '../../support/app';
import { linkIn, waitForMail } from '../../support/mail';
import { connectLive, joined, newExercise, optionWith, RawSocket, tabStore, until, view } from './support';

let app: App;
const clients: Partial<Record<keyof typeof DEMO, Client>> = {};
const live: LiveClient[] = [];

const SEATS = [
  { email: DEMO.blue, role: 'player' as const, teamId: 'velmora', isLead: true },
  { email: DEMO.blue2, role: 'player' as const, teamId: 'velmora' },
  { email: DEMO.red, role: 'player' as const, teamId: 'ostrakh', isLead: true },
  { email: DEMO.mediator, role: 'player' as const, teamId: 'lantern', isLead: true },
  { email: DEMO.observer, role: 'observer' as const },
];

beforeAll(async () => {
  app = await startApp();
  for (const who of ['facilitator', 'blue', 'blue2', 'red', 'mediator', 'observer'] as const) clients[who] = await signIn(app, DEMO[who]);
});
afterAll(async () => {
  for (const c of live) c.stop();
  await app?.stop();
});

function open(who: keyof typeof DEMO, exerciseId: string): LiveClient {
  const client = connectLive(app, clients[who]!, exerciseId);
  live.push(client);
  return client;
}

const refusal = (promise: Promise<unknown>) => promise.then(() => null, (e: unknown) => e as IntentRefused);

describe('live play over sockets', () => {
  it('plays a whole exercise: sequential and simultaneous turns, a sealed reveal, a chance draw, an adjudicated proposal, a reconnect', async () => {
    const id = await newExercise(clients.facilitator!, 'Integration run', { turnSeconds: 600 }, SEATS);
    const [F, B, B2, R, L, O] = (['facilitator', 'blue', 'blue2', 'red', 'mediator', 'observer'] as const).map((who) => open(who, id));
    for (const c of [F, B, B2, R, L, O]) await joined(c!);
    const leaks: string[] = [];
    R!.subscribe((s) => {
      if (s.snapshot?.drafts.some((d) => d.teamId === 'velmora')) leaks.push('Ostrakh saw a Velmoran draft');
      if (s.snapshot?.situation.sealed.some((m) => m.teamId === 'velmora')) leaks.push('Ostrakh saw a sealed Velmoran move');
      if (s.snapshot?.notes !== null) leaks.push('Ostrakh saw observer notes');
    });

    expect(view(B!).briefs.map((b) => b.teamId)).toEqual([null, 'velmora']);
    expect(view(R!).briefs.map((b) => b.teamId)).toEqual([null, 'ostrakh']);
    expect(view(F!).briefs.map((b) => b.teamId)).toEqual([null, 'velmora', 'ostrakh', 'lantern']);

    await F!.send({ kind: 'phase', to: 'live' });
    await until(B!, (s) => s.snapshot!.exercise.state === 'live' && s.snapshot!.clock.status === 'running', 'play to start with the clock running');

    // Turn 1, Velmora alone: the analyst drafts, the lead sees it live and submits.
    const hold = optionWith(view(B!), 'velmora', 'hold');
    await B2!.send({ kind: 'draft', turn: 1, label: hold, proposal: null, rationale: 'Keep the frigates on station', confidence: 60 });
    await until(B!, (s) => s.snapshot!.drafts.some((d) => d.label === hold && d.updatedByName === 'Pia Lindqvar'), 'the team draft to reach the lead');
    const notLead = await refusal(B2!.send({ kind: 'submit', turn: 1, choice: { action: hold }, rationale: '', confidence: null }));
    expect(notLead).toMatchObject({ code: 'forbidden', message: 'Only the team lead submits the move' });
    const outOfTurn = await refusal(R!.send({ kind: 'submit', turn: 1, choice: { action: hold }, rationale: '', confidence: null }));
    expect(outOfTurn).toMatchObject({ code: 'conflict' });
    expect(await B!.send({ kind: 'submit', turn: 1, choice: { action: hold }, rationale: 'Keep the frigates on station', confidence: 60 })).toMatchObject({ status: 'revealed' });
    await until(R!, (s) => s.snapshot!.moves.length === 1 && s.snapshot!.situation.turn === 2, 'Velmora’s move to reach Ostrakh');
    expect(view(R!).moves[0]).toMatchObject({ teamId: 'velmora', label: hold, kind: 'ladder', rationale: null });
    await until(O!, (s) => s.snapshot!.moves.length === 1, 'Velmora’s move to reach the observer');
    expect(view(O!).moves[0]).toMatchObject({ rationale: 'Keep the frigates on station', confidence: 60 });

    // Turn 2, Ostrakh alone.
    const redHold = optionWith(view(R!), 'ostrakh', 'hold');
    await R!.send({ kind: 'submit', turn: 2, choice: { action: redHold }, rationale: 'Wait and see', confidence: 50 });

    // Turn 3, chance: the server's seeded draw, repeatable from the logged seed.
    await until(F!, (s) => s.snapshot!.situation.kind === 'chance', 'the chance node');
    expect(await refusal(B!.send({ kind: 'chance', turn: 3 }))).toMatchObject({ code: 'forbidden' });
    const outcomes = view(F!).situation.chance!;
    const draw = (await F!.send({ kind: 'chance', turn: 3 })) as { seed: string; value: number; label: string };
    expect(mulberry32(Number(draw.seed))()).toBe(draw.value);
    // Inverse-transform sampling (common practice, no source): the first outcome whose cumulative probability exceeds u.
    let cumulative = new Fraction(0);
    const expected = outcomes.find((o) => (cumulative = cumulative.add(new Fraction(o.p))).valueOf() > draw.value)!;
    expect(draw.label).toBe(expected.label);
    await until(B!, (s) => s.snapshot!.moves.at(-1)?.kind === 'chance', 'the draw to reach Velmora');
    expect(view(B!).moves.at(-1)!.draw).toEqual({ seed: draw.seed, value: draw.value });

    // Turn 4, simultaneous: Velmora seals its move; Ostrakh sees only that it was submitted.
    await until(F!, (s) => s.snapshot!.situation.kind === 'simultaneous', 'the simultaneous round');
    const turn = view(F!).situation.turn;
    const velmoraMove = optionWith(view(B!), 'velmora', 'step-down');
    expect(await B!.send({ kind: 'submit', turn, choice: { action: velmoraMove }, rationale: 'Lower the temperature', confidence: 40 })).toMatchObject({ status: 'sealed' });
    await until(R!, (s) => s.snapshot!.situation.movers.find((m) => m.teamId === 'velmora')?.status === 'submitted', 'Ostrakh to see Velmora has submitted');
    await until(F!, (s) => s.snapshot!.situation.sealed.some((m) => m.teamId === 'velmora' && m.label === velmoraMove), 'the facilitator to see the sealed move');
    expect(view(R!).moves.some((m) => m.turn === turn)).toBe(false);

    // Ostrakh drops off the network; play goes on; it resumes from the last number it saw.
    const seenBefore = R!.state.seq;
    (R as unknown as { socket: { terminate(): void } }).socket.terminate();
    await until(R!, (s) => s.connection === 'reconnecting', 'Ostrakh to notice the drop');
    await F!.send({ kind: 'inject', title: 'Harbour pilots strike', body: 'Pilots at Cray refuse to guide Ostrakhi ships.', to: ['ostrakh'], attachmentIds: [], authoredId: null });
    await F!.send({ kind: 'inject', title: 'Velmoran cabinet leak', body: 'A Velmoran paper prints the cabinet minutes.', to: ['velmora'], attachmentIds: [], authoredId: null });
    const resumed = await until(R!, (s) => s.connection === 'open' && s.seq > seenBefore, 'Ostrakh to resume', 10_000);
    expect(resumed.missed.map((e) => e.kind)).toEqual(['inject']);
    expect(view(R!).injects.map((i) => i.title)).toEqual(['Harbour pilots strike']);
    expect(view(R!).injects.every((i) => i.marking === 'EXERCISE')).toBe(true);
    expect(view(B!).injects.map((i) => i.title)).toEqual(['Velmoran cabinet leak']);

    // Ostrakh proposes a move off the ladder; the reveal waits for the adjudication.
    const proposal = 'Offer a joint search and rescue cell at Cray, frigates stay where they are';
    expect(await R!.send({ kind: 'submit', turn, choice: { proposal }, rationale: 'Neither climb nor yield', confidence: 55 })).toMatchObject({ status: 'proposed' });
    await until(F!, (s) => s.snapshot!.situation.sealed.some((m) => m.status === 'proposed' && m.proposal === proposal), 'the proposal to reach the facilitator');
    expect(await refusal(F!.send({ kind: 'reveal', turn }))).toMatchObject({ code: 'conflict', message: 'Adjudicate Ostrakh\'s proposal first' });
    const mapped = optionWith(view(F!), 'ostrakh', 'hold');
    await F!.send({ kind: 'adjudicate', turn, teamId: 'ostrakh', decision: { action: mapped }, reason: 'A rescue cell changes nothing at sea: Ostrakh holds' });
    await F!.send({ kind: 'reveal', turn });
    await until(R!, (s) => s.snapshot!.moves.filter((m) => m.turn === turn).length === 2, 'the reveal to reach Ostrakh');
    const revealed = view(F!).moves.filter((m) => m.turn === turn);
    expect(revealed.map((m) => [m.teamId, m.label, m.kind])).toEqual([
      ['velmora', velmoraMove, 'ladder'],
      ['ostrakh', mapped, 'adjudicated'],
    ]);
    expect(revealed[1]).toMatchObject({ proposal, reason: 'A rescue cell changes nothing at sea: Ostrakh holds' });

    await O!.send({ kind: 'note', turn, moveId: revealed[1]!.id, tags: ['restraint'], text: 'Ostrakh looked for a third way' });
    await until(F!, (s) => (s.snapshot!.notes ?? []).length === 1, 'the note to reach the facilitator');

    // Play on to the outcome: each team holds (or stands aside); the facilitator draws at chance nodes.
    const byTeam: Record<string, LiveClient> = { velmora: B!, ostrakh: R!, lantern: L! };
    for (let step = 0; step < 12 && view(F!).exercise.state !== 'ended'; step++) {
      const s = view(F!).situation;
      const seq = F!.state.seq;
      if (s.kind === 'chance') await F!.send({ kind: 'chance', turn: s.turn });
      else {
        for (const mover of s.movers) {
          const options = s.options[mover.teamId]!;
          const choice = (options.find((o) => o.move === 'hold') ?? options.find((o) => o.label === 'Stand aside') ?? options[0]!).label;
          await byTeam[mover.teamId]!.send({ kind: 'submit', turn: s.turn, choice: { action: choice }, rationale: '', confidence: null });
        }
        if (s.kind === 'simultaneous') await F!.send({ kind: 'reveal', turn: s.turn });
      }
      await until(F!, (st) => st.seq > seq && st.snapshot!.situation.turn > s.turn, `turn ${s.turn} to take effect`);
    }
    const end = await until(B!, (s) => s.snapshot!.exercise.state === 'ended', 'the outcome to reach Velmora');
    expect(end.snapshot!.situation.kind).toBe('terminal');
    expect(end.snapshot!.clock.status).toBe('none');
    expect(leaks).toEqual([]);

    // The audit log numbers every change without a gap.
    const log = await clients.facilitator!.json<{ events: { seq: number; kind: string }[] }>(`/api/exercises/${id}/log`);
    expect(log.body.events.map((e) => e.seq)).toEqual(log.body.events.map((_, i) => i + 1));
    expect(log.body.events.map((e) => e.kind)).toEqual(expect.arrayContaining(['created', 'roster', 'phase', 'draft', 'submit', 'chance', 'propose', 'adjudicate', 'reveal', 'inject', 'note']));
  });

  it('counts a retried move once: the same idempotency key gets the first answer back', async () => {
    const id = await newExercise(clients.facilitator!, 'Retry run', { turnSeconds: null }, SEATS.slice(0, 3));
    const facilitator = await RawSocket.open(app, clients.facilitator!, `/ws/exercise/${id}`);
    await facilitator.hello();
    expect(await facilitator.intent({ kind: 'phase', to: 'live' })).toMatchObject({ type: 'ack' });
    const blue = await RawSocket.open(app, clients.blue!, `/ws/exercise/${id}`);
    const first = await blue.hello();
    const action = optionWith(first.view as Snapshot, 'velmora', 'hold');
    const intent = { kind: 'submit', turn: 1, choice: { action }, rationale: 'once', confidence: 70 };
    const once = await blue.intent(intent, 'retry-key-0001');
    const twice = await blue.intent(intent, 'retry-key-0001');
    expect(once).toMatchObject({ type: 'ack', duplicate: false, result: { status: 'revealed' } });
    expect(twice).toMatchObject({ type: 'ack', duplicate: true, seq: once.seq, result: once.result });
    const overHttp = await clients.blue!.json(`/api/exercises/${id}/intents`, { method: 'POST', json: { key: 'retry-key-0001', intent } });
    expect(overHttp).toMatchObject({ status: 200, body: { duplicate: true, seq: once.seq } });
    const stolen = await clients.red!.json(`/api/exercises/${id}/intents`, { method: 'POST', json: { key: 'retry-key-0001', intent: { ...intent, turn: 2 } } });
    expect(stolen.status).toBe(409);
    const { body } = await clients.facilitator!.json<{ view: Snapshot }>(`/api/exercises/${id}`);
    expect(body.view.moves.filter((m) => m.teamId === 'velmora')).toHaveLength(1);
    blue.close();
    facilitator.close();
  });
});

describe('a page reload with intents unsent', () => {
  it('sends again what the line never carried or never acknowledged, each once, and says in words what was refused', async () => {
    const id = await newExercise(clients.facilitator!, 'Reload run', { turnSeconds: null }, [...SEATS.slice(0, 3), SEATS[4]!]);
    const F = open('facilitator', id);
    await joined(F);
    await F.send({ kind: 'phase', to: 'live' });
    const hold = optionWith(await until(F, (s) => s.snapshot!.exercise.state === 'live', 'play to start').then((s) => s.snapshot!), 'velmora', 'hold');
    const move = { kind: 'submit' as const, turn: 1, choice: { action: hold }, rationale: 'sent while off the network', confidence: 60 };

    // Blue's laptop is off the network: the move waits in the tab, the page is reloaded, the line comes back.
    const blueTab = tabStore();
    const offline = connectLive(app, clients.blue!, id, blueTab, 1);
    void offline.send(move).catch(() => undefined);
    expect(blueTab.saved).toEqual([{ key: expect.any(String), intent: move }]);
    offline.stop();
    const blue = connectLive(app, clients.blue!, id, blueTab);
    live.push(blue);
    expect(blue.state.pending).toBe(1);
    await until(blue, (s) => s.pending === 0 && s.snapshot?.moves.length === 1, 'the kept move to be committed');
    expect(blueTab.saved).toEqual([]);

    // An observer's note goes out and the page reloads before its ack: sent again with its key, counted once.
    const observerTab = tabStore();
    const before = connectLive(app, clients.observer!, id, observerTab);
    await joined(before);
    void before.send({ kind: 'note', turn: null, moveId: null, tags: [], text: 'written just before the reload' }).catch(() => undefined);
    before.stop();
    expect(observerTab.saved).toHaveLength(1);
    await until(F, (s) => s.snapshot!.notes!.some((n) => n.text === 'written just before the reload'), 'the server to have the note already');
    const observer = connectLive(app, clients.observer!, id, observerTab);
    live.push(observer);
    await until(observer, (s) => s.pending === 0 && s.connection === 'open', 'the kept note to be settled');
    expect(observerTab.saved).toEqual([]);

    // A kept move for a turn already played is refused when sent again, and the tab says so in words.
    const staleTab = tabStore([{ key: 'move-for-a-past-turn', intent: { ...move, rationale: 'too late' } }]);
    const late = connectLive(app, clients.blue!, id, staleTab);
    live.push(late);
    const refused = await until(late, (s) => s.refusedAfterReload.length === 1, 'the refusal of the kept move');
    expect(refused.refusedAfterReload[0]).toMatch(/^A move: \S/);
    expect(refused.pending).toBe(0);
    expect(staleTab.saved).toEqual([]);

    const { body } = await clients.facilitator!.json<{ view: Snapshot }>(`/api/exercises/${id}`);
    expect(body.view.moves.map((m) => m.rationale)).toEqual(['sent while off the network']);
    expect(body.view.notes!.filter((n) => n.text === 'written just before the reload')).toHaveLength(1);
  });
});

describe('the roster', () => {
  it('seats an account straight away and invites an unknown address, whose acceptance seats it', async () => {
    const id = await newExercise(clients.facilitator!, 'Roster run', {}, []);
    const F = open('facilitator', id);
    await joined(F);
    const seated = await clients.facilitator!.json(`/api/exercises/${id}/roster`, { method: 'POST', json: { email: DEMO.observer, role: 'observer' } });
    expect(seated).toMatchObject({ status: 201, body: { seated: 'member', notified: true } });
    await until(F, (s) => s.snapshot!.roster!.members.some((m) => m.name === 'Oren Hale'), 'the change made over HTTP to reach the open Console');
    const admin = await signIn(app, DEMO.admin);
    const told = await waitForMail(admin, DEMO.observer, /You are on the exercise “Roster run”/);
    expect(linkIn(told, `/exercises/${id}`)).toContain(`/exercises/${id}`);

    const email = 'new.player@rungwise.example';
    const invited = await clients.facilitator!.json(`/api/exercises/${id}/roster`, { method: 'POST', json: { email, role: 'player', teamId: 'ostrakh' } });
    expect(invited).toMatchObject({ status: 201, body: { seated: 'invited' } });
    const mail = await waitForMail(admin, email, /invited/);
    expect(mail.text).toContain('on the Ostrakh team of the exercise “Roster run”');
    const token = new URL(linkIn(mail, '/invitation?token=')).searchParams.get('token')!;
    expect((await anonymous(app).json('/api/invitations/accept', { method: 'POST', json: { token, name: 'Nel Arvo', password: 'a-long-new-password' } })).status).toBe(201);
    await until(F, (s) => s.snapshot!.roster!.members.some((m) => m.name === 'Nel Arvo') && s.snapshot!.log!.some((e) => e.summary === 'Nel Arvo accepted the invitation and joined'), 'the accepted seat on the Console');
    const newcomer = await signIn(app, email, 'a-long-new-password');
    const { status, body } = await newcomer.json<{ view: Snapshot }>(`/api/exercises/${id}`);
    expect(status).toBe(200);
    expect(body.view.me).toMatchObject({ role: 'player', teamId: 'ostrakh' });

    const bad = await clients.facilitator!.json(`/api/exercises/${id}/roster`, { method: 'POST', json: { email: 'x@rungwise.example', role: 'player' } });
    expect(bad).toMatchObject({ status: 400, body: { fields: [{ field: 'teamId' }] } });
    const unknownTeam = await clients.facilitator!.json(`/api/exercises/${id}/roster`, { method: 'POST', json: { email: 'y@rungwise.example', role: 'player', teamId: 'atlantis' } });
    expect(unknownTeam).toMatchObject({ status: 400, body: { fields: [{ field: 'teamId', reason: 'unknown team' }] } });
    const { body: roster } = await clients.facilitator!.json<{ view: Snapshot }>(`/api/exercises/${id}`);
    const me = roster.view.roster!.members.find((m) => m.role === 'facilitator')!;
    expect((await clients.facilitator!.json(`/api/exercises/${id}/roster/${me.membershipId}`, { method: 'DELETE' })).status).toBe(409);
  });
});

describe('deadlines on the server', () => {
  it('holds a late team’s position when the rule says so, and leaves it to the facilitator otherwise', async () => {
    const id = await newExercise(clients.facilitator!, 'Deadline run', { turnSeconds: 2, atDeadline: 'hold' }, SEATS.slice(0, 3));
    const F = open('facilitator', id);
    const B = open('blue', id);
    const velmoraHold = optionWith(await joined(F), 'velmora', 'hold');
    await joined(B);
    await F.send({ kind: 'phase', to: 'live' });
    const held = await until(B, (s) => s.snapshot!.moves.length >= 1, 'the deadline to hold Velmora', 6000);
    expect(held.snapshot!.moves[0]).toMatchObject({ teamId: 'velmora', label: velmoraHold, kind: 'adjudicated', reason: expect.stringContaining('Time ran out') });

    // Now the facilitator decides at the deadline: the clock expires and late moves are refused.
    await F.send({ kind: 'settings', patch: { atDeadline: 'facilitator' } });
    await until(F, (s) => s.snapshot!.clock.status === 'running' && s.snapshot!.exercise.settings.atDeadline === 'facilitator', 'the new rule');
    const turn = view(F).situation.turn;
    await until(F, (s) => s.snapshot!.clock.status === 'expired', 'the clock to expire', 6000);
    const red = await signIn(app, DEMO.red);
    const late = await red.json(`/api/exercises/${id}/intents`, {
      method: 'POST',
      json: { key: `late-${crypto.randomUUID()}`, intent: { kind: 'submit', turn, choice: { action: optionWith(view(F), 'ostrakh', 'hold') }, rationale: '', confidence: null } },
    });
    expect(late).toMatchObject({ status: 409, body: { code: 'conflict', error: expect.stringContaining('deadline') } });
    await F.send({ kind: 'clock', action: 'extend', seconds: 60 });
    await until(F, (s) => s.snapshot!.clock.status === 'running', 'the extended clock');
    await F.send({ kind: 'adjudicate', turn, teamId: 'ostrakh', decision: { action: optionWith(view(F), 'ostrakh', 'step-down') }, reason: 'The team asked the facilitator to record its step down' });
    await until(F, (s) => s.snapshot!.situation.turn > turn, 'the decided move to take effect');
    expect(view(F).moves.at(-1)).toMatchObject({ teamId: 'ostrakh', kind: 'adjudicated', reason: 'The team asked the facilitator to record its step down' });
  });
});
