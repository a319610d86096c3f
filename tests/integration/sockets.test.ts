/**
 * The shared socket layer (server/sockets.ts, server/socket-guard.ts) over real sockets on
 * both routes: the per-connection message limit (a flood is refused and closed with 1008,
 * normal use passes, everyone else is still served), the cap on one person's open sockets,
 * and access changes that close open
 * sockets at once (a deactivated account, a sign-out, a seat taken away or changed, settings).
 */
import WebSocket from 'ws';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CLOSE_AFTER_DROPS, MAX_SOCKETS_PER_PERSON } from '../../server/socket-guard';
import type { Snapshot } from '../../src/lib/exercise/view';
import { DEMO, signIn, startApp, type App, type Client } from '../support/app';
import { eventually, openReport, type DocClient } from '../support/report';
import { connectLive, exerciseIdByTitle, joined, RawSocket, until } from './live/support';

let app: App;
let admin: Client;
let facilitator: Client;
let people: Record<'blue' | 'blue2' | 'red' | 'mediator' | 'observer', Client>;
let finished: string;
let briefing: string;

/** A socket that keeps everything the server sends and how it closed. */
type Recorder = { ws: WebSocket; received: (string | Buffer)[]; closed: Promise<{ code: number; reason: string }> };

function record(client: Client, path: string): Promise<Recorder> {
  return new Promise((done, fail) => {
    const ws = new WebSocket(`ws://127.0.0.1:${app.port}${path}`, { headers: { cookie: client.cookie, origin: app.url } });
    const received: (string | Buffer)[] = [];
    const closed = new Promise<{ code: number; reason: string }>((c) => ws.on('close', (code, reason) => c({ code, reason: String(reason) })));
    ws.on('message', (data, isBinary) => received.push(isBinary ? (data as Buffer) : String(data)));
    ws.once('open', () => done({ ws, received, closed }));
    ws.once('error', fail);
  });
}

const parsed = (r: Recorder) => r.received.filter((m): m is string => typeof m === 'string').map((m) => JSON.parse(m) as { type: string; code?: string; key?: string });

/** How the report's socket closed, when the server closed it. */
function closeOf(report: DocClient): Promise<{ code: number; reason: string }> {
  return new Promise((done) => {
    const closed = (event: CloseEvent | null) => {
      if (!event) return; // closed by the client itself
      report.provider.off('connection-close', closed);
      done({ code: event.code, reason: String(event.reason) });
    };
    report.provider.on('connection-close', closed);
  });
}

async function membershipId(exerciseId: string, email: string): Promise<string> {
  const { body } = await facilitator.json<{ view: Snapshot }>(`/api/exercises/${exerciseId}`);
  const person = await admin.json<{ users: { id: string; email: string }[] }>('/api/users');
  const userId = person.body.users.find((u) => u.email === email)!.id;
  return body.view.roster!.members.find((m) => m.userId === userId)!.membershipId;
}

async function setting(exerciseId: string, patch: Record<string, unknown>): Promise<void> {
  const answer = await facilitator.json(`/api/exercises/${exerciseId}/intents`, { method: 'POST', json: { key: `set-${crypto.randomUUID()}`, intent: { kind: 'settings', patch } } });
  expect(answer.status).toBe(200);
}

async function stillServed(client: Client, exerciseId: string): Promise<void> {
  const other = await RawSocket.open(app, client, `/ws/exercise/${exerciseId}`);
  try {
    await other.hello();
    other.send(JSON.stringify({ v: 1, type: 'ping' }));
    expect(await other.nextOf('pong')).toMatchObject({ type: 'pong' });
  } finally {
    other.close();
  }
  expect((await fetch(`${app.url}/api/health`)).status).toBe(200);
}

beforeAll(async () => {
  app = await startApp();
  admin = await signIn(app, DEMO.admin);
  facilitator = await signIn(app, DEMO.facilitator);
  people = {
    blue: await signIn(app, DEMO.blue),
    blue2: await signIn(app, DEMO.blue2),
    red: await signIn(app, DEMO.red),
    mediator: await signIn(app, DEMO.mediator),
    observer: await signIn(app, DEMO.observer),
  };
  finished = await exerciseIdByTitle(facilitator, 'run 1');
  briefing = await exerciseIdByTitle(facilitator, 'run 2');
  await setting(finished, { playersMayComment: true }); // players then read the report draft
});
afterAll(() => app?.stop());

