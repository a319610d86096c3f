/** The edge of the exercise socket: every malformed message gets its own code and the field at fault. */
import { describe, expect, it } from 'vitest';
import { parseClientMessage, parseIntentBody } from '../../../src/lib/exercise/messages';

const parse = (value: unknown) => parseClientMessage(Buffer.from(typeof value === 'string' ? value : JSON.stringify(value)), false);
const refusal = (value: unknown) => {
  const parsed = parse(value);
  if (parsed.ok) throw new Error('expected a refusal');
  return { code: parsed.error.code, key: parsed.key, fields: parsed.error.fields.map((f) => f.field) };
};

describe('exercise protocol: reading client messages', () => {
  it('accepts hello, ping and a well-formed intent', () => {
    expect(parse({ v: 1, type: 'hello', lastSeq: null })).toMatchObject({ ok: true });
    expect(parse({ v: 1, type: 'ping' })).toMatchObject({ ok: true });
    const submit = parse({ v: 1, type: 'intent', key: 'key-0001', intent: { kind: 'submit', turn: 2, choice: { action: 'Hold' }, rationale: ' why ', confidence: 40 } });
    expect(submit).toMatchObject({ ok: true, message: { intent: { kind: 'submit', rationale: 'why' } } });
  });

  it('names what is wrong: JSON, version, type, kind, fields', () => {
    expect(refusal('{not json')).toMatchObject({ code: 'bad-json', key: null });
    expect(refusal([1, 2])).toMatchObject({ code: 'invalid', fields: ['(message)'] });
    expect(refusal({ v: 2, type: 'ping', key: 'key-0002' })).toMatchObject({ code: 'bad-version', key: 'key-0002', fields: ['v'] });
    expect(refusal({ v: 1, type: 'shout' })).toMatchObject({ code: 'unknown-type', fields: ['type'] });
    expect(refusal({ v: 1, type: 'intent', key: 'key-0003', intent: { kind: 'launch' } })).toMatchObject({ code: 'unknown-type', key: 'key-0003', fields: ['intent.kind'] });
    const bad = refusal({ v: 1, type: 'intent', key: 'key-0004', intent: { kind: 'submit', turn: 0, choice: { action: 'Hold', proposal: 'x' }, rationale: 'r', confidence: 101 } });
    expect(bad.code).toBe('invalid');
    expect(bad.fields).toEqual(expect.arrayContaining(['intent.turn', 'intent.confidence']));
    expect(refusal({ v: 1, type: 'intent', key: 'x', intent: { kind: 'reveal', turn: 1 } }).fields).toEqual(['key']);
    expect(refusal({ v: 1, type: 'hello', lastSeq: null, extra: true }).code).toBe('invalid');
  });

  it('refuses binary frames and oversized messages unread', () => {
    expect(parseClientMessage(Buffer.from('{"v":1,"type":"ping"}'), true)).toMatchObject({ ok: false, error: { code: 'bad-json' } });
    expect(parse('x'.repeat(64 * 1024 + 1))).toMatchObject({ ok: false, error: { code: 'too-large' } });
  });

  it('needs a reason to choose a chance outcome or adjudicate, and seconds to extend the clock', () => {
    expect(refusal({ v: 1, type: 'intent', key: 'key-0005', intent: { kind: 'chance', turn: 3, outcome: 'Storm' } }).fields).toEqual(['intent.reason']);
    expect(refusal({ v: 1, type: 'intent', key: 'key-0006', intent: { kind: 'adjudicate', turn: 3, teamId: 'red', decision: { action: 'Hold' }, reason: 'no' } }).fields).toEqual(['intent.reason']);
    expect(refusal({ v: 1, type: 'intent', key: 'key-0007', intent: { kind: 'clock', action: 'extend' } }).fields).toEqual(['intent.seconds']);
  });

  it('reads the HTTP body {key, intent} the same way', () => {
    expect(parseIntentBody({ key: 'key-0008', intent: { kind: 'reveal', turn: 1 } })).toMatchObject({ ok: true });
    expect(parseIntentBody({ intent: { kind: 'reveal', turn: 1 } })).toMatchObject({ ok: false, error: { code: 'invalid' } });
    expect(parseIntentBody('text')).toMatchObject({ ok: false, error: { code: 'invalid' } });
  });
});
