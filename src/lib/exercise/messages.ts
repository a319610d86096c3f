/**
 * Reading a client message at the edge: size, JSON, protocol version, message
 * type, intent kind, then the zod schema. Each fault gets its own code and a
 * sentence naming the field, so a client (or a person reading its log) knows
 * what to fix. Nothing here throws.
 */
import type { z } from 'zod';
import {
  CLIENT_MESSAGE_TYPES,
  INTENT_KINDS,
  MAX_CLIENT_MESSAGE_BYTES,
  PROTOCOL_VERSION,
  clientMessageSchema,
  intentKey,
  intentSchema,
  type ClientMessage,
  type FieldReason,
  type Intent,
} from './protocol';
import { IntentError } from './state';

export type Parsed<T> = { ok: true; message: T } | { ok: false; key: string | null; error: IntentError };

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

function fieldsOf(error: z.ZodError, prefix = ''): FieldReason[] {
  return error.issues.slice(0, 20).map((i) => ({ field: [prefix, ...i.path.map(String)].filter(Boolean).join('.') || '(message)', reason: i.message }));
}

function keyIn(value: Record<string, unknown>): string | null {
  return intentKey.safeParse(value.key).success ? (value.key as string) : null;
}

function fail<T>(key: string | null, code: IntentError['code'], message: string, fields: FieldReason[] = []): Parsed<T> {
  return { ok: false, key, error: new IntentError(code, message, fields) };
}

function checkKind(intent: unknown, key: string | null, prefix: string): Parsed<never> | null {
  if (!isRecord(intent)) return fail(key, 'invalid', 'The intent must be an object', [{ field: prefix || '(body)', reason: 'expected an object' }]);
  if (!INTENT_KINDS.includes(intent.kind as never)) {
    return fail(key, 'unknown-type', `Unknown intent kind ${JSON.stringify(intent.kind)?.slice(0, 40) ?? 'undefined'}`, [
      { field: `${prefix ? `${prefix}.` : ''}kind`, reason: `one of ${INTENT_KINDS.join(', ')}` },
    ]);
  }
  return null;
}

export function parseClientMessage(data: Buffer, isBinary: boolean): Parsed<ClientMessage> {
  if (isBinary) return fail(null, 'bad-json', 'Send messages as JSON text, not binary frames');
  if (data.length > MAX_CLIENT_MESSAGE_BYTES) {
    return fail(null, 'too-large', `The message is ${data.length} bytes; the limit is ${MAX_CLIENT_MESSAGE_BYTES}`);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(data.toString('utf8'));
  } catch {
    return fail(null, 'bad-json', 'The message is not valid JSON');
  }
  if (!isRecord(raw)) return fail(null, 'invalid', 'A message must be a JSON object', [{ field: '(message)', reason: 'expected an object' }]);
  const key = keyIn(raw);
  if (raw.v !== PROTOCOL_VERSION) {
    return fail(key, 'bad-version', `This server speaks protocol version ${PROTOCOL_VERSION}`, [{ field: 'v', reason: `must be ${PROTOCOL_VERSION}` }]);
  }
  if (!CLIENT_MESSAGE_TYPES.includes(raw.type as never)) {
    return fail(key, 'unknown-type', `Unknown message type ${JSON.stringify(raw.type)?.slice(0, 40) ?? 'undefined'}`, [{ field: 'type', reason: `one of ${CLIENT_MESSAGE_TYPES.join(', ')}` }]);
  }
  if (raw.type === 'intent') {
    const refused = checkKind(raw.intent, key, 'intent');
    if (refused) return refused;
  }
  const parsed = clientMessageSchema.safeParse(raw);
  if (!parsed.success) return fail(key, 'invalid', 'The message does not fit the protocol', fieldsOf(parsed.error));
  return { ok: true, message: parsed.data };
}

/** The body of POST /api/exercises/<id>/intents: {key, intent}. */
export function parseIntentBody(raw: unknown): Parsed<{ key: string; intent: Intent }> {
  if (!isRecord(raw)) return fail(null, 'invalid', 'The body must be a JSON object with key and intent', [{ field: '(body)', reason: 'expected an object' }]);
  const key = keyIn(raw);
  const parsedKey = intentKey.safeParse(raw.key);
  if (!parsedKey.success) return fail(null, 'invalid', 'Every intent needs an idempotency key', fieldsOf(parsedKey.error, 'key'));
  const refused = checkKind(raw.intent, key, 'intent');
  if (refused) return refused;
  const intent = intentSchema.safeParse(raw.intent);
  if (!intent.success) return fail(key, 'invalid', 'The intent does not fit the protocol', fieldsOf(intent.error, 'intent'));
  return { ok: true, message: { key: parsedKey.data, intent: intent.data } };
}
