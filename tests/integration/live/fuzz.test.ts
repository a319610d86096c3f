/**
 * Thousands of malformed and hostile messages: random JSON and text, protocol-shaped
 * messages with random contents, wrong types, unknown kinds, moves for another team and
 * out of turn, forged keys, deep nesting, binary frames and huge payloads. The server
 * answers every one with an error, never crashes, and keeps serving everyone else.
 */
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { INTENT_KINDS, MAX_CLIENT_MESSAGE_BYTES } from '../../../src/lib/exercise/protocol';
import type { Snapshot } from '../../../src/lib/exercise/view';
import { DEMO, signIn, startApp, type App, type Client } from '../../support/app';
import { exerciseIdByTitle, optionWith, RawSocket } from './support';

const ERROR_CODES = ['bad-json', 'too-large', 'bad-version', 'unknown-type', 'invalid', 'not-ready', 'forbidden', 'conflict', 'stale-turn', 'not-found'];

let app: App;
let id: string;
let facilitator: Client;
let red: Client;
let hostile: RawSocket;
let velmoraHold = '';

beforeAll(async () => {
  // Thousands of messages answered one by one are a flood by design here: the message limit is tested in tests/integration/sockets.test.ts.
  app = await startApp({ env: { RUNGWISE_SOCKET_LIMITS: 'off' } });
  facilitator = await signIn(app, DEMO.facilitator);
  red = await signIn(app, DEMO.red);
  id = await exerciseIdByTitle(facilitator, 'run 2');
  const run = await RawSocket.open(app, facilitator, `/ws/exercise/${id}`);
  await run.hello();
  expect(await run.intent({ kind: 'phase', to: 'live' })).toMatchObject({ type: 'ack' });
  run.close();
  hostile = await RawSocket.open(app, red, `/ws/exercise/${id}`);
  await hostile.hello();
  await hostile.nextOf('presence');
  const { body } = await facilitator.json<{ view: Snapshot }>(`/api/exercises/${id}`);
  velmoraHold = optionWith(body.view, 'velmora', 'hold');
});
afterAll(async () => {
  hostile?.close();
  await app?.stop();
});

/** Send one frame and require exactly an error answer. */
async function answeredWithError(frame: string | Buffer, binary = false): Promise<string> {
  hostile.send(frame, binary);
  const answer = await hostile.reply<{ type: string; code: string; message: string }>();
  expect(answer.type, `answer to ${String(frame).slice(0, 120)}`).toBe('error');
  expect(ERROR_CODES).toContain(answer.code);
  expect(answer.message.length).toBeGreaterThan(0);
  return answer.code;
}

const notAGreeting = (v: unknown) => !(typeof v === 'object' && v !== null && (v as { v?: unknown }).v === 1 && ['hello', 'ping'].includes((v as { type?: unknown }).type as string));

