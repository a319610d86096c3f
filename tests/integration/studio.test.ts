/**
 * The Studio's API against the real server and SQLite file: the scenario
 * library, versions and the freeze rule, import and export, briefing
 * documents, who may see what, and analyses in the worker pool.
 */
import { readFileSync } from 'node:fs';
import Ajv2020 from 'ajv/dist/2020.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, signIn, startApp, type App, type Client } from '../support/app';
import { linkIn, waitForMail } from '../support/mail';

let app: App;
let facilitator: Client;
let admin: Client;
let member: Client;

beforeAll(async () => {
  app = await startApp();
  [facilitator, admin, member] = await Promise.all([signIn(app, DEMO.facilitator), signIn(app, DEMO.admin), signIn(app, DEMO.blue)]);
});
afterAll(() => app?.stop());

type Version = { version: { id: string; number: number; status: string; revision: number }; document: any; faults: unknown[]; latest: boolean };

async function create(client: Client, title: string): Promise<{ scenarioId: string; versionId: string }> {
  const { status, body } = await client.json('/api/scenarios', { method: 'POST', json: { title } });
  expect(status).toBe(201);
  return body;
}

async function open(client: Client, scenarioId: string, versionId: string): Promise<Version> {
  const { status, body } = await client.json<Version>(`/api/scenarios/${scenarioId}/versions/${versionId}`);
  expect(status).toBe(200);
  return body;
}

/** The first outcome of a tree, by following the first edge down. */
function firstOutcome(tree: any): any {
  let node = tree;
  while (node.kind !== 'terminal') node = (node.actions ?? node.outcomes)[0].next;
  return node;
}

function withPayoff(document: any, value: number): any {
  const copy = structuredClone(document);
  firstOutcome(copy.tree).payoffs = { blue: value };
  return copy;
}

/** Upload the way the page does: the raw file, its name in the query, and a content type that says nothing. */
async function upload(client: Client, scenarioId: string, versionId: string, name: string, bytes: Uint8Array, teamId?: string) {
  const query = new URLSearchParams({ name, ...(teamId ? { teamId } : {}) });
  return client.json(`/api/scenarios/${scenarioId}/versions/${versionId}/attachments?${query}`, {
    method: 'POST',
    body: Buffer.from(bytes),
    headers: { 'content-type': 'application/octet-stream' },
  });
}

