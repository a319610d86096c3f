/**
 * The scenario library: scenarios, their versions and each version's change log.
 *
 * The freeze rule: a version an exercise uses is frozen and never changes
 * again. Every edit goes to the scenario's latest version; when that one is
 * frozen, the edit starts a new draft from a copy of its document.
 */
import { and, asc, desc, eq, inArray, isNotNull, isNull, max, or, sql } from 'drizzle-orm';
import { db, schema, type Db } from '../../db/client';
import { allowed, type Actor, type ScenarioContext } from '../access';
import { authorize, HttpError } from '../http';
import { changedPaths, describeChange } from './diff';
import { checkDraft, checkImport, faultFields, partName, retitled, summaryOf, titleOf, type Fault, type ScenarioDocument } from './document';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** The database handle or an open transaction. */
export type Runner = Db | Tx;

export type ScenarioRow = typeof schema.scenario.$inferSelect;
export type VersionRow = typeof schema.scenarioVersion.$inferSelect;

// ---------------------------------------------------------------------------
// Who may do what: the context the access rules need.

/** The scenario ids of exercises the actor facilitates. */
function facilitatedScenarioIds(actorId: string, only?: string): Set<string> {
  const rows = db()
    .selectDistinct({ scenarioId: schema.scenarioVersion.scenarioId })
    .from(schema.membership)
    .innerJoin(schema.exercise, eq(schema.exercise.id, schema.membership.exerciseId))
    .innerJoin(schema.scenarioVersion, eq(schema.scenarioVersion.id, schema.exercise.scenarioVersionId))
    .where(
      and(
        eq(schema.membership.userId, actorId),
        eq(schema.membership.role, 'facilitator'),
        only ? eq(schema.scenarioVersion.scenarioId, only) : undefined,
      ),
    )
    .all();
  return new Set(rows.map((r) => r.scenarioId));
}

export function scenarioContext(actor: Actor, scenario: Pick<ScenarioRow, 'id' | 'ownerId'>): ScenarioContext {
  return { ownerId: scenario.ownerId, facilitatesAnExercise: facilitatedScenarioIds(actor.id, scenario.id).has(scenario.id) };
}

/** The scenario, if it exists (404) and the actor may do `action` on it (403). */
export function scenarioFor(actor: Actor, scenarioId: string, action: 'scenario.read' | 'scenario.edit' | 'exercise.create'): ScenarioRow {
  const row = db().select().from(schema.scenario).where(eq(schema.scenario.id, scenarioId)).get();
  if (!row) throw new HttpError(404, 'No scenario with this id');
  authorize(actor, action, scenarioContext(actor, row));
  return row;
}

function versionOf(runner: Runner, scenarioId: string, versionId: string): VersionRow {
  const row = runner.select().from(schema.scenarioVersion).where(eq(schema.scenarioVersion.id, versionId)).get();
  if (!row || row.scenarioId !== scenarioId) throw new HttpError(404, 'This scenario has no version with this id');
  return row;
}

function latestVersion(runner: Runner, scenarioId: string): VersionRow {
  const row = runner
    .select()
    .from(schema.scenarioVersion)
    .where(eq(schema.scenarioVersion.scenarioId, scenarioId))
    .orderBy(desc(schema.scenarioVersion.number))
    .limit(1)
    .get();
  if (!row) throw new Error(`scenario ${scenarioId} has no version`);
  return row;
}

// ---------------------------------------------------------------------------
// The library list.

export type LibraryEntry = {
  id: string;
  title: string;
  summary: string;
  ownerName: string;
  mine: boolean;
  canEdit: boolean;
  archived: boolean;
  updatedAt: string;
  latest: { id: string; number: number; status: 'draft' | 'frozen' };
  versions: number;
};

const escapeLike = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);

