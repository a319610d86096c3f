/** The report store on a real SQLite file: appends, merging, and the one-writer rule for the first draft. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as Y from 'yjs';

const dir = mkdtempSync(join(tmpdir(), 'rungwise-report-store-'));
process.env.DATABASE_URL = join(dir, 'store.db');

const { closeDatabase, db, migrateDatabase, schema } = await import('../../src/db/client');
const store = await import('../../src/lib/report/store');

let exerciseId: string;

beforeAll(() => {
  migrateDatabase();
  const userId = crypto.randomUUID();
  const now = new Date();
  db().insert(schema.user).values({ id: userId, name: 'Store Test', email: 'store@rungwise.example', createdAt: now, updatedAt: now }).run();
  const scenarioId = crypto.randomUUID();
  const versionId = crypto.randomUUID();
  exerciseId = crypto.randomUUID();
  db().insert(schema.scenario).values({ id: scenarioId, ownerId: userId, title: 'Store' }).run();
  db().insert(schema.scenarioVersion).values({ id: versionId, scenarioId, number: 1, document: {}, createdBy: userId }).run();
  db().insert(schema.exercise).values({ id: exerciseId, scenarioVersionId: versionId, title: 'Store', createdBy: userId }).run();
});
afterAll(() => {
  closeDatabase();
  rmSync(dir, { recursive: true, force: true });
});

const draft = (title: string) => ({ type: 'doc', content: [{ type: 'heading', attrs: { level: 1 }, content: [{ type: 'text', text: title }] }, { type: 'paragraph' }] });

describe('report store', () => {
  it('stores the first draft once, whoever asks first', () => {
    expect(store.ensureDraft(exerciseId, () => draft('First'))).toBe(true);
    expect(store.ensureDraft(exerciseId, () => draft('Second'))).toBe(false);
    expect(store.storedUpdateCount(exerciseId)).toBe(1);
    expect(store.draftJson(exerciseId).content?.[0]?.content?.[0]?.text).toBe('First');
  });

  it('merges the updates of two concurrent editors into one row that loads the same document', () => {
    const a = store.loadInto(exerciseId);
    const b = store.loadInto(exerciseId);
    a.on('update', (u: Uint8Array) => store.appendUpdate(exerciseId, u));
    b.on('update', (u: Uint8Array) => store.appendUpdate(exerciseId, u));
    const textOf = (doc: Y.Doc) => (doc.getXmlFragment('default').get(0) as Y.XmlElement).get(0) as Y.XmlText;
    for (let k = 0; k < 50; k++) {
      textOf(a).insert(0, 'a');
      textOf(b).insert(textOf(b).length, 'b');
    }
    textOf(a).delete(0, 10);
    const before = JSON.stringify(store.draftJson(exerciseId));
    expect(store.storedUpdateCount(exerciseId)).toBe(102);
    expect(store.compact(exerciseId)).toBe(102);
    expect(store.storedUpdateCount(exerciseId)).toBe(1);
    expect(JSON.stringify(store.draftJson(exerciseId))).toBe(before);
    expect(before).toContain(`${'a'.repeat(40)}First${'b'.repeat(50)}`);
  });
});