describe('the message limit on the exercise socket', () => {
  it('answers messages over the limit with rate-limited errors, then closes a flood with 1008', async () => {
    const flood = await record(people.red, `/ws/exercise/${briefing}`);
    const ping = JSON.stringify({ v: 1, type: 'ping' });
    for (let i = 0; i < 220; i++) flood.ws.send(ping);
    flood.ws.send(JSON.stringify({ v: 1, type: 'intent', key: 'over-the-limit', intent: { kind: 'phase', to: 'live' } }));
    for (let i = 0; i < 2000; i++) flood.ws.send(ping);
    const closed = await flood.closed;
    expect(closed.code).toBe(1008);
    expect(closed.reason).toMatch(/^Too many messages: at most 20 a second after a burst of 200/);
    const answers = parsed(flood);
    const pongs = answers.filter((m) => m.type === 'pong').length;
    expect(pongs).toBeGreaterThanOrEqual(200);
    expect(pongs).toBeLessThan(230);
    const limited = answers.filter((m) => m.type === 'error' && m.code === 'rate-limited');
    expect(limited).toHaveLength(CLOSE_AFTER_DROPS - 1); // the next drop closes the connection
    expect(limited.map((m) => m.key)).toContain('over-the-limit');
    await stillServed(people.blue, briefing);
  });

  it('lets a client through at ten times the busiest rate of the live bench', async () => {
    const busy = await RawSocket.open(app, people.blue, `/ws/exercise/${briefing}`);
    try {
      await busy.hello();
      for (let i = 0; i < 150; i++) {
        busy.send(JSON.stringify({ v: 1, type: 'ping' }));
        expect(await busy.reply()).toMatchObject({ type: 'pong' });
        await new Promise((r) => setTimeout(r, 20));
      }
      expect(busy.closed).toBeNull();
    } finally {
      busy.close();
    }
  });
});

describe('the message limit on the report socket', () => {
  it('closes a flood with 1008 while the other editors keep working', async () => {
    const watcher = await openReport(app, people.observer, finished);
    const flood = await record(facilitator, `/ws/report/${finished}`);
    try {
      const queryAwareness = new Uint8Array([3]);
      for (let i = 0; i < 5000; i++) flood.ws.send(queryAwareness);
      const closed = await flood.closed;
      expect(closed.code).toBe(1008);
      expect(closed.reason).toMatch(/^Too many messages: at most 200 a second after a burst of 1000/);
      expect(flood.received.length).toBeLessThan(1100); // each message read is answered; the rest were not read
      const paragraph = watcher.doc.getXmlFragment('default');
      const { XmlElement, XmlText } = await import('yjs');
      const element = new XmlElement('paragraph');
      element.insert(0, [new XmlText('Written after the flood')]);
      paragraph.insert(paragraph.length, [element]);
      const reader = await openReport(app, facilitator, finished);
      await eventually(() => reader.text().includes('Written after the flood'), 'the edit at a new editor');
      reader.close();
    } finally {
      watcher.close();
    }
  });

  it('never limits typing: a keystroke and a caret move every 10 ms for 3 s', async () => {
    const editor = await openReport(app, people.observer, finished);
    const watcher = await openReport(app, facilitator, finished);
    const closes: unknown[] = [];
    editor.provider.on('connection-close', (event) => closes.push(event));
    try {
      const { XmlElement, XmlText } = await import('yjs');
      const text = new XmlText();
      const element = new XmlElement('paragraph');
      element.insert(0, [text]);
      const fragment = editor.doc.getXmlFragment('default');
      fragment.insert(fragment.length, [element]);
      const typed = 'steady typing '.repeat(22).slice(0, 300);
      for (const [k, char] of [...typed].entries()) {
        text.insert(k, char);
        editor.provider.awareness.setLocalStateField('cursor', { at: k + 1 });
        await new Promise((r) => setTimeout(r, 10));
      }
      await eventually(() => watcher.text().includes(typed), 'every keystroke at the other editor');
      expect(closes).toEqual([]);
    } finally {
      editor.close();
      watcher.close();
    }
  });

  it('loses no text when updates are dropped: the server asks the editor for them again', async () => {
    const editor = await openReport(app, people.observer, finished);
    const watcher = await openReport(app, facilitator, finished);
    const closes: unknown[] = [];
    editor.provider.on('connection-close', (event) => closes.push(event));
    let askedAgain = 0;
    editor.provider.ws!.addEventListener('message', (event) => {
      const bytes = new Uint8Array(event.data as ArrayBuffer);
      if (bytes[0] === 0 && bytes[1] === 0) askedAgain++; // sync step 1 from the server
    });
    try {
      await new Promise((r) => setTimeout(r, 1000)); // a full bucket: the greeting's messages are paid back
      const { XmlElement, XmlText } = await import('yjs');
      const text = new XmlText();
      const element = new XmlElement('paragraph');
      element.insert(0, [text]);
      const fragment = editor.doc.getXmlFragment('default');
      // The whole burst, in messages that cost the server next to nothing (an awareness update naming
      // no client: no reply, no broadcast), so that it has not earned back the 31 tokens the edits
      // need by the time they arrive; an awareness query each would be answered, and on a loaded
      // machine answering 1000 of them took long enough (155 ms at 200 a second) to let every edit through.
      const emptyAwareness = new Uint8Array([1, 1, 0]);
      for (let i = 0; i < 1000; i++) editor.provider.ws!.send(emptyAwareness);
      fragment.insert(fragment.length, [element]);
      const typed = 'dropped, then asked for again';
      for (const [k, char] of [...typed].entries()) text.insert(k, char); // 30 updates with the paragraph: most over the limit, fewer than CLOSE_AFTER_DROPS
      await eventually(() => watcher.text().includes(typed), 'the dropped keystrokes at the other editor');
      expect(askedAgain).toBeGreaterThanOrEqual(1);
      expect(closes).toEqual([]);
    } finally {
      editor.close();
      watcher.close();
    }
  });
});

