/**
 * The report draft as stored Yjs updates. Every update a client sends is one
 * row, written before it is passed on, so a restart loses nothing acknowledged.
 * Compaction replaces the rows of a document by one row holding its merged,
 * garbage-collected state. better-sqlite3 is synchronous, so a compaction and
 * an append in the same process never interleave.
 */
import { prosemirrorJSONToYXmlFragment, yXmlFragmentToProseMirrorRootNode } from '@tiptap/y-tiptap';
import { and, asc, count, eq, lte, max } from 'drizzle-orm';
import * as Y from 'yjs';
import { db, schema } from '../../db/client';
import { REPORT_FIELD, reportSchema, type JSONContent } from './schema';

const { reportUpdate } = schema;

export function appendUpdate(exerciseId: string, update: Uint8Array): void {
  db().insert(reportUpdate).values({ exerciseId, update: Buffer.from(update) }).run();
}

export function storedUpdateCount(exerciseId: string): number {
  return db().select({ n: count() }).from(reportUpdate).where(eq(reportUpdate.exerciseId, exerciseId)).get()?.n ?? 0;
}

export function hasDraft(exerciseId: string): boolean {
  return db().select({ seq: reportUpdate.seq }).from(reportUpdate).where(eq(reportUpdate.exerciseId, exerciseId)).limit(1).get() !== undefined;
}

function rowsUpTo(exerciseId: string, lastSeq?: number): Buffer[] {
  const where = lastSeq === undefined ? eq(reportUpdate.exerciseId, exerciseId) : and(eq(reportUpdate.exerciseId, exerciseId), lte(reportUpdate.seq, lastSeq));
  return db().select({ update: reportUpdate.update }).from(reportUpdate).where(where).orderBy(asc(reportUpdate.seq)).all().map((r) => r.update);
}

/** One Yjs transaction for all rows (Y.mergeUpdates first would be far slower on thousands of small updates). */
function applyAll(doc: Y.Doc, rows: Buffer[]): Y.Doc {
  Y.transact(doc, () => {
    for (const row of rows) Y.applyUpdate(doc, new Uint8Array(row.buffer, row.byteOffset, row.byteLength));
  });
  return doc;
}

/** Apply every stored update to `doc` (a fresh one by default). */
export function loadInto(exerciseId: string, doc = new Y.Doc()): Y.Doc {
  return applyAll(doc, rowsUpTo(exerciseId));
}

/** Replace the stored rows by one merged update; returns how many rows there were. */
export function compact(exerciseId: string): number {
  return db().transaction((tx) => {
    const last = tx.select({ seq: max(reportUpdate.seq) }).from(reportUpdate).where(eq(reportUpdate.exerciseId, exerciseId)).get()?.seq;
    if (last === null || last === undefined) return 0;
    const rows = rowsUpTo(exerciseId, last);
    if (rows.length < 2) return rows.length;
    const merged = applyAll(new Y.Doc(), rows);
    const state = Y.encodeStateAsUpdate(merged);
    merged.destroy();
    tx.delete(reportUpdate).where(and(eq(reportUpdate.exerciseId, exerciseId), lte(reportUpdate.seq, last))).run();
    tx.insert(reportUpdate).values({ exerciseId, update: Buffer.from(state) }).run();
    return rows.length;
  });
}

/** The Yjs update that writes `content` into an empty document. */
export function updateFromJson(content: JSONContent): Uint8Array {
  const doc = new Y.Doc();
  prosemirrorJSONToYXmlFragment(reportSchema(), content, doc.getXmlFragment(REPORT_FIELD));
  const update = Y.encodeStateAsUpdate(doc);
  doc.destroy();
  return update;
}

/**
 * Store the generated first draft unless the document already has content.
 * Only one of two racing callers writes (the check and the insert share a transaction).
 */
export function ensureDraft(exerciseId: string, generate: () => JSONContent): boolean {
  if (hasDraft(exerciseId)) return false;
  const update = updateFromJson(generate());
  return db().transaction(() => {
    if (hasDraft(exerciseId)) return false;
    appendUpdate(exerciseId, update);
    return true;
  });
}

/** The document as Tiptap JSON, read through the report schema: elements that do not fit it are left out. */
export function docToJson(doc: Y.Doc): JSONContent {
  return yXmlFragmentToProseMirrorRootNode(doc.getXmlFragment(REPORT_FIELD), reportSchema()).toJSON() as JSONContent;
}

/** The stored draft as Tiptap JSON. */
export function draftJson(exerciseId: string): JSONContent {
  const doc = loadInto(exerciseId);
  const json = docToJson(doc);
  doc.destroy();
  return json;
}