export function listScenarios(actor: Actor, options: { query?: string; archived?: boolean } = {}): LibraryEntry[] {
  const terms = (options.query ?? '').trim().split(/\s+/).filter(Boolean);
  const matches = terms.map((term) => {
    const pattern = `%${escapeLike(term)}%`;
    return or(sql`${schema.scenario.title} like ${pattern} escape '\\'`, sql`${schema.scenario.summary} like ${pattern} escape '\\'`);
  });
  const rows = db()
    .select({ scenario: schema.scenario, ownerName: schema.user.name })
    .from(schema.scenario)
    .innerJoin(schema.user, eq(schema.user.id, schema.scenario.ownerId))
    .where(and(options.archived ? isNotNull(schema.scenario.archivedAt) : isNull(schema.scenario.archivedAt), ...matches))
    .orderBy(desc(schema.scenario.updatedAt))
    .all();
  const facilitated = facilitatedScenarioIds(actor.id);
  const readable = rows.filter(({ scenario }) =>
    allowed(actor, 'scenario.read', { ownerId: scenario.ownerId, facilitatesAnExercise: facilitated.has(scenario.id) }),
  );
  const latest = latestVersions(readable.map((r) => r.scenario.id));
  return readable.map(({ scenario, ownerName }) => {
    const version = latest.get(scenario.id)!;
    const ctx = { ownerId: scenario.ownerId, facilitatesAnExercise: facilitated.has(scenario.id) };
    return {
      id: scenario.id,
      title: scenario.title,
      summary: scenario.summary,
      ownerName,
      mine: scenario.ownerId === actor.id,
      canEdit: allowed(actor, 'scenario.edit', ctx),
      archived: scenario.archivedAt !== null,
      updatedAt: scenario.updatedAt.toISOString(),
      latest: { id: version.id, number: version.number, status: version.status },
      versions: version.number,
    };
  });
}

function latestVersions(scenarioIds: string[]): Map<string, VersionRow> {
  if (scenarioIds.length === 0) return new Map();
  const newest = db()
    .select({ scenarioId: schema.scenarioVersion.scenarioId, latestNumber: max(schema.scenarioVersion.number).as('latest_number') })
    .from(schema.scenarioVersion)
    .where(inArray(schema.scenarioVersion.scenarioId, scenarioIds))
    .groupBy(schema.scenarioVersion.scenarioId)
    .as('newest');
  const rows = db()
    .select({ version: schema.scenarioVersion })
    .from(schema.scenarioVersion)
    .innerJoin(newest, and(eq(newest.scenarioId, schema.scenarioVersion.scenarioId), eq(newest.latestNumber, schema.scenarioVersion.number)))
    .all();
  return new Map(rows.map(({ version }) => [version.scenarioId, version]));
}

// ---------------------------------------------------------------------------
// Creating: from a document (blank, imported or copied).

export type Created = { scenarioId: string; versionId: string };

/** Check a draft at the edge: shape faults refuse it (400, every fault by path); faults of meaning come back. */
export function acceptDraft(raw: unknown): { document: ScenarioDocument; faults: Fault[] } {
  const checked = checkDraft(raw);
  if (!checked.ok) throw new HttpError(400, 'The scenario document has faults; nothing was saved', faultFields(checked.faults));
  return { document: checked.document, faults: checked.faults };
}

export type Imported = Created & { notices: string[] };

/** Import a scenario file. Document references cannot travel in a file, so they are dropped (and said so). */
export function importScenario(actor: Actor, raw: unknown): Imported {
  authorize(actor, 'scenario.create', {});
  const checked = checkImport(raw);
  if (!checked.ok) throw new HttpError(400, 'The file has faults; nothing was imported', faultFields(checked.faults));
  const dropped = checked.document.attachments.length;
  const document = { ...checked.document, attachments: [] };
  const notices = dropped > 0 ? [`${dropped === 1 ? 'One briefing document was' : `${dropped} briefing documents were`} left out: files do not travel in a scenario file, so upload them again.`] : [];
  return { ...createScenario(actor, document, 'Imported from a file'), notices };
}