describe('the number of sockets one person may hold open', () => {
  it(`closes the connection after ${MAX_SOCKETS_PER_PERSON} with 4429 and the reason, counts both routes, and serves everyone else`, async () => {
    const held: WebSocket[] = [];
    try {
      for (let i = 0; i < MAX_SOCKETS_PER_PERSON; i++) held.push(await people.mediator.socket(i % 2 ? `/ws/exercise/${briefing}` : `/ws/report/${finished}`));
      const extra = await record(people.mediator, `/ws/exercise/${briefing}`);
      expect(await extra.closed).toEqual({ code: 4429, reason: expect.stringContaining(`at most ${MAX_SOCKETS_PER_PERSON} at once for one person`) });
      expect(parsed(extra)).toEqual([]); // closed before the route saw it: no snapshot
      await stillServed(people.red, briefing);
      held.pop()!.close();
      await expect
        .poll(async () => {
          const again = await record(people.mediator, `/ws/exercise/${briefing}`);
          const closedAt = await Promise.race([again.closed.then((c) => c.code), new Promise<null>((r) => setTimeout(() => r(null), 300))]);
          if (closedAt === null) held.push(again.ws);
          return closedAt;
        })
        .toBe(null);
    } finally {
      for (const ws of held) ws.close();
    }
  });
});