const PNG = Uint8Array.from(Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64'));
const PDF = new TextEncoder().encode('%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n');

/** Read a job's Server-Sent Events until the last one. */
async function events(client: Client, jobId: string): Promise<any[]> {
  const answer = await client.fetch(`/api/scenarios/jobs/${jobId}/events`);
  expect(answer.headers.get('content-type')).toContain('text/event-stream');
  const text = await answer.text();
  return text
    .split('\n\n')
    .filter((chunk) => chunk.startsWith('data: '))
    .map((chunk) => JSON.parse(chunk.slice(6)));
}

async function demoScenario(): Promise<{ id: string; versionId: string }> {
  const { body } = await facilitator.json('/api/scenarios?q=Serrin');
  const entry = body.scenarios.find((s: any) => s.title === 'Serrin Strait');
  return { id: entry.id, versionId: entry.latest.id };
}

describe('studio: the library', () => {
  it('creates a scenario from nothing, as a sound draft with its change log', async () => {
    const { scenarioId, versionId } = await create(facilitator, 'Harbour of Tessel');
    const detail = await facilitator.json(`/api/scenarios/${scenarioId}`);
    expect(detail.body.versions).toMatchObject([{ id: versionId, number: 1, status: 'draft', revision: 0 }]);
    const version = await open(facilitator, scenarioId, versionId);
    expect(version.document).toMatchObject({ format: 'rungwise.scenario/1', title: 'Harbour of Tessel' });
    expect(version.faults).toEqual([]);
    const log = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}/changes`);
    expect(log.body.changes).toMatchObject([{ summary: 'Created from nothing', userName: 'Ines Marlow' }]);
  });

  it('refuses a blank title, naming the field', async () => {
    const { status, body } = await facilitator.json('/api/scenarios', { method: 'POST', json: { title: '  ' } });
    expect(status).toBe(400);
    expect(body.fields).toEqual([{ field: 'title', reason: 'Give the scenario a title' }]);
  });

  it('searches, duplicates and archives', async () => {
    const { scenarioId } = await create(facilitator, 'Quarry Pass standoff');
    const found = await facilitator.json('/api/scenarios?q=quarry%20pass');
    expect(found.body.scenarios.map((s: any) => s.title)).toEqual(['Quarry Pass standoff']);
    expect((await facilitator.json('/api/scenarios?q=strait')).body.scenarios.map((s: any) => s.title)).toContain('Serrin Strait');

    const copy = await facilitator.json(`/api/scenarios/${scenarioId}/duplicate`, { method: 'POST', json: {} });
    expect(copy.status).toBe(201);
    const copied = await open(facilitator, copy.body.scenarioId, copy.body.versionId);
    expect(copied.document.title).toBe('Quarry Pass standoff (copy)');

    expect((await facilitator.json(`/api/scenarios/${scenarioId}`, { method: 'PATCH', json: { archived: true } })).body.scenario.archived).toBe(true);
    expect((await facilitator.json('/api/scenarios?q=quarry')).body.scenarios.map((s: any) => s.title)).toEqual(['Quarry Pass standoff (copy)']);
    expect((await facilitator.json('/api/scenarios?q=quarry&archived=1')).body.scenarios.map((s: any) => s.title)).toEqual(['Quarry Pass standoff']);
    expect((await facilitator.json(`/api/scenarios/${scenarioId}`, { method: 'PATCH', json: { archived: 'yes' } })).status).toBe(400);
  });
});

describe('studio: editing and the freeze rule', () => {
  it('saves an edit as a new revision and logs who changed what', async () => {
    const { scenarioId, versionId } = await create(facilitator, 'Edit me');
    const version = await open(facilitator, scenarioId, versionId);
    const document = { ...withPayoff(version.document, 7), setting: 'A fictional river delta.' };
    const saved = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}`, { method: 'PUT', json: { revision: 0, document } });
    expect(saved.status).toBe(200);
    expect(saved.body).toMatchObject({ versionId, number: 1, revision: 1, startedDraft: false, faults: [] });
    expect(saved.body.summary).toBe('Edited the setting and the tree (2 places)');
    expect(firstOutcome((await open(facilitator, scenarioId, versionId)).document.tree).payoffs).toEqual({ blue: 7 });
    const log = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}/changes`);
    expect(log.body.changes[1]).toMatchObject({ userName: 'Ines Marlow', paths: ['setting', expect.stringMatching(/^tree\..*\.payoffs$/)] });
    // The library's search sees the new setting.
    expect((await facilitator.json('/api/scenarios?q=delta')).body.scenarios.map((s: any) => s.title)).toEqual(['Edit me']);
  });

  it('refuses a save from an out-of-date revision, and a document of the wrong shape, keeping what was there', async () => {
    const { scenarioId, versionId } = await create(facilitator, 'Two editors');
    const version = await open(facilitator, scenarioId, versionId);
    expect((await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}`, { method: 'PUT', json: { revision: 0, document: withPayoff(version.document, 1) } })).status).toBe(200);
    const stale = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}`, { method: 'PUT', json: { revision: 0, document: withPayoff(version.document, 2) } });
    expect(stale.status).toBe(409);
    expect(stale.body.fields).toEqual([{ field: 'revision', reason: 'out of date' }]);

    const broken = { ...version.document, teams: [{ id: 'blue', name: '' }], tree: { kind: 'decision' } };
    const refused = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}`, { method: 'PUT', json: { revision: 1, document: broken } });
    expect(refused.status).toBe(400);
    const fields = refused.body.fields.map((f: any) => f.field);
    expect(fields).toEqual(expect.arrayContaining(['teams', 'teams[0].name', 'teams[0].objectives']));
    expect(firstOutcome((await open(facilitator, scenarioId, versionId)).document.tree).payoffs).toEqual({ blue: 1 });
  });

  it('keeps a draft with faults of meaning, and will not freeze it', async () => {
    const { scenarioId, versionId } = await create(facilitator, 'Faulty');
    const version = await open(facilitator, scenarioId, versionId);
    const document = structuredClone(version.document);
    document.tree.team = 'nobody';
    const saved = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}`, { method: 'PUT', json: { revision: 0, document } });
    expect(saved.status).toBe(200);
    expect(saved.body.faults).toEqual([expect.objectContaining({ path: 'tree.team' })]);
    const freeze = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}/freeze`, { method: 'POST', json: {} });
    expect(freeze.status).toBe(409);
    expect(freeze.body.fields[0].field).toBe('tree.team');
  });

  it('freezes a version an exercise uses; the next edit starts a new draft and the frozen one never changes', async () => {
    const { scenarioId, versionId } = await create(facilitator, 'Frozen ridge');
    const version = await open(facilitator, scenarioId, versionId);
    const exercise = await facilitator.json('/api/exercises', { method: 'POST', json: { scenarioVersionId: versionId, title: 'Ridge run' } });
    expect(exercise.status).toBe(201);
    expect((await open(facilitator, scenarioId, versionId)).version.status).toBe('frozen');

    const saved = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}`, { method: 'PUT', json: { revision: 0, document: withPayoff(version.document, 5) } });
    expect(saved.body).toMatchObject({ number: 2, revision: 1, startedDraft: true });
    expect(saved.body.versionId).not.toBe(versionId);
    expect(firstOutcome((await open(facilitator, scenarioId, versionId)).document.tree).payoffs).not.toEqual({ blue: 5 });
    const draft = await open(facilitator, scenarioId, saved.body.versionId);
    expect(draft.version).toMatchObject({ number: 2, status: 'draft' });
    expect(firstOutcome(draft.document.tree).payoffs).toEqual({ blue: 5 });

    const again = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}`, { method: 'PUT', json: { revision: 0, document: version.document } });
    expect(again.status).toBe(409);
    expect(again.body.error).toContain('Version 2 is newer');
    const log = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${saved.body.versionId}/changes`);
    expect(log.body.changes.map((c: any) => c.summary)).toEqual(['Started from version 1, which is frozen', 'Edited the tree (1 place)']);
  });
});

describe('studio: import and export', () => {
  it('lists every fault of an imported file by path, and imports nothing', async () => {
    const before = (await facilitator.json('/api/scenarios')).body.scenarios.length;
    const demo = JSON.parse(readFileSync('scenarios/serrin-strait.json', 'utf8'));
    const broken = structuredClone(demo);
    broken.teams[0].name = '';
    broken.weights = 'heavy';
    broken.colour = 'blue';
    const shape = await facilitator.json('/api/scenarios', { method: 'POST', json: { document: broken } });
    expect(shape.status).toBe(400);
    expect(shape.body.error).toBe('The file has faults; nothing was imported');
    expect(shape.body.fields.map((f: any) => f.field)).toEqual(expect.arrayContaining(['teams[0].name', 'weights']));

    const unknown = structuredClone(demo);
    unknown.colour = 'blue';
    unknown.teams[1].motto = 'Onward';
    const extra = await facilitator.json('/api/scenarios', { method: 'POST', json: { document: unknown } });
    expect(extra.status).toBe(400);
    expect(extra.body.fields).toEqual([
      { field: 'teams[1].motto', reason: 'is not a field of a Rungwise scenario' },
      { field: 'colour', reason: 'is not a field of a Rungwise scenario' },
    ]);

    const wrongFormat = await facilitator.json('/api/scenarios', { method: 'POST', json: { document: { format: 'other/2', title: 'x' } } });
    expect(wrongFormat.body.fields).toEqual([expect.objectContaining({ field: 'format' })]);
    expect((await facilitator.json('/api/scenarios')).body.scenarios.length).toBe(before);
  });

  it('exports a version as a file that the published schema accepts and that imports back unchanged', async () => {
    const { id, versionId } = await demoScenario();
    const answer = await facilitator.fetch(`/api/scenarios/${id}/versions/${versionId}/export`);
    expect(answer.headers.get('content-disposition')).toBe('attachment; filename="serrin-strait.rungwise.json"');
    const exported = JSON.parse(await answer.text());
    const ajv = new Ajv2020({ allErrors: true, strict: false });
    const schema = JSON.parse(readFileSync('scenarios/schema.json', 'utf8'));
    expect(ajv.validate(schema, exported), JSON.stringify(ajv.errors?.slice(0, 3))).toBe(true);

    const imported = await facilitator.json('/api/scenarios', { method: 'POST', json: { document: exported } });
    expect(imported.status).toBe(201);
    expect(imported.body.notices).toEqual([]);
    const back = await facilitator.fetch(`/api/scenarios/${imported.body.scenarioId}/versions/${imported.body.versionId}/export`);
    expect(JSON.parse(await back.text())).toEqual(exported);
  });
});

describe('studio: briefing documents', () => {
  it('accepts PDF, PNG and JPEG by their content, and refuses other types and files over 20 MB', async () => {
    const { scenarioId, versionId } = await create(facilitator, 'Documents');
    const png = await upload(facilitator, scenarioId, versionId, 'map.png', PNG);
    expect(png.status).toBe(201);
    expect(png.body.attachment).toMatchObject({ filename: 'map.png', contentType: 'image/png', size: PNG.byteLength, teamId: null });
    const pdf = await upload(facilitator, scenarioId, versionId, 'red-brief.pdf', PDF, 'red');
    expect(pdf.status).toBe(201);
    expect(pdf.body.attachments).toEqual([png.body.attachment.id, pdf.body.attachment.id]);

    const disguised = await upload(facilitator, scenarioId, versionId, 'notes.pdf', new TextEncoder().encode('just some text, not a PDF'));
    expect(disguised.status).toBe(415);
    expect(disguised.body.error).toContain('must be PDF, PNG or JPEG');
    const gif = await upload(facilitator, scenarioId, versionId, 'photo.jpg', new TextEncoder().encode('GIF89a\x01\x00\x01\x00\x00\x00\x00;'));
    expect(gif.status).toBe(415);
    expect(gif.body.error).toContain('a GIF file');
    const big = new Uint8Array(21 * 1024 * 1024);
    big.set(PNG);
    const huge = await upload(facilitator, scenarioId, versionId, 'huge.png', big);
    expect(huge.status).toBe(413);
    expect(huge.body.error).toBe('This file is 21.0 MB; briefing documents may be at most 20.0 MB.');
    const noTeam = await upload(facilitator, scenarioId, versionId, 'map.png', PNG, 'purple');
    expect(noTeam).toMatchObject({ status: 400, body: { fields: [{ field: 'teamId' }] } });

    const served = await facilitator.fetch(`/api/attachments/${png.body.attachment.id}`);
    expect(served.status).toBe(200);
    expect(served.headers.get('content-type')).toBe('image/png');
    expect(served.headers.get('x-content-type-options')).toBe('nosniff');
    expect(new Uint8Array(await served.arrayBuffer())).toEqual(PNG);
    const list = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}/attachments`);
    expect(list.body.attachments.map((a: any) => a.filename)).toEqual(['map.png', 'red-brief.pdf']);
  });

  it('serves documents to exercise members only, and a team’s documents to that team and the facilitators', async () => {
    const { scenarioId, versionId } = await create(facilitator, 'Who reads what');
    const general = (await upload(facilitator, scenarioId, versionId, 'map.png', PNG)).body.attachment.id;
    const redOnly = (await upload(facilitator, scenarioId, versionId, 'red.pdf', PDF, 'red')).body.attachment.id;
    const red = await signIn(app, DEMO.red);
    const observer = await signIn(app, DEMO.observer);

    expect((await member.fetch(`/api/attachments/${general}`)).status).toBe(403);
    const exercise = await facilitator.json('/api/exercises', { method: 'POST', json: { scenarioVersionId: versionId, title: 'Reading test' } });
    for (const seat of [
      { email: DEMO.blue, role: 'player', teamId: 'blue' },
      { email: DEMO.red, role: 'player', teamId: 'red' },
      { email: DEMO.observer, role: 'observer' },
    ]) {
      expect((await facilitator.json(`/api/exercises/${exercise.body.id}/roster`, { method: 'POST', json: seat })).status).toBe(201);
    }
    expect((await member.fetch(`/api/attachments/${general}`)).status).toBe(200);
    expect((await observer.fetch(`/api/attachments/${general}`)).status).toBe(200);
    expect((await red.fetch(`/api/attachments/${redOnly}`)).status).toBe(200);
    const refused = await member.json(`/api/attachments/${redOnly}`);
    expect(refused).toEqual({ status: 403, body: { error: 'This document belongs to one team’s brief: only that team and the facilitators see it' } });
    expect((await observer.fetch(`/api/attachments/${redOnly}`)).status).toBe(403);
    expect((await facilitator.fetch(`/api/attachments/${redOnly}`)).status).toBe(200);
    expect((await admin.fetch(`/api/attachments/${redOnly}`)).status).toBe(200);

    // Removing a document from the frozen version starts a draft without it; the exercise keeps it.
    const removed = await facilitator.json(`/api/scenarios/${scenarioId}/versions/${versionId}/attachments/${general}`, { method: 'DELETE', json: {} });
    expect(removed.body).toMatchObject({ startedDraft: true, attachments: [redOnly] });
    expect((await member.fetch(`/api/attachments/${general}`)).status).toBe(200);
  });
});