export function createScenario(actor: Actor, document: ScenarioDocument, how: string, copy?: (tx: Tx, scenarioId: string) => ScenarioDocument): Created {
  authorize(actor, 'scenario.create', {});
  const scenarioId = crypto.randomUUID();
  const versionId = crypto.randomUUID();
  db().transaction((tx) => {
    tx.insert(schema.scenario)
      .values({ id: scenarioId, ownerId: actor.id, title: titleOf(document), summary: summaryOf(document) })
      .run();
    const stored = copy ? copy(tx, scenarioId) : document;
    tx.insert(schema.scenarioVersion).values({ id: versionId, scenarioId, number: 1, document: stored, createdBy: actor.id }).run();
    logChange(tx, versionId, actor.id, how, []);
  });
  return { scenarioId, versionId };
}

/** A new scenario of the actor's own from the latest version of another; its documents are copied too. */
export function duplicateScenario(actor: Actor, scenarioId: string): Created {
  authorize(actor, 'scenario.create', {});
  const source = scenarioFor(actor, scenarioId, 'scenario.read');
  const version = latestVersion(db(), scenarioId);
  const document = retitled(version.document as ScenarioDocument, `${source.title} (copy)`);
  return createScenario(actor, document, `Duplicated from “${source.title}”, version ${version.number}`, (tx, newId) => ({
    ...document,
    attachments: copyAttachments(tx, document.attachments, newId, actor.id),
  }));
}

/** Copy attachment rows (not files) to another scenario; returns the new ids in the same order. */
function copyAttachments(tx: Tx, ids: string[], toScenarioId: string, by: string): string[] {
  if (ids.length === 0) return [];
  const rows = new Map(tx.select().from(schema.attachment).where(inArray(schema.attachment.id, ids)).all().map((r) => [r.id, r]));
  return ids.flatMap((id) => {
    const row = rows.get(id);
    if (!row) return [];
    const copy = { ...row, id: crypto.randomUUID(), scenarioId: toScenarioId, uploadedBy: by, createdAt: new Date() };
    tx.insert(schema.attachment).values(copy).run();
    return [copy.id];
  });
}

export function setArchived(actor: Actor, scenarioId: string, archived: boolean): void {
  scenarioFor(actor, scenarioId, 'scenario.edit');
  db()
    .update(schema.scenario)
    .set({ archivedAt: archived ? new Date() : null })
    .where(eq(schema.scenario.id, scenarioId))
    .run();
}

// ---------------------------------------------------------------------------
// Reading.

export type VersionSummary = {
  id: string;
  number: number;
  status: 'draft' | 'frozen';
  revision: number;
  createdAt: string;
  createdByName: string;
  frozenAt: string | null;
  basedOnNumber: number | null;
  exercises: number;
};

export function scenarioDetail(actor: Actor, scenarioId: string) {
  const scenario = scenarioFor(actor, scenarioId, 'scenario.read');
  const owner = db().select({ name: schema.user.name }).from(schema.user).where(eq(schema.user.id, scenario.ownerId)).get();
  return {
    scenario: {
      id: scenario.id,
      title: scenario.title,
      ownerName: owner?.name ?? '',
      archived: scenario.archivedAt !== null,
      updatedAt: scenario.updatedAt.toISOString(),
      canEdit: allowed(actor, 'scenario.edit', scenarioContext(actor, scenario)),
    },
    versions: versionSummaries(scenarioId),
  };
}

function versionSummaries(scenarioId: string): VersionSummary[] {
  const rows = db()
    .select({
      version: schema.scenarioVersion,
      createdByName: schema.user.name,
      exercises: sql<number>`(select count(*) from ${schema.exercise} where ${schema.exercise.scenarioVersionId} = ${schema.scenarioVersion.id})`,
    })
    .from(schema.scenarioVersion)
    .innerJoin(schema.user, eq(schema.user.id, schema.scenarioVersion.createdBy))
    .where(eq(schema.scenarioVersion.scenarioId, scenarioId))
    .orderBy(desc(schema.scenarioVersion.number))
    .all();
  const numberOf = new Map(rows.map((r) => [r.version.id, r.version.number]));
  return rows.map(({ version, createdByName, exercises }) => ({
    id: version.id,
    number: version.number,
    status: version.status,
    revision: version.revision,
    createdAt: version.createdAt.toISOString(),
    createdByName,
    frozenAt: version.frozenAt?.toISOString() ?? null,
    basedOnNumber: version.basedOnId ? (numberOf.get(version.basedOnId) ?? null) : null,
    exercises: Number(exercises),
  }));
}

