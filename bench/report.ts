/**
 * `npm run bench:report`: the after-action report's two heavy paths.
 *  1. PDF export of a report of at least 30 pages (text, tables, vector charts).
 *  2. Loading a draft stored as 10,000 Yjs updates (typing, one update per keystroke),
 *     then the same draft after compaction.
 * Runs on a temporary SQLite file; prints a table of medians.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import * as Y from 'yjs';

const dir = mkdtempSync(join(tmpdir(), 'rungwise-bench-report-'));
process.env.DATABASE_URL = join(dir, 'bench.db');

const { closeDatabase, db, migrateDatabase, schema } = await import('../src/db/client');
const { appendUpdate, compact, docToJson, loadInto, storedUpdateCount, updateFromJson } = await import('../src/lib/report/store');
const { firstDraft } = await import('../src/lib/report/draft');
const { reportPdf } = await import('../src/lib/report/render/pdf');
const { REPORT_FIELD } = await import('../src/lib/report/schema');
const { reviewPlay } = await import('../src/lib/review');
const { scenarioGame } = await import('../src/lib/scenario');
const { demoScenario } = await import('../server/seed/demo-scenario');

type Row = { task: string; median: string; detail: string };
const rows: Row[] = [];

function median(times: number[]): number {
  const sorted = [...times].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

async function timed<T>(runs: number, task: () => Promise<T> | T): Promise<{ ms: number; last: T }> {
  const times: number[] = [];
  let last!: T;
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    last = await task();
    times.push(performance.now() - start);
  }
  return { ms: median(times), last };
}

/** A long report: the generated draft of a played demo line, with the written sections repeated until it runs past 30 pages. */
function longReport() {
  const scenario = demoScenario();
  const game = scenarioGame(scenario);
  const moves = [];
  let node = game.root;
  for (let turn = 1; node.kind !== 'terminal'; turn++) {
    const edges = node.kind === 'decision' ? node.actions : node.outcomes;
    const edge = edges[turn % edges.length]!;
    moves.push({ id: `m${turn}`, turn, nodeId: node.id, teamId: node.kind === 'decision' ? node.team : null, label: edge.label, kind: node.kind === 'decision' ? 'ladder' : 'chance', rationale: null, confidence: null, proposal: null, reason: null, draw: null, submittedByName: null, at: new Date(Date.UTC(2026, 2, 1, 9, turn * 7)).toISOString() } as const);
    node = edge.next;
  }
  const record = { exerciseId: 'bench', title: 'Bench exercise', state: 'ended', scenarioId: 's', scenarioVersionId: 'v', document: scenario, moves, currentNodeId: node.id, notes: [], injects: [], startedAt: null, endedAt: null } as const;
  const review = reviewPlay(game, { ...record, moves: [...record.moves], notes: [], injects: [] });
  const draft = firstDraft({ review, scenarioTitle: scenario.title, startedAt: null, endedAt: null });
  const prose = 'The teams read the coast guard escorts as a test of resolve rather than a signal of restraint, and the mediator’s offer arrived a turn too late to change that reading. ';
  const written = Array.from({ length: 11 }, (_, k) => [
    { type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text: `Finding ${k + 1}` }] },
    ...Array.from({ length: 6 }, () => ({ type: 'paragraph', content: [{ type: 'text', text: prose.repeat(4) }] })),
    { type: 'bulletList', content: Array.from({ length: 5 }, (_, i) => ({ type: 'listItem', content: [{ type: 'paragraph', content: [{ type: 'text', text: `Recommendation ${k + 1}.${i + 1}: ${prose}` }] }] })) },
    ...draft.content!.filter((n) => n.type === 'analysisFigure' || n.type === 'analysisTable'),
  ]);
  return { ...draft, content: [...draft.content!, ...written.flat()] };
}