describe('studio: one author’s scenarios are not another’s', () => {
  it('a member cannot read, edit, list or analyse another’s scenario; another facilitator neither', async () => {
    const { id, versionId } = await demoScenario();
    const version = await open(facilitator, id, versionId);
    expect((await member.json(`/api/scenarios/${id}`)).status).toBe(403);
    expect((await member.json(`/api/scenarios/${id}/versions/${versionId}`)).status).toBe(403);
    const edit = await member.json(`/api/scenarios/${id}/versions/${versionId}`, { method: 'PUT', json: { revision: version.version.revision, document: version.document } });
    expect(edit).toEqual({ status: 403, body: { error: 'Only the scenario’s author may edit it' } });
    expect((await member.json('/api/scenarios', { method: 'POST', json: { title: 'Mine' } })).status).toBe(403);
    expect((await member.json('/api/scenarios')).body.scenarios).toEqual([]);
    expect((await member.json(`/api/scenarios/${id}/analysis`, { method: 'POST', json: { document: version.document, job: { analysis: 'equilibria' } } })).status).toBe(403);
    expect((await member.fetch(`/studio/${id}`)).status).toBe(403);

    const email = 'second.facilitator@rungwise.example';
    expect((await admin.json('/api/invitations', { method: 'POST', json: { email, role: 'facilitator' } })).status).toBe(201);
    const token = new URL(linkIn(await waitForMail(admin, email, /invited/), '/invitation?token=')).searchParams.get('token');
    expect((await admin.json('/api/invitations/accept', { method: 'POST', json: { token, name: 'Sefa Orlen', password: 'a-long-enough-password' } })).status).toBe(201);
    const other = await signIn(app, email, 'a-long-enough-password');
    expect((await other.json(`/api/scenarios/${id}`)).status).toBe(403);
    expect((await other.json('/api/scenarios')).body.scenarios.map((s: any) => s.title)).not.toContain('Serrin Strait');
    expect((await admin.json(`/api/scenarios/${id}`)).status).toBe(200);
  });
});

