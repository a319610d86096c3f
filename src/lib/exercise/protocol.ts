/**
 * The exercise socket protocol, version 1. Browser-safe: the Desk, Console and
 * Observer log import these types, the hub validates every message with these
 * schemas. Client messages: `hello` (start or resume), `ping`, and `intent`
 * (a change the client asks for, with its idempotency key). Server messages:
 * `snapshot`, `update` (numbered), `resume`, `ack`, `error`, `presence`,
 * `analysis`, `pong`. DEVELOPERS.md ("Live exercise") describes the flow.
 */
import { z } from 'zod';
import { settingsPatchSchema } from './settings';
import type { Snapshot, SectionName, EventSummary, PresenceView, AnalysisView } from './view';

export const PROTOCOL_VERSION = 1;
/** Larger messages are refused unread. */
export const MAX_CLIENT_MESSAGE_BYTES = 64 * 1024;

const text = (max: number, what: string) => z.string().trim().max(max, `${what} is at most ${max} characters`);
const required = (max: number, what: string) => text(max, what).min(1, `${what} is required`);
const reason = required(2000, 'the reason').min(3, 'give a reason of at least 3 characters');
const turn = z.number().int('a whole turn number').min(1, 'turns start at 1');
const confidence = z.number().int('a whole number').min(0, '0 to 100').max(100, '0 to 100').nullable();
const label = required(200, 'the action');

export const choiceSchema = z.union([
  z.object({ action: label }).strict(),
  z.object({ proposal: required(2000, 'the proposal') }).strict(),
]);

export const draftIntent = z
  .object({
    kind: z.literal('draft'),
    turn,
    label: label.nullable(),
    proposal: text(2000, 'the proposal').nullable(),
    rationale: text(4000, 'the rationale'),
    confidence,
  })
  .strict();

export const submitIntent = z
  .object({ kind: z.literal('submit'), turn, choice: choiceSchema, rationale: text(4000, 'the rationale'), confidence })
  .strict();

export const revealIntent = z.object({ kind: z.literal('reveal'), turn }).strict();

export const adjudicateIntent = z
  .object({
    kind: z.literal('adjudicate'),
    turn,
    teamId: required(200, 'the team'),
    decision: z.union([z.object({ action: label }).strict(), z.object({ outcome: required(200, 'the outcome node') }).strict()]),
    reason,
  })
  .strict();

export const chanceIntent = z
  .object({
    kind: z.literal('chance'),
    turn,
    /** Omit for the server's seeded draw; name an outcome (with a reason) to choose it. */
    outcome: label.optional(),
    reason: reason.optional(),
  })
  .strict()
  .refine((c) => c.outcome === undefined || c.reason !== undefined, { path: ['reason'], message: 'choosing an outcome needs a reason' });

export const clockIntent = z
  .object({
    kind: z.literal('clock'),
    action: z.enum(['start', 'hold', 'extend']),
    seconds: z.number().int().min(1).max(24 * 3600).optional(),
  })
  .strict()
  .refine((c) => c.action !== 'extend' || c.seconds !== undefined, { path: ['seconds'], message: 'say how many seconds to add' });

export const phaseIntent = z
  .object({ kind: z.literal('phase'), to: z.enum(['draft', 'briefing', 'live', 'paused', 'ended']), reason: text(2000, 'the reason').optional() })
  .strict();

export const injectIntent = z
  .object({
    kind: z.literal('inject'),
    title: required(200, 'the title'),
    body: required(8000, 'the text'),
    to: z.union([z.literal('all'), z.array(required(200, 'a team')).min(1, 'choose at least one team').max(6)]),
    attachmentIds: z.array(z.string().max(64)).max(10).default([]),
    /** The scenario's inject id, when releasing a pre-authored inject. */
    authoredId: z.string().max(200).nullable().default(null),
  })
  .strict();

export const undoIntent = z.object({ kind: z.literal('undo'), turn, reason }).strict();

export const noteIntent = z
  .object({
    kind: z.literal('note'),
    turn: turn.nullable(),
    moveId: z.string().max(64).nullable(),
    tags: z.array(required(40, 'a tag')).max(10, 'at most 10 tags on a note'),
    text: required(4000, 'the note'),
  })
  .strict();

export const settingsIntent = z.object({ kind: z.literal('settings'), patch: settingsPatchSchema }).strict();

export const INTENT_KINDS = ['draft', 'submit', 'reveal', 'adjudicate', 'chance', 'clock', 'phase', 'inject', 'undo', 'note', 'settings'] as const;
export type IntentKind = (typeof INTENT_KINDS)[number];

export const intentSchema = z.discriminatedUnion('kind', [
  draftIntent,
  submitIntent,
  revealIntent,
  adjudicateIntent,
  chanceIntent,
  clockIntent,
  phaseIntent,
  injectIntent,
  undoIntent,
  noteIntent,
  settingsIntent,
]);
export type Intent = z.infer<typeof intentSchema>;
export type IntentOf<K extends IntentKind> = Extract<Intent, { kind: K }>;

/** An idempotency key: the client makes one per intent and reuses it on every retry. */
export const intentKey = z
  .string()
  .min(8, 'the key is at least 8 characters')
  .max(64, 'the key is at most 64 characters')
  .regex(/^[\w-]+$/, 'letters, digits, - and _ only');

export const clientMessageSchema = z.discriminatedUnion('type', [
  z.object({ v: z.literal(PROTOCOL_VERSION), type: z.literal('hello'), lastSeq: z.number().int().min(0).nullable() }).strict(),
  z.object({ v: z.literal(PROTOCOL_VERSION), type: z.literal('ping') }).strict(),
  z.object({ v: z.literal(PROTOCOL_VERSION), type: z.literal('intent'), key: intentKey, intent: intentSchema }).strict(),
]);
export type ClientMessage = z.infer<typeof clientMessageSchema>;
export const CLIENT_MESSAGE_TYPES = ['hello', 'ping', 'intent'] as const;

export type ErrorCode =
  | 'bad-json'
  | 'too-large'
  | 'bad-version'
  | 'unknown-type'
  | 'invalid'
  | 'not-ready'
  | 'forbidden'
  | 'conflict'
  | 'stale-turn'
  | 'not-found'
  | 'rate-limited'
  | 'server-error';

export type FieldReason = { field: string; reason: string };

export type ServerMessage =
  | { v: 1; type: 'snapshot'; seq: number; serverNow: number; view: Snapshot }
  | { v: 1; type: 'update'; seq: number; serverNow: number; event: EventSummary; patch: Partial<Snapshot> }
  | { v: 1; type: 'resume'; seq: number; from: number; serverNow: number; missed: EventSummary[]; patch: Partial<Snapshot> }
  | { v: 1; type: 'ack'; key: string; seq: number; duplicate: boolean; result: Record<string, unknown> }
  | { v: 1; type: 'error'; key: string | null; code: ErrorCode; message: string; fields: FieldReason[] }
  | { v: 1; type: 'presence'; presence: PresenceView }
  | { v: 1; type: 'analysis'; analysis: AnalysisView }
  | { v: 1; type: 'pong'; serverNow: number };

export type { SectionName };