describe('access changes close open sockets at once', () => {
  it('closes a deactivated player’s exercise and report sockets and refuses them afterwards with 401', async () => {
    const live = connectLive(app, people.blue2, briefing);
    await joined(live);
    const raw = await record(people.blue2, `/ws/exercise/${briefing}`);
    const report = await openReport(app, people.blue2, finished);
    const reportClosed = closeOf(report);
    const neighbour = await openReport(app, people.blue, finished);
    try {
      const { body } = await admin.json<{ users: { id: string; email: string }[] }>('/api/users');
      const id = body.users.find((u) => u.email === DEMO.blue2)!.id;
      expect((await admin.json(`/api/users/${id}`, { method: 'PATCH', json: { active: false } })).status).toBe(200);

      const reason = 'Your account was deactivated by an administrator';
      expect(await raw.closed).toEqual({ code: 4401, reason });
      expect(await reportClosed).toEqual({ code: 4401, reason });
      await until(live, (s) => s.connection === 'refused', 'the Desk to show the refusal');
      expect(live.state.refusal).toBe(reason);
      await expect(people.blue2.socket(`/ws/exercise/${briefing}`)).rejects.toMatchObject({ status: 401 });
      await expect(people.blue2.socket(`/ws/report/${finished}`)).rejects.toMatchObject({ status: 401 });

      expect(neighbour.provider.wsconnected).toBe(true);
      await stillServed(people.blue, briefing);
    } finally {
      live.stop();
      report.close();
      neighbour.close();
    }
  });

  it('closes the sockets opened with a sign-in that signs out, and leaves that person’s other sign-ins alone', async () => {
    const leaving = await signIn(app, DEMO.blue); // a second sign-in of the same person, say on a tablet
    const live = connectLive(app, leaving, briefing);
    await joined(live);
    const report = await openReport(app, leaving, finished);
    const reportClosed = closeOf(report);
    const staying = await openReport(app, people.blue, finished);
    try {
      expect((await leaving.json('/api/auth/sign-out', { method: 'POST', json: {} })).status).toBe(200);
      const reason = 'This sign-in has ended (signed out). Sign in again to go on.';
      expect(await reportClosed).toEqual({ code: 4401, reason });
      await until(live, (s) => s.connection === 'refused', 'the Desk to show the refusal');
      expect(live.state.refusal).toBe(reason);
      await expect(leaving.socket(`/ws/exercise/${briefing}`)).rejects.toMatchObject({ status: 401 });
      expect(staying.provider.wsconnected).toBe(true);
      await stillServed(people.blue, briefing);
    } finally {
      live.stop();
      report.close();
      staying.close();
    }
  });

  it('closes a report socket whose mode changed with the seat, and leaves the exercise socket open', async () => {
    const report = await openReport(app, people.mediator, finished);
    const reportClosed = closeOf(report);
    const desk = await RawSocket.open(app, people.mediator, `/ws/exercise/${finished}`);
    try {
      await desk.hello();
      const seated = await facilitator.json(`/api/exercises/${finished}/roster`, { method: 'POST', json: { email: DEMO.mediator, role: 'observer', teamId: null, isLead: false } });
      expect(seated.status).toBe(201);
      expect(await reportClosed).toEqual({ code: 4403, reason: 'Your access to this report changed; open the report again' });
      expect((await desk.nextOf('snapshot')).view.me).toMatchObject({ role: 'observer' });
      expect(desk.closed).toBeNull();
      const again = await openReport(app, people.mediator, finished);
      again.close();
    } finally {
      report.close();
      desk.close();
    }
  });

  it('closes the report sockets of players when comments are no longer allowed', async () => {
    const report = await openReport(app, people.red, finished);
    const reportClosed = closeOf(report);
    try {
      await setting(finished, { playersMayComment: false });
      expect(await reportClosed).toEqual({ code: 4403, reason: "Only the exercise's facilitators and observers may do this" });
      await expect(people.red.socket(`/ws/report/${finished}`)).rejects.toMatchObject({ status: 403 });
    } finally {
      report.close();
    }
  });

  it('closes both sockets of a person taken off the roster, and refuses them afterwards with 403', async () => {
    const report = await openReport(app, people.observer, finished);
    const reportClosed = closeOf(report);
    const raw = await record(people.observer, `/ws/exercise/${finished}`);
    try {
      const seat = await membershipId(finished, DEMO.observer);
      expect((await facilitator.json(`/api/exercises/${finished}/roster/${seat}`, { method: 'DELETE' })).status).toBe(200);
      const reason = 'You are not part of this exercise';
      expect(await reportClosed).toEqual({ code: 4403, reason });
      expect(await raw.closed).toMatchObject({ code: 4403 });
      await expect(people.observer.socket(`/ws/report/${finished}`)).rejects.toMatchObject({ status: 403 });
      await expect(people.observer.socket(`/ws/exercise/${finished}`)).rejects.toMatchObject({ status: 403 });
    } finally {
      report.close();
    }
  });
});