export function versionView(actor: Actor, scenarioId: string, versionId: string) {
  scenarioFor(actor, scenarioId, 'scenario.read');
  const version = versionOf(db(), scenarioId, versionId);
  const checked = checkDraft(version.document);
  return {
    version: versionSummaries(scenarioId).find((v) => v.id === versionId)!,
    latest: latestVersion(db(), scenarioId).id === versionId,
    document: version.document as ScenarioDocument,
    faults: checked.faults,
    ladderDraft: version.ladderDraft ?? null,
  };
}

/** The document of a version, for the exercise, the review and the report. */
export function versionDocument(versionId: string, runner: Runner = db()): ScenarioDocument {
  const row = runner
    .select({ document: schema.scenarioVersion.document })
    .from(schema.scenarioVersion)
    .where(eq(schema.scenarioVersion.id, versionId))
    .get();
  if (!row) throw new HttpError(404, 'No scenario version with this id');
  return row.document as ScenarioDocument;
}

export type ChangeEntry = { id: string; summary: string; paths: string[]; userName: string; at: string };

export function changeLog(actor: Actor, scenarioId: string, versionId: string): ChangeEntry[] {
  scenarioFor(actor, scenarioId, 'scenario.read');
  versionOf(db(), scenarioId, versionId);
  return db()
    .select({ change: schema.scenarioChange, userName: schema.user.name })
    .from(schema.scenarioChange)
    .innerJoin(schema.user, eq(schema.user.id, schema.scenarioChange.userId))
    .where(eq(schema.scenarioChange.versionId, versionId))
    .orderBy(asc(schema.scenarioChange.createdAt), asc(sql`"scenario_change".rowid`))
    .all()
    .map(({ change, userName }) => ({ id: change.id, summary: change.summary, paths: change.paths, userName, at: change.createdAt.toISOString() }));
}

// ---------------------------------------------------------------------------
// Editing, and the freeze rule.

export function logChange(runner: Runner, versionId: string, userId: string, summary: string, paths: string[]): void {
  runner.insert(schema.scenarioChange).values({ id: crypto.randomUUID(), versionId, userId, summary, paths }).run();
}

/**
 * The draft an edit goes to. `openVersionId` is the version the author has open:
 * it must be the latest. A frozen latest version gets a new draft copied from it.
 */
export function workingDraft(tx: Tx, actor: Actor, scenarioId: string, openVersionId: string): { draft: VersionRow; started: boolean } {
  const open = versionOf(tx, scenarioId, openVersionId);
  const latest = latestVersion(tx, scenarioId);
  if (latest.id !== open.id) {
    throw new HttpError(409, `Version ${latest.number} is newer than version ${open.number}, which you have open. Open version ${latest.number} to keep editing.`);
  }
  if (open.status === 'draft') return { draft: open, started: false };
  const draft = {
    id: crypto.randomUUID(),
    scenarioId,
    number: open.number + 1,
    document: open.document,
    createdBy: actor.id,
    basedOnId: open.id,
  };
  tx.insert(schema.scenarioVersion).values(draft).run();
  logChange(tx, draft.id, actor.id, `Started from version ${open.number}, which is frozen`, []);
  return { draft: latestVersion(tx, scenarioId), started: true };
}