async function pdfBench(): Promise<void> {
  const content = longReport();
  const report = { title: 'After-action report: Bench exercise', exerciseTitle: 'Bench exercise', number: 1, issuedAt: new Date(), issuedByName: 'Bench', content };
  const { ms, last } = await timed(5, () => reportPdf(report));
  const pages = (last.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length;
  if (pages < 30) throw new Error(`the bench report has only ${pages} pages`);
  rows.push({ task: 'PDF export, whole report', median: `${ms.toFixed(0)} ms`, detail: `${pages} pages, ${(last.length / 1024).toFixed(0)} KiB, ${(ms / pages).toFixed(1)} ms a page` });
}

function seedExercise(): string {
  const userId = crypto.randomUUID();
  const now = new Date();
  db().insert(schema.user).values({ id: userId, name: 'Bench', email: 'bench@rungwise.example', createdAt: now, updatedAt: now }).run();
  const scenarioId = crypto.randomUUID();
  const versionId = crypto.randomUUID();
  const exerciseId = crypto.randomUUID();
  db().insert(schema.scenario).values({ id: scenarioId, ownerId: userId, title: 'Bench' }).run();
  db().insert(schema.scenarioVersion).values({ id: versionId, scenarioId, number: 1, document: {}, createdBy: userId }).run();
  db().insert(schema.exercise).values({ id: exerciseId, scenarioVersionId: versionId, title: 'Bench', createdBy: userId }).run();
  return exerciseId;
}

/** 10,000 keystrokes as 10,000 stored updates, as the collaboration server stores them. */
function storeTyping(exerciseId: string, keystrokes: number): void {
  const doc = new Y.Doc();
  Y.applyUpdate(doc, updateFromJson({ type: 'doc', content: [{ type: 'heading', attrs: { level: 1 }, content: [{ type: 'text', text: 'Bench' }] }, { type: 'paragraph' }] }));
  appendUpdate(exerciseId, Y.encodeStateAsUpdate(doc));
  doc.on('update', (update: Uint8Array) => appendUpdate(exerciseId, update));
  const paragraph = doc.getXmlFragment(REPORT_FIELD).get(1) as Y.XmlElement;
  const text = new Y.XmlText();
  paragraph.insert(0, [text]);
  const sentence = 'Blue held the escorts back while Red kept shadowing the survey ships. ';
  db().transaction(() => {
    for (let k = 0; k < keystrokes - 2; k++) {
      if (k % 97 === 96) text.delete(text.length - 1, 1);
      else text.insert(text.length, sentence[k % sentence.length]!);
    }
  });
}

async function loadBench(): Promise<void> {
  const exerciseId = seedExercise();
  storeTyping(exerciseId, 10_000);
  const stored = storedUpdateCount(exerciseId);
  const load = await timed(7, () => {
    const doc = loadInto(exerciseId);
    const json = docToJson(doc);
    doc.destroy();
    return json;
  });
  const chars = JSON.stringify(load.last).length;
  rows.push({ task: 'Load draft from stored updates', median: `${load.ms.toFixed(1)} ms`, detail: `${stored} updates → Tiptap JSON of ${chars} characters` });
  const merge = await timed(1, () => compact(exerciseId));
  rows.push({ task: 'Compact those updates', median: `${merge.ms.toFixed(1)} ms`, detail: `${merge.last} rows → ${storedUpdateCount(exerciseId)}` });
  const after = await timed(7, () => {
    const doc = loadInto(exerciseId);
    const json = docToJson(doc);
    doc.destroy();
    return json;
  });
  if (JSON.stringify(after.last) !== JSON.stringify(load.last)) throw new Error('compaction changed the document');
  rows.push({ task: 'Load the compacted draft', median: `${after.ms.toFixed(1)} ms`, detail: 'same document' });
}

try {
  migrateDatabase();
  await pdfBench();
  await loadBench();
  const width = (key: keyof Row) => Math.max(key.length, ...rows.map((r) => r[key].length));
  const line = (r: Row) => `${r.task.padEnd(width('task'))}  ${r.median.padStart(width('median'))}  ${r.detail}`;
  console.log(line({ task: 'task', median: 'median', detail: 'detail' }));
  for (const r of rows) console.log(line(r));
} finally {
  closeDatabase();
  rmSync(dir, { recursive: true, force: true });
}
