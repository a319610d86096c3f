import { sql } from 'drizzle-orm';
import { blob, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { EXERCISE_ROLES, EXERCISE_STATES, PLATFORM_ROLES } from '../lib/roles';

export * from '../lib/roles';

const id = () => text('id').primaryKey();
const createdAt = () =>
  integer('created_at', { mode: 'timestamp_ms' })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`);

// ---------------------------------------------------------------------------
// Accounts and sessions (the tables better-auth's Drizzle adapter manages).
// Column names follow better-auth's field names; `role` and `deactivatedAt`
// are our additional user fields.

export const user = sqliteTable('user', {
  id: id(),
  name: text('name').notNull(),
  email: text('email').notNull().unique(),
  emailVerified: integer('email_verified', { mode: 'boolean' }).notNull().default(false),
  image: text('image'),
  role: text('role', { enum: PLATFORM_ROLES }).notNull().default('member'),
  deactivatedAt: integer('deactivated_at', { mode: 'timestamp_ms' }),
  createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull(),
  updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
});

export const session = sqliteTable(
  'session',
  {
    id: id(),
    expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
    token: text('token').notNull().unique(),
    createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull(),
    updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
    ipAddress: text('ip_address'),
    userAgent: text('user_agent'),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
  },
  (t) => [index('session_user_idx').on(t.userId)],
);

export const account = sqliteTable(
  'account',
  {
    id: id(),
    accountId: text('account_id').notNull(),
    providerId: text('provider_id').notNull(),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    accessToken: text('access_token'),
    refreshToken: text('refresh_token'),
    idToken: text('id_token'),
    accessTokenExpiresAt: integer('access_token_expires_at', { mode: 'timestamp_ms' }),
    refreshTokenExpiresAt: integer('refresh_token_expires_at', { mode: 'timestamp_ms' }),
    scope: text('scope'),
    password: text('password'),
    createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull(),
    updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
  },
  (t) => [index('account_user_idx').on(t.userId)],
);

export const verification = sqliteTable(
  'verification',
  {
    id: id(),
    identifier: text('identifier').notNull(),
    value: text('value').notNull(),
    expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
    createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull(),
    updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
  },
  (t) => [index('verification_identifier_idx').on(t.identifier)],
);

// ---------------------------------------------------------------------------
// Invitations: the only way an account comes to exist. The token itself is
// mailed; only its SHA-256 is stored.

export const invitation = sqliteTable(
  'invitation',
  {
    id: id(),
    email: text('email').notNull(),
    role: text('role', { enum: PLATFORM_ROLES }).notNull().default('member'),
    tokenHash: text('token_hash').notNull().unique(),
    invitedBy: text('invited_by')
      .notNull()
      .references(() => user.id),
    /** When set, accepting also adds the new account to this exercise. */
    exerciseId: text('exercise_id').references(() => exercise.id, { onDelete: 'cascade' }),
    exerciseRole: text('exercise_role', { enum: EXERCISE_ROLES }),
    teamId: text('team_id'),
    createdAt: createdAt(),
    expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
    acceptedAt: integer('accepted_at', { mode: 'timestamp_ms' }),
    acceptedUserId: text('accepted_user_id').references(() => user.id),
    revokedAt: integer('revoked_at', { mode: 'timestamp_ms' }),
  },
  (t) => [index('invitation_email_idx').on(t.email)],
);

// ---------------------------------------------------------------------------
// Mail captured by the built-in SMTP sink (the Outbox). `raw` keeps the whole
// RFC 5322 message so attachments can be served byte for byte.

export type StoredAttachmentInfo = { filename: string; contentType: string; size: number };

export const mailMessage = sqliteTable(
  'mail_message',
  {
    id: id(),
    messageId: text('message_id'),
    from: text('from').notNull(),
    to: text('to', { mode: 'json' }).$type<string[]>().notNull(),
    subject: text('subject').notNull(),
    text: text('text'),
    html: text('html'),
    attachments: text('attachments', { mode: 'json' }).$type<StoredAttachmentInfo[]>().notNull(),
    raw: blob('raw', { mode: 'buffer' }).notNull(),
    receivedAt: createdAt(),
  },
  (t) => [index('mail_received_idx').on(t.receivedAt)],
);

// ---------------------------------------------------------------------------
// Scenarios and their versions. A version's `document` is a whole Rungwise
// scenario document (src/lib/scenario.ts). Once an exercise uses a version it
// is frozen; editing a frozen version starts a new draft.

export const scenario = sqliteTable(
  'scenario',
  {
    id: id(),
    ownerId: text('owner_id')
      .notNull()
      .references(() => user.id),
    title: text('title').notNull(),
    /** The setting's first lines, kept beside the title for the library search (Studio). */
    summary: text('summary').notNull().default(''),
    archivedAt: integer('archived_at', { mode: 'timestamp_ms' }),
    createdAt: createdAt(),
    updatedAt: createdAt(),
  },
  (t) => [index('scenario_owner_idx').on(t.ownerId)],
);

export const scenarioVersion = sqliteTable(
  'scenario_version',
  {
    id: id(),
    scenarioId: text('scenario_id')
      .notNull()
      .references(() => scenario.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    status: text('status', { enum: ['draft', 'frozen'] })
      .notNull()
      .default('draft'),
    document: text('document', { mode: 'json' }).$type<unknown>().notNull(),
    createdBy: text('created_by')
      .notNull()
      .references(() => user.id),
    createdAt: createdAt(),
    updatedAt: createdAt(),
    frozenAt: integer('frozen_at', { mode: 'timestamp_ms' }),
    /** Counts saves of a draft; a save names the revision it started from (Studio, optimistic locking). */
    revision: integer('revision').notNull().default(0),
    /** The version this one was started from, when it was not made from nothing. */
    basedOnId: text('based_on_id'),
    /** Studio: a ladder being edited that has faults, kept until it builds a tree (the document keeps the last good one). */
    ladderDraft: text('ladder_draft', { mode: 'json' }).$type<unknown>(),
  },
  (t) => [uniqueIndex('scenario_version_number_idx').on(t.scenarioId, t.number)],
);

// ---------------------------------------------------------------------------
// Exercises: one run of a frozen scenario version, and who takes part in it.

export const exercise = sqliteTable('exercise', {
  id: id(),
  scenarioVersionId: text('scenario_version_id')
    .notNull()
    .references(() => scenarioVersion.id),
  title: text('title').notNull(),
  state: text('state', { enum: EXERCISE_STATES }).notNull().default('draft'),
  /** Facilitator-set options (who submits, deadline rule, analysis shown to players...). */
  settings: text('settings', { mode: 'json' }).$type<Record<string, unknown>>().notNull().default({}),
  createdBy: text('created_by')
    .notNull()
    .references(() => user.id),
  createdAt: createdAt(),
  startedAt: integer('started_at', { mode: 'timestamp_ms' }),
  endedAt: integer('ended_at', { mode: 'timestamp_ms' }),
  // Live play (src/lib/exercise, server/live): where play stands, the number of
  // the last committed update, the seed of the chance draws and the turn clock.
  nodeId: text('node_id'),
  turn: integer('turn').notNull().default(1),
  seq: integer('seq').notNull().default(0),
  chanceSeed: text('chance_seed'),
  draws: integer('draws').notNull().default(0),
  clock: text('clock', { mode: 'json' }).$type<ExerciseClock>(),
});

export const membership = sqliteTable(
  'membership',
  {
    id: id(),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    role: text('role', { enum: EXERCISE_ROLES }).notNull(),
    /** The scenario team id, for players only. */
    teamId: text('team_id'),
    isLead: integer('is_lead', { mode: 'boolean' }).notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('membership_user_idx').on(t.exerciseId, t.userId), index('membership_user_only_idx').on(t.userId)],
);

// ---------------------------------------------------------------------------
// Studio: the change log of each scenario version, and briefing documents.
// An attachment row belongs to the scenario and never changes; a version's
// document lists the attachment ids it includes (so a frozen version's list is
// frozen with it). The file lives on disk under the data folder by SHA-256.

export const scenarioChange = sqliteTable(
  'scenario_change',
  {
    id: id(),
    versionId: text('version_id')
      .notNull()
      .references(() => scenarioVersion.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => user.id),
    /** One line a person reads: "Edited the ladder (3 rungs)". */
    summary: text('summary').notNull(),
    /** The document paths that changed, e.g. "teams[1].brief". */
    paths: text('paths', { mode: 'json' }).$type<string[]>().notNull(),
    createdAt: createdAt(),
  },
  (t) => [index('scenario_change_version_idx').on(t.versionId, t.createdAt)],
);

export const ATTACHMENT_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const;
export type AttachmentType = (typeof ATTACHMENT_TYPES)[number];

export const attachment = sqliteTable(
  'attachment',
  {
    id: id(),
    scenarioId: text('scenario_id')
      .notNull()
      .references(() => scenario.id, { onDelete: 'cascade' }),
    /** Set when the document belongs to one team's private brief. */
    teamId: text('team_id'),
    filename: text('filename').notNull(),
    contentType: text('content_type', { enum: ATTACHMENT_TYPES }).notNull(),
    size: integer('size').notNull(),
    sha256: text('sha256').notNull(),
    uploadedBy: text('uploaded_by')
      .notNull()
      .references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [index('attachment_scenario_idx').on(t.scenarioId), index('attachment_sha_idx').on(t.sha256)],
);

// ---------------------------------------------------------------------------
// After-action reports. The draft is a Yjs document stored as its updates
// (merged into one row now and then); an issued version is a frozen copy of
// the document as Tiptap JSON; each send to sponsors and each comment is a row.

export const reportUpdate = sqliteTable(
  'report_update',
  {
    seq: integer('seq').primaryKey({ autoIncrement: true }),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    update: blob('update', { mode: 'buffer' }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index('report_update_exercise_idx').on(t.exerciseId, t.seq)],
);

export const reportVersion = sqliteTable(
  'report_version',
  {
    id: id(),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    title: text('title').notNull(),
    /** The document as Tiptap (ProseMirror) JSON, never changed after issue. */
    content: text('content', { mode: 'json' }).$type<unknown>().notNull(),
    issuedBy: text('issued_by')
      .notNull()
      .references(() => user.id),
    /** The issuer's name as it was when the version was issued. */
    issuedByName: text('issued_by_name').notNull(),
    issuedAt: createdAt(),
  },
  (t) => [uniqueIndex('report_version_number_idx').on(t.exerciseId, t.number)],
);

export const reportDispatch = sqliteTable(
  'report_dispatch',
  {
    id: id(),
    versionId: text('version_id')
      .notNull()
      .references(() => reportVersion.id, { onDelete: 'cascade' }),
    sentBy: text('sent_by')
      .notNull()
      .references(() => user.id),
    sentByName: text('sent_by_name').notNull(),
    recipients: text('recipients', { mode: 'json' }).$type<string[]>().notNull(),
    note: text('note').notNull(),
    messageId: text('message_id'),
    sentAt: createdAt(),
  },
  (t) => [index('report_dispatch_version_idx').on(t.versionId)],
);

/**
 * The review of an exercise as last computed, with the fingerprint of the play
 * record it was computed from. The lambda fit takes seconds; a restart should
 * not have to repeat it for play that did not change.
 */
export const reviewCache = sqliteTable('review_cache', {
  exerciseId: text('exercise_id')
    .primaryKey()
    .references(() => exercise.id, { onDelete: 'cascade' }),
  fingerprint: text('fingerprint').notNull(),
  review: text('review', { mode: 'json' }).$type<unknown>().notNull(),
  computedAt: createdAt(),
});

export const reportComment = sqliteTable(
  'report_comment',
  {
    id: id(),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    authorId: text('author_id')
      .notNull()
      .references(() => user.id),
    authorName: text('author_name').notNull(),
    /** The passage of the draft the comment is about, as the author selected it. */
    quote: text('quote'),
    body: text('body').notNull(),
    createdAt: createdAt(),
    resolvedAt: integer('resolved_at', { mode: 'timestamp_ms' }),
  },
  (t) => [index('report_comment_exercise_idx').on(t.exerciseId, t.createdAt)],
);

// ---------------------------------------------------------------------------
// Live exercise (src/lib/exercise, server/live). Every committed change is one
// numbered row of exercise_event (the audit log and the source of the numbered
// updates); moves, drafts, injects and notes are the state those events changed.

/** The turn clock: `deadlineAt` while it runs, `leftMs` while it is held. */
export type ExerciseClock = {
  status: 'none' | 'held' | 'running' | 'expired';
  deadlineAt: number | null;
  leftMs: number | null;
  /** Restart the clock when the exercise goes live again after a pause. */
  resumeOnLive: boolean;
};

export const MOVE_KINDS = ['ladder', 'adjudicated', 'chance'] as const;
/** proposed: free text awaiting adjudication; sealed: decided, not yet in effect; revealed: in effect; undone. */
export const MOVE_STATUSES = ['proposed', 'sealed', 'revealed', 'undone'] as const;

export const exerciseMove = sqliteTable(
  'exercise_move',
  {
    id: id(),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    turn: integer('turn').notNull(),
    /** The node where the turn's stage begins. */
    stageNodeId: text('stage_node_id').notNull(),
    /** The tree node the move was made at; known for every team once the stage is revealed. */
    nodeId: text('node_id'),
    teamId: text('team_id'),
    label: text('label'),
    kind: text('kind', { enum: MOVE_KINDS }).notNull(),
    status: text('status', { enum: MOVE_STATUSES }).notNull(),
    proposal: text('proposal'),
    reason: text('reason'),
    rationale: text('rationale'),
    confidence: integer('confidence'),
    drawSeed: text('draw_seed'),
    drawValue: real('draw_value'),
    /** Set when an adjudication ended the game at this terminal node instead of an action. */
    outcomeNodeId: text('outcome_node_id'),
    submittedBy: text('submitted_by').references(() => user.id),
    submittedByName: text('submitted_by_name'),
    createdAt: createdAt(),
    revealedAt: integer('revealed_at', { mode: 'timestamp_ms' }),
    undoneAt: integer('undone_at', { mode: 'timestamp_ms' }),
    undoReason: text('undo_reason'),
  },
  (t) => [index('exercise_move_turn_idx').on(t.exerciseId, t.turn)],
);

export const exerciseEvent = sqliteTable(
  'exercise_event',
  {
    id: id(),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    seq: integer('seq').notNull(),
    kind: text('kind').notNull(),
    actorId: text('actor_id').references(() => user.id),
    actorName: text('actor_name').notNull(),
    /** The client's idempotency key: a retried intent finds its first commit here. */
    intentKey: text('intent_key'),
    summary: text('summary').notNull(),
    data: text('data', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
    /** The snapshot sections the change touched, so a resuming client is sent only those. */
    sections: text('sections', { mode: 'json' }).$type<string[]>().notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('exercise_event_seq_idx').on(t.exerciseId, t.seq),
    uniqueIndex('exercise_event_intent_idx').on(t.exerciseId, t.intentKey),
  ],
);

export const exerciseDraft = sqliteTable(
  'exercise_draft',
  {
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    teamId: text('team_id').notNull(),
    turn: integer('turn').notNull(),
    label: text('label'),
    proposal: text('proposal'),
    rationale: text('rationale').notNull().default(''),
    confidence: integer('confidence'),
    updatedBy: text('updated_by').references(() => user.id),
    updatedByName: text('updated_by_name').notNull(),
    updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.exerciseId, t.teamId] })],
);

export const exerciseInject = sqliteTable(
  'exercise_inject',
  {
    id: id(),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    turn: integer('turn').notNull(),
    nodeId: text('node_id').notNull(),
    /** The scenario's own inject id when a pre-authored inject was released. */
    authoredId: text('authored_id'),
    title: text('title').notNull(),
    body: text('body').notNull(),
    /** Team ids, or 'all'. */
    audience: text('audience', { mode: 'json' }).$type<string[] | 'all'>().notNull(),
    attachmentIds: text('attachment_ids', { mode: 'json' }).$type<string[]>().notNull(),
    sentBy: text('sent_by').references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [index('exercise_inject_idx').on(t.exerciseId, t.createdAt)],
);

export const exerciseNote = sqliteTable(
  'exercise_note',
  {
    id: id(),
    exerciseId: text('exercise_id')
      .notNull()
      .references(() => exercise.id, { onDelete: 'cascade' }),
    turn: integer('turn'),
    moveId: text('move_id').references(() => exerciseMove.id),
    tags: text('tags', { mode: 'json' }).$type<string[]>().notNull(),
    text: text('text').notNull(),
    authorId: text('author_id')
      .notNull()
      .references(() => user.id),
    authorName: text('author_name').notNull(),
    createdAt: createdAt(),
  },
  (t) => [index('exercise_note_idx').on(t.exerciseId, t.createdAt)],
);