/** Store the draft's new document: a new revision and the scenario's new title, summary and time. */
export function writeDraft(tx: Tx, draft: VersionRow, document: ScenarioDocument, ladderDraft: unknown = draft.ladderDraft): number {
  const revision = draft.revision + 1;
  const now = new Date();
  tx.update(schema.scenarioVersion)
    .set({ revision, updatedAt: now, document, ladderDraft: ladderDraft ?? null })
    .where(eq(schema.scenarioVersion.id, draft.id))
    .run();
  tx.update(schema.scenario)
    .set({ updatedAt: now, title: titleOf(document), summary: summaryOf(document) })
    .where(eq(schema.scenario.id, draft.scenarioId))
    .run();
  return revision;
}

export type Saved = { versionId: string; number: number; revision: number; startedDraft: boolean; faults: Fault[]; summary: string };

export function saveDocument(
  actor: Actor,
  scenarioId: string,
  openVersionId: string,
  input: { revision: number; document: unknown; ladderDraft?: unknown },
): Saved {
  scenarioFor(actor, scenarioId, 'scenario.edit');
  const { document, faults } = acceptDraft(input.document);
  return db().transaction((tx) => {
    checkAttachmentIds(tx, scenarioId, document.attachments);
    const { draft, started } = workingDraft(tx, actor, scenarioId, openVersionId);
    if (!started && draft.revision !== input.revision) {
      throw new HttpError(
        409,
        `Someone saved this draft after you opened it (it is at revision ${draft.revision}, you started from ${input.revision}). Your edits are still in this page: export them as JSON, then reload.`,
        [{ field: 'revision', reason: 'out of date' }],
      );
    }
    const paths = changedPaths(draft.document, document);
    const summary = describeChange(paths, partName);
    const revision = writeDraft(tx, draft, document, input.ladderDraft ?? null);
    if (paths.length > 0) logChange(tx, draft.id, actor.id, summary, paths);
    return { versionId: draft.id, number: draft.number, revision, startedDraft: started, faults, summary };
  });
}

function checkAttachmentIds(tx: Tx, scenarioId: string, ids: string[]): void {
  if (ids.length === 0) return;
  const known = new Set(
    tx.select({ id: schema.attachment.id }).from(schema.attachment).where(and(eq(schema.attachment.scenarioId, scenarioId), inArray(schema.attachment.id, ids))).all().map((r) => r.id),
  );
  const faults = ids.flatMap((id, i) => (known.has(id) ? [] : [{ field: `attachments[${i}]`, reason: `no briefing document "${id}" in this scenario` }]));
  if (faults.length > 0) throw new HttpError(400, 'The document lists briefing documents this scenario does not have', faults);
}

/**
 * Freeze a version for good (the live exercise calls this when an exercise is
 * created on it; the Studio when the author freezes it). A version with faults
 * cannot be frozen. Freezing a frozen version does nothing.
 */
export function freezeVersion(tx: Runner, versionId: string, frozenBy?: string): VersionRow {
  const row = tx.select().from(schema.scenarioVersion).where(eq(schema.scenarioVersion.id, versionId)).get();
  if (!row) throw new HttpError(404, 'No scenario version with this id');
  if (row.status === 'frozen') return row;
  const { faults } = checkDraft(row.document);
  if (faults.length > 0) {
    throw new HttpError(409, `Version ${row.number} has ${faults.length === 1 ? 'a fault' : `${faults.length} faults`}; fix it in the Studio before an exercise can use it`, faultFields(faults));
  }
  const frozenAt = new Date();
  tx.update(schema.scenarioVersion).set({ status: 'frozen', frozenAt }).where(eq(schema.scenarioVersion.id, versionId)).run();
  if (frozenBy) logChange(tx, versionId, frozenBy, 'Frozen: exercises may now use this version, and edits start a new draft', []);
  return { ...row, status: 'frozen', frozenAt };
}

export function freezeByAuthor(actor: Actor, scenarioId: string, versionId: string): VersionRow {
  scenarioFor(actor, scenarioId, 'scenario.edit');
  versionOf(db(), scenarioId, versionId);
  return db().transaction((tx) => freezeVersion(tx, versionId, actor.id));
}