describe('fuzz: hostile messages on the exercise socket', () => {
  it('answers thousands of random JSON values and texts with an error each', async () => {
    const codes = new Map<string, number>();
    const count = (code: string) => codes.set(code, (codes.get(code) ?? 0) + 1);
    const samples = [
      ...fc.sample(fc.jsonValue().filter(notAGreeting), { numRuns: 1200, seed: 1 }).map((v) => JSON.stringify(v)),
      ...fc.sample(fc.string({ unit: 'grapheme', maxLength: 200 }), { numRuns: 600, seed: 2 }),
    ];
    for (const frame of samples) count(await answeredWithError(frame));
    expect(samples.length).toBe(1800);
    expect(codes.get('bad-json')).toBeGreaterThan(0);
    expect(codes.get('invalid')).toBeGreaterThan(0);
  });

  it('answers protocol-shaped messages with random or hostile contents', async () => {
    const intent = fc.record(
      {
        kind: fc.oneof(fc.constantFrom(...INTENT_KINDS), fc.string()),
        turn: fc.oneof(fc.integer(), fc.double(), fc.string(), fc.constant(null)),
        teamId: fc.constantFrom('velmora', 'ostrakh', 'lantern', '__proto__'),
        choice: fc.oneof(fc.record({ action: fc.string() }), fc.record({ proposal: fc.string() }), fc.jsonValue()),
        label: fc.oneof(fc.string(), fc.constant(null)),
        reason: fc.string(),
        to: fc.oneof(fc.constant('all'), fc.array(fc.string())),
        tags: fc.array(fc.string()),
        text: fc.string(),
        patch: fc.dictionary(fc.string(), fc.jsonValue()),
        extra: fc.jsonValue(),
      },
      { requiredKeys: ['kind'] },
    );
    const message = fc.record({
      v: fc.oneof(fc.constant(1), fc.constant(1), fc.integer(), fc.string()),
      type: fc.oneof(fc.constant('intent'), fc.constant('intent'), fc.string()),
      key: fc.oneof(fc.uuid(), fc.string(), fc.integer()),
      intent,
    });
    const frames = fc.sample(message, { numRuns: 1500, seed: 3 }).map((m) => JSON.stringify(m));
    for (const frame of frames) await answeredWithError(frame);
  });

  it('refuses well-formed moves for another team, out of turn, and every facilitator command', async () => {
    const key = () => `fz-${crypto.randomUUID()}`;
    const intents = [
      { kind: 'submit', turn: 1, choice: { action: velmoraHold }, rationale: '', confidence: null },
      { kind: 'draft', turn: 1, label: velmoraHold, proposal: null, rationale: 'their move', confidence: 10 },
      { kind: 'submit', turn: 2, choice: { action: velmoraHold }, rationale: '', confidence: null },
      { kind: 'submit', turn: 1, choice: { proposal: 'Move for Velmora' }, rationale: '', confidence: null, teamId: 'velmora' },
      { kind: 'reveal', turn: 1 },
      { kind: 'chance', turn: 1 },
      { kind: 'undo', turn: 1, reason: 'sabotage' },
      { kind: 'phase', to: 'ended' },
      { kind: 'adjudicate', turn: 1, teamId: 'velmora', decision: { action: velmoraHold }, reason: 'I decide for them' },
      { kind: 'inject', title: 'Fake news', body: 'forged', to: 'all', attachmentIds: [], authoredId: null },
      { kind: 'settings', patch: { submitter: 'any' } },
      { kind: 'clock', action: 'extend', seconds: 86_400 },
      { kind: 'note', turn: 1, moveId: null, tags: [], text: 'players write no notes' },
    ];
    const codes = [];
    for (let round = 0; round < 20; round++) {
      for (const intent of intents) codes.push(await answeredWithError(JSON.stringify({ v: 1, type: 'intent', key: key(), intent })));
    }
    expect(new Set(codes)).toEqual(new Set(['conflict', 'stale-turn', 'forbidden', 'invalid']));
  });

  it('answers wrong types, forged keys, prototype tricks, deep nesting, binary and huge frames', async () => {
    const deep = `${'['.repeat(50_000)}${']'.repeat(50_000)}`;
    const frames: [string | Buffer, boolean][] = [
      ['', false],
      ['null', false],
      ['{"v":"1","type":"hello","lastSeq":null}', false],
      ['{"v":2,"type":"hello","lastSeq":null}', false],
      ['{"v":1,"type":"hello","lastSeq":-5}', false],
      ['{"v":1,"type":"hello","lastSeq":"0"}', false],
      ['{"v":1,"type":"intent","key":"x","intent":{"kind":"reveal","turn":1}}', false],
      [`{"v":1,"type":"intent","key":"${'k'.repeat(65)}","intent":{"kind":"reveal","turn":1}}`, false],
      ['{"v":1,"type":"intent","key":"good-key-123","intent":{"kind":"submit","turn":1.5,"choice":{"action":"Hold"},"rationale":"","confidence":null}}', false],
      ['{"v":1,"type":"intent","key":"good-key-124","intent":{"kind":"submit","turn":1,"choice":{"action":"Hold","proposal":"both"},"rationale":"","confidence":null}}', false],
      ['{"v":1,"type":"intent","key":"good-key-125","intent":{"kind":"note","turn":1,"moveId":null,"tags":["x"],"text":"y","__proto__":{"admin":true}}}', false],
      ['{"__proto__":{"v":1,"type":"ping"}}', false],
      ['{"constructor":{"prototype":{"polluted":true}}}', false],
      [JSON.stringify({ v: 1, type: 'intent', key: 'good-key-126', intent: { kind: 'submit', turn: 1, choice: { action: 'x' }, rationale: 'r'.repeat(5000), confidence: 101 } }), false],
      [deep, false],
      [Buffer.from([0xff, 0x00, 0x13, 0x37]), true],
      [Buffer.from('{"v":1,"type":"ping"}'), true],
      ['x'.repeat(MAX_CLIENT_MESSAGE_BYTES + 1), false],
      [JSON.stringify({ v: 1, type: 'intent', key: 'big-key-0001', intent: { kind: 'note', turn: 1, moveId: null, tags: [], text: 'n'.repeat(900_000) } }), false],
    ];
    const codes = [];
    for (const [frame, binary] of frames) codes.push(await answeredWithError(frame, binary));
    expect(codes.filter((c) => c === 'too-large')).toHaveLength(3);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(({} as Record<string, unknown>).admin).toBeUndefined();
  });

  it('closes a socket that sends more than the 1 MiB frame limit, and keeps serving', async () => {
    const greedy = await RawSocket.open(app, red, `/ws/exercise/${id}`);
    greedy.send('y'.repeat(2 * 1024 * 1024));
    await expect.poll(() => greedy.closed?.code, { timeout: 5000 }).toBe(1009);
    hostile.send(JSON.stringify({ v: 1, type: 'ping' }));
    expect(await hostile.nextOf('pong')).toMatchObject({ type: 'pong' });
  });

  it('is still healthy: no server errors, and honest intents still work', async () => {
    expect((await fetch(`${app.url}/api/health`)).status).toBe(200);
    expect(app.output()).not.toContain('[live] message failed');
    const blue = await signIn(app, DEMO.blue);
    const honest = await blue.json(`/api/exercises/${id}/intents`, { method: 'POST', json: { key: `ok-${crypto.randomUUID()}`, intent: { kind: 'submit', turn: 1, choice: { action: velmoraHold }, rationale: 'after the storm', confidence: 50 } } });
    expect(honest).toMatchObject({ status: 200, body: { result: { status: 'revealed' } } });
  });
});

describe('fuzz: hostile bodies on the intents endpoint', () => {
  it('answers each random body with a 4xx and a JSON error, never a 500', async () => {
    const bodies = fc.sample(fc.oneof(fc.jsonValue().map((v) => JSON.stringify(v)), fc.string()), { numRuns: 300, seed: 4 });
    for (const body of bodies) {
      const answer = await red.fetch(`/api/exercises/${id}/intents`, { method: 'POST', body, headers: { 'content-type': 'application/json' } });
      expect(answer.status, body.slice(0, 80)).toBeGreaterThanOrEqual(400);
      expect(answer.status, body.slice(0, 80)).toBeLessThan(500);
      expect(await answer.json()).toMatchObject({ error: expect.any(String) });
    }
  });
});