describe('studio: analyses in the worker pool', () => {
  it('computes the equilibria of the demo with progress over Server-Sent Events', async () => {
    const { id, versionId } = await demoScenario();
    const { document } = await open(facilitator, id, versionId);
    const started = await facilitator.json(`/api/scenarios/${id}/analysis`, { method: 'POST', json: { document, job: { analysis: 'equilibria', maxListed: 3 } } });
    expect(started.status).toBe(202);
    const stream = await events(facilitator, started.body.jobId);
    const last = stream[stream.length - 1];
    expect(last.type).toBe('done');
    expect(last.result.equilibria).toHaveLength(3);
    expect(last.result.count).toBeGreaterThan(1);
    // Ties off the path multiply the strategy profiles, not the ways of playing.
    expect(last.result).toMatchObject({ plays: 1, playsExact: true, distinctPayoffs: 1 });
    expect(last.result.playPayoffs[0].payoffs).toEqual(last.result.equilibria[0].payoffs);
    expect(last.result.equilibria[0].path.length).toBeGreaterThan(2);
    expect((await facilitator.json(`/api/scenarios/jobs/${started.body.jobId}`)).body.type).toBe('done');
    // A job is its starter's only.
    expect((await admin.json(`/api/scenarios/jobs/${started.body.jobId}`)).status).toBe(404);
  });

  it('cancels a long job', async () => {
    const { id, versionId } = await demoScenario();
    const { document } = await open(facilitator, id, versionId);
    const started = await facilitator.json(`/api/scenarios/${id}/analysis`, { method: 'POST', json: { document, job: { analysis: 'monte-carlo', samples: 200_000, seed: 3 } } });
    expect(started.status).toBe(202);
    const cancelled = await facilitator.json(`/api/scenarios/jobs/${started.body.jobId}`, { method: 'DELETE', json: {} });
    expect(cancelled.status).toBe(200);
    const stream = await events(facilitator, started.body.jobId);
    expect(stream[stream.length - 1]).toEqual({ type: 'cancelled' });
  });

  it('refuses to analyse a document with faults, by path', async () => {
    const { id, versionId } = await demoScenario();
    const { document } = await open(facilitator, id, versionId);
    const broken = structuredClone(document);
    broken.tree.team = 'nobody';
    const refused = await facilitator.json(`/api/scenarios/${id}/analysis`, { method: 'POST', json: { document: broken, job: { analysis: 'equilibria' } } });
    expect(refused.status).toBe(400);
    expect(refused.body.fields[0].field).toBe('tree.team');
    const badJob = await facilitator.json(`/api/scenarios/${id}/analysis`, { method: 'POST', json: { document, job: { analysis: 'qre', lambda: -1 } } });
    expect(badJob.body.fields).toEqual([{ field: 'job.lambda', reason: 'lambda must be 0 or more' }]);
  });
});
