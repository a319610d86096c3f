/**
 * Test helpers for the live exercise: the real browser client (LiveClient) over the
 * ws package, raw sockets for hostile messages, and finding the seeded exercises.
 */
import WebSocket from 'ws';
import { LiveClient, type LiveState, type PendingStore, type SavedIntent } from '../../../src/lib/exercise/live-client';
import type { Intent } from '../../../src/lib/exercise/protocol';
import type { Snapshot } from '../../../src/lib/exercise/view';
import type { App, Client } from '../../support/app';

/** The browser client, started; `store` stands for the tab's sessionStorage, `port` for where it reaches (a dead port: off the network). */
export function connectLive(app: App, client: Client, exerciseId: string, store: PendingStore | null = null, port = app.port): LiveClient {
  const live = new LiveClient(
    exerciseId,
    null,
    (id) => {
      const socket = new WebSocket(`ws://127.0.0.1:${port}/ws/exercise/${id}`, { headers: { cookie: client.cookie, origin: app.url } });
      socket.on('error', () => undefined);
      return socket as unknown as globalThis.WebSocket;
    },
    store,
  );
  live.start();
  return live;
}

/** A tab's sessionStorage for unsent intents, in memory: what survives a reload. */
export function tabStore(saved: SavedIntent[] = []): PendingStore & { saved: SavedIntent[] } {
  const store = { saved, load: () => store.saved, save: (intents: SavedIntent[]) => void (store.saved = intents) };
  return store;
}

export function until(live: LiveClient, test: (state: LiveState) => boolean, what: string, ms = 8000): Promise<LiveState> {
  return new Promise((done, fail) => {
    if (test(live.state)) return done(live.state);
    const timer = setTimeout(() => {
      off();
      fail(new Error(`timed out waiting for ${what}; connection ${live.state.connection}, seq ${live.state.seq}`));
    }, ms);
    const off = live.subscribe((state) => {
      if (!test(state)) return;
      clearTimeout(timer);
      off();
      done(state);
    });
  });
}

export const view = (live: LiveClient): Snapshot => live.state.snapshot!;

export async function joined(live: LiveClient): Promise<Snapshot> {
  await until(live, (s) => s.connection === 'open' && s.snapshot !== null, 'the first snapshot');
  return view(live);
}

/** The label of the option a team has with this move kind at the current stage. */
export function optionWith(snapshot: Snapshot, teamId: string, move: string): string {
  const option = snapshot.situation.options[teamId]?.find((o) => o.move === move);
  if (!option) throw new Error(`${teamId} has no "${move}" option at ${snapshot.situation.nodeId}`);
  return option.label;
}

export async function exerciseIdByTitle(client: Client, part: string): Promise<string> {
  const { body } = await client.json<{ exercises: { id: string; title: string }[] }>('/api/exercises');
  const found = body.exercises.find((e) => e.title.includes(part));
  if (!found) throw new Error(`no exercise titled like "${part}"`);
  return found.id;
}

/** The Serrin Strait version the seeded exercises run on. */
export async function demoVersionId(client: Client): Promise<string> {
  const { body } = await client.json<{ exercises: { scenarioTitle: string; scenarioVersionId: string }[] }>('/api/exercises');
  return body.exercises.find((e) => e.scenarioTitle === 'Serrin Strait')!.scenarioVersionId;
}

export type Seat = { email: string; role: 'facilitator' | 'player' | 'observer' | 'sponsor'; teamId?: string; isLead?: boolean };

/** A fresh exercise on the demo scenario, with these people seated. */
export async function newExercise(facilitator: Client, title: string, settings: Record<string, unknown>, seats: Seat[]): Promise<string> {
  const scenarioVersionId = await demoVersionId(facilitator);
  const created = await facilitator.json<{ id: string }>('/api/exercises', { method: 'POST', json: { scenarioVersionId, title, settings } });
  if (created.status !== 201) throw new Error(`could not create an exercise: ${JSON.stringify(created.body)}`);
  for (const seat of seats) {
    const answer = await facilitator.json(`/api/exercises/${created.body.id}/roster`, { method: 'POST', json: { teamId: null, isLead: false, ...seat } });
    if (answer.status !== 201) throw new Error(`could not seat ${seat.email}: ${JSON.stringify(answer.body)}`);
  }
  return created.body.id;
}

/** A raw socket that answers each sent text with the next message the server sends. */
export class RawSocket {
  private queue: unknown[] = [];
  private waiters: ((m: unknown) => void)[] = [];
  closed: { code: number; reason: string } | null = null;

  private constructor(readonly ws: WebSocket) {
    ws.on('message', (data) => {
      const message = JSON.parse(String(data));
      const waiter = this.waiters.shift();
      if (waiter) waiter(message);
      else this.queue.push(message);
    });
    ws.on('close', (code, reason) => (this.closed = { code, reason: String(reason) }));
  }

  static open(app: App, client: Client, path: string): Promise<RawSocket> {
    return new Promise((done, fail) => {
      const ws = new WebSocket(`ws://127.0.0.1:${app.port}${path}`, { headers: { cookie: client.cookie, origin: app.url } });
      ws.once('open', () => done(new RawSocket(ws)));
      ws.once('unexpected-response', (_q, res) => fail(Object.assign(new Error(`upgrade refused: ${res.statusCode}`), { status: res.statusCode })));
      ws.once('error', fail);
    });
  }

  next<T = any>(ms = 5000): Promise<T> {
    const queued = this.queue.shift();
    if (queued !== undefined) return Promise.resolve(queued as T);
    return new Promise((done, fail) => {
      const timer = setTimeout(() => fail(new Error('no message from the server')), ms);
      this.waiters.push((m) => {
        clearTimeout(timer);
        done(m as T);
      });
    });
  }

  /** Wait for the first message of a type, dropping others (updates, presence) on the way. */
  async nextOf<T = any>(type: string, ms = 5000): Promise<T> {
    const deadline = Date.now() + ms;
    for (;;) {
      const message = await this.next<{ type: string }>(Math.max(1, deadline - Date.now()));
      if (message.type === type) return message as T;
    }
  }

  /** The next answer to something this socket sent, skipping what the server pushes by itself (presence, updates, analysis). */
  async reply<T = any>(ms = 5000): Promise<T> {
    const deadline = Date.now() + ms;
    for (;;) {
      const message = await this.next<{ type: string }>(Math.max(1, deadline - Date.now()));
      if (!['presence', 'update', 'analysis'].includes(message.type)) return message as T;
    }
  }

  send(data: string | Buffer, binary = false): void {
    this.ws.send(data, { binary });
  }

  async hello(): Promise<any> {
    this.send(JSON.stringify({ v: 1, type: 'hello', lastSeq: null }));
    return this.nextOf('snapshot');
  }

  /** Send an intent and wait for its ack or error (other messages are dropped). */
  async intent(intent: Intent | Record<string, unknown>, key = `k-${crypto.randomUUID()}`): Promise<any> {
    this.send(JSON.stringify({ v: 1, type: 'intent', key, intent }));
    const deadline = Date.now() + 5000;
    for (;;) {
      const message = await this.next<{ type: string; key?: string }>(Math.max(1, deadline - Date.now()));
      if ((message.type === 'ack' || message.type === 'error') && message.key === key) return message;
    }
  }

  close(): void {
    this.ws.close();
  }
}
