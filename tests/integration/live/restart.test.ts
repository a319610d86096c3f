/**
 * SIGKILL in the middle of play: every acknowledged change is still there after the
 * restart, the clients reconnect and resume on their own, the intents that were in flight
 * are resent with their idempotency keys and counted once.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { LiveClient } from '../../../src/lib/exercise/live-client';
import type { Snapshot } from '../../../src/lib/exercise/view';
import { DEMO, signIn, startApp, type App, type Client } from '../../support/app';
import { connectLive, joined, newExercise, optionWith, until, view } from './support';

let app: App;
const live: LiveClient[] = [];

beforeAll(async () => {
  app = await startApp();
});
afterAll(async () => {
  for (const c of live) c.stop();
  await app?.stop();
});

describe('a killed server loses nothing acknowledged', () => {
  it('restarts after SIGKILL with every acknowledged move and note, and the clients resume by themselves', async () => {
    const [facilitator, blue, red, observer] = await Promise.all([DEMO.facilitator, DEMO.blue, DEMO.red, DEMO.observer].map((email) => signIn(app, email)));
    const id = await newExercise(facilitator!, 'Crash run', { turnSeconds: 600 }, [
      { email: DEMO.blue, role: 'player', teamId: 'velmora', isLead: true },
      { email: DEMO.red, role: 'player', teamId: 'ostrakh', isLead: true },
      { email: DEMO.observer, role: 'observer' },
    ]);
    const open = (client: Client) => {
      const c = connectLive(app, client, id);
      live.push(c);
      return c;
    };
    const [F, B, R, O] = [facilitator!, blue!, red!, observer!].map(open);
    for (const c of [F, B, R, O]) await joined(c!);
    await F!.send({ kind: 'phase', to: 'live' });
    await until(B!, (s) => s.snapshot!.exercise.state === 'live', 'play to start');

    const acked = await B!.send({ kind: 'submit', turn: 1, choice: { action: optionWith(view(B!), 'velmora', 'hold') }, rationale: 'before the crash', confidence: 80 });
    expect(acked).toMatchObject({ status: 'revealed' });
    await until(R!, (s) => s.snapshot!.situation.turn === 2, 'Ostrakh’s turn');

    // A stream of notes, one every 20 ms, and Ostrakh's move in flight; the server dies part-way through.
    const ackedNotes = new Set<string>();
    const notes: Promise<unknown>[] = [];
    const stream = (async () => {
      for (let i = 0; i < 40; i++) {
        notes.push(O!.send({ kind: 'note', turn: null, moveId: null, tags: [], text: `note ${i}` }).then(() => ackedNotes.add(`note ${i}`)));
        await new Promise((r) => setTimeout(r, 20));
      }
    })();
    await until(O!, () => ackedNotes.size >= 10, 'ten notes to be acknowledged');
    const inFlight = R!.send({ kind: 'submit', turn: 2, choice: { action: optionWith(view(R!), 'ostrakh', 'hold') }, rationale: 'in flight', confidence: 30 });
    await app.kill();
    const beforeRestart = new Set(ackedNotes);
    expect(beforeRestart.size).toBeLessThan(40);
    await stream;
    await until(B!, (s) => s.connection === 'reconnecting', 'the clients to notice');

    await app.restart();
    for (const c of [F, B, R, O]) await until(c!, (s) => s.connection === 'open', 'a client to resume by itself', 20_000);
    expect(await inFlight).toMatchObject({ moveId: expect.any(String) });
    await Promise.all(notes);

    const { body } = await facilitator!.json<{ view: Snapshot }>(`/api/exercises/${id}`);
    expect(body.view.moves.map((m) => [m.teamId, m.rationale])).toEqual([
      ['velmora', 'before the crash'],
      ['ostrakh', 'in flight'],
    ]);
    const texts = body.view.notes!.map((n) => n.text);
    for (const text of beforeRestart) expect(texts).toContain(text);
    expect(texts.sort()).toEqual(Array.from({ length: 40 }, (_, i) => `note ${i}`).sort());

    const log = await facilitator!.json<{ events: { seq: number }[] }>(`/api/exercises/${id}/log`);
    expect(log.body.events.map((e) => e.seq)).toEqual(log.body.events.map((_, i) => i + 1));

    // Play goes on after the crash: the chance node resolves and the clock runs again.
    await until(F!, (s) => s.snapshot!.situation.kind === 'chance', 'the chance node after the restart');
    await F!.send({ kind: 'chance', turn: view(F!).situation.turn });
    await until(B!, (s) => s.snapshot!.clock.status === 'running' && s.snapshot!.situation.kind === 'simultaneous', 'the next turn with its clock');
  });
});
