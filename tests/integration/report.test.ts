import Database from 'better-sqlite3';
import { extractText, getDocumentProxy } from 'unpdf';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, DEMO, signIn, startApp, type App, type Client } from '../support/app';
import { waitForMail } from '../support/mail';
import * as Y from 'yjs';
import { appendParagraph, eventually, openReport, titleText } from '../support/report';

let app: App;
let admin: Client;
let facilitator: Client;
let observer: Client;
let player: Client;
let sponsor: Client;
let exerciseId: string;
let scenarioId: string;

async function signInEveryone(): Promise<void> {
  admin = await signIn(app, DEMO.admin);
  facilitator = await signIn(app, DEMO.facilitator);
  observer = await signIn(app, DEMO.observer);
  player = await signIn(app, DEMO.blue);
  sponsor = await signIn(app, DEMO.sponsor);
}

async function pdfText(bytes: ArrayBuffer | Uint8Array): Promise<string> {
  const { text } = await extractText(await getDocumentProxy(new Uint8Array(bytes)), { mergePages: true });
  return text.replace(/\s+/g, ' ');
}

beforeAll(async () => {
  app = await startApp();
  await signInEveryone();
  const { body } = await facilitator.json<{ exercises: { id: string; state: string }[] }>('/api/exercises');
  exerciseId = body.exercises.find((e) => e.state === 'ended')!.id;
});
afterAll(() => app?.stop());

describe('report: the seeded draft, issued and sent', () => {
  it('has the demo report issued as version 1 and sent to the sponsor with the PDF attached', async () => {
    const { body } = await facilitator.json(`/api/exercises/${exerciseId}/report`);
    expect(body.versions.map((v: { number: number }) => v.number)).toEqual([1]);
    expect(body.dispatches[0]).toMatchObject({ versionNumber: 1, recipients: [DEMO.sponsor], sentByName: 'Ines Marlow' });
    const mail = await waitForMail(admin, DEMO.sponsor, /version 1/);
    expect(mail.attachments).toEqual([expect.objectContaining({ contentType: 'application/pdf', filename: expect.stringMatching(/-v1\.pdf$/) })]);
  });
});

describe('report: editing together over y-websocket', () => {
  it('lets two editors type at once and converge on the same document', async () => {
    const a = await openReport(app, facilitator, exerciseId);
    const b = await openReport(app, observer, exerciseId);
    try {
      expect(a.text()).toEqual(b.text());
      expect(a.text()).toContain('Hot wash');
      // Both type at the same moment: into the same line, and each a new paragraph.
      titleText(a.doc).insert(0, 'ALPHA ');
      titleText(b.doc).insert(titleText(b.doc).length, ' OMEGA');
      appendParagraph(a.doc, 'Finding typed by the facilitator');
      appendParagraph(b.doc, 'Finding typed by the observer');
      await eventually(() => a.text() === b.text() && a.text().includes('typed by the facilitator') && a.text().includes('typed by the observer'), 'both documents to converge');
      const title = a.json().content[0].content[0].text as string;
      expect(title.startsWith('ALPHA ')).toBe(true);
      expect(title.endsWith(' OMEGA')).toBe(true);
    } finally {
      a.close();
      b.close();
    }
  });

  it('shows each editor the others’ names, as the server knows them', async () => {
    const a = await openReport(app, facilitator, exerciseId);
    const b = await openReport(app, observer, exerciseId);
    try {
      a.provider.awareness.setLocalStateField('user', { name: 'Somebody Else', color: '#935b17' });
      await eventually(() => [...b.provider.awareness.getStates().values()].some((s) => (s as { user?: { name: string } }).user?.name === 'Ines Marlow'), 'the facilitator’s name at the observer');
      expect([...b.provider.awareness.getStates().values()].map((s) => (s as { user?: { name: string } }).user?.name)).not.toContain('Somebody Else');
    } finally {
      a.close();
      b.close();
    }
  });

  it('keeps every acknowledged edit across a kill and restart of the server', async () => {
    const a = await openReport(app, facilitator, exerciseId);
    appendParagraph(a.doc, 'Written just before the crash');
    const b = await openReport(app, observer, exerciseId);
    await eventually(() => b.text().includes('Written just before the crash'), 'the edit to reach the other editor');
    a.close();
    b.close();
    await app.kill();
    await app.restart();
    await signInEveryone(); // the sessions are in SQLite too, but sign in afresh for the tests that follow
    const c = await openReport(app, facilitator, exerciseId);
    try {
      expect(c.text()).toContain('Written just before the crash');
      expect(c.text()).toContain('typed by the observer');
    } finally {
      c.close();
    }
  });
});

describe('report: storage', () => {
  const storedRows = () => {
    const file = new Database(app.databasePath, { readonly: true, fileMustExist: true });
    try {
      return (file.prepare('select count(*) as n from report_update where exercise_id = ?').get(exerciseId) as { n: number }).n;
    } finally {
      file.close();
    }
  };

  it('stores every keystroke, merges the rows now and then, and into one when the last editor leaves', async () => {
    const editor = await openReport(app, facilitator, exerciseId);
    const before = storedRows();
    const paragraph = new (await import('yjs')).XmlText();
    const { XmlElement } = await import('yjs');
    const element = new XmlElement('paragraph');
    element.insert(0, [paragraph]);
    const fragment = editor.doc.getXmlFragment('default');
    fragment.insert(fragment.length, [element]);
    for (let k = 0; k < 620; k++) paragraph.insert(paragraph.length, 'abcdefghij'[k % 10]!);
    const watcher = await openReport(app, observer, exerciseId);
    await eventually(() => watcher.text().includes('abcdefghij'.repeat(62)), 'all 620 keystrokes at the other editor');
    expect(storedRows()).toBeLessThan(before + 620); // merged once on the way (every 500 updates)
    expect(storedRows()).toBeGreaterThan(1);
    editor.close();
    watcher.close();
    await eventually(() => storedRows() === 1, 'one merged row after the last editor left');
    const again = await openReport(app, observer, exerciseId);
    try {
      expect(again.text()).toContain('abcdefghij'.repeat(62));
    } finally {
      again.close();
    }
  });
});

describe('report: who may join the document', () => {
  it('refuses the socket before it opens to the signed-out, sponsors, outsiders and players by default', async () => {
    await expect(anonymous(app).socket(`/ws/report/${exerciseId}`)).rejects.toMatchObject({ status: 401 });
    await expect(sponsor.socket(`/ws/report/${exerciseId}`)).rejects.toMatchObject({ status: 403 });
    await expect(player.socket(`/ws/report/${exerciseId}`)).rejects.toMatchObject({ status: 403 });
    await expect(admin.socket(`/ws/report/${exerciseId}`)).rejects.toMatchObject({ status: 403 });
    await expect(facilitator.socket('/ws/report/no-such-exercise')).rejects.toMatchObject({ status: 403 });
  });

  it('lets players read and comment when the facilitator allows it, and drops their changes to the text', async () => {
    const allow = await facilitator.json(`/api/exercises/${exerciseId}/intents`, { method: 'POST', json: { key: `allow-comments-${Date.now()}`, intent: { kind: 'settings', patch: { playersMayComment: true } } } });
    expect(allow.status).toBe(200);
    const editor = await openReport(app, facilitator, exerciseId);
    const reader = await openReport(app, player, exerciseId);
    try {
      expect(reader.text()).toEqual(editor.text());
      appendParagraph(reader.doc, 'A player tries to write');
      appendParagraph(editor.doc, 'The facilitator writes after that');
      await eventually(() => reader.text().includes('The facilitator writes after that'), 'the editor’s text at the reader');
      expect(editor.text()).not.toContain('A player tries to write');
      const comment = await player.json(`/api/exercises/${exerciseId}/report/comments`, { method: 'POST', json: { body: 'Turn 3 needs the envoy inject', quote: 'Stand aside' } });
      expect(comment.status).toBe(201);
      expect((await player.json(`/api/exercises/${exerciseId}/report/versions`, { method: 'POST', json: {} })).status).toBe(403);
    } finally {
      editor.close();
      reader.close();
    }
    const fresh = await openReport(app, observer, exerciseId);
    try {
      expect(fresh.text()).not.toContain('A player tries to write');
    } finally {
      fresh.close();
    }
  });
});

describe('report: issue, export, send', () => {
  it('issues the draft as version 2, frozen with its date and author', async () => {
    const issued = await facilitator.json(`/api/exercises/${exerciseId}/report/versions`, { method: 'POST', json: {} });
    expect(issued.status).toBe(201);
    expect(issued.body.version).toMatchObject({ number: 2, issuedByName: 'Ines Marlow', title: expect.stringMatching(/^ALPHA After-action report/) });
    const editor = await openReport(app, facilitator, exerciseId);
    appendParagraph(editor.doc, 'Typed after version 2 was issued');
    await new Promise((r) => setTimeout(r, 300));
    editor.close();
    const { body } = await sponsor.json(`/api/exercises/${exerciseId}/report/versions/2`);
    expect(body.version.html).toContain('Written just before the crash');
    expect(body.version.html).not.toContain('Typed after version 2 was issued');
  });

  it('exports the issued version as PDF with its sections, the marking and the caution', async () => {
    const answer = await sponsor.fetch(`/api/exercises/${exerciseId}/report/versions/2.pdf`);
    expect(answer.status).toBe(200);
    expect(answer.headers.get('content-type')).toBe('application/pdf');
    const text = await pdfText(await answer.arrayBuffer());
    for (const section of ['Summary', 'Hot wash', 'Timeline', 'Play against the equilibrium', 'Observer notes', 'Findings', 'Recommendations']) expect(text).toContain(section);
    expect(text).toContain('Written just before the crash');
    expect(text).toContain('The scenario has one equilibrium play (294,912 strategy profiles that differ only at moves off the path).');
    expect(text).toContain('EXERCISE · EXERCISE · EXERCISE');
    expect(text).toContain('follows from the payoffs assumed in the scenario');
    expect(text).toContain('version 2, issued');
  });

  it('exports it as one HTML file with the marking and the caution', async () => {
    const answer = await sponsor.fetch(`/api/exercises/${exerciseId}/report/versions/2.html`);
    expect(answer.headers.get('content-type')).toBe('text/html; charset=utf-8');
    expect(answer.headers.get('content-security-policy')).toContain("default-src 'none'");
    const html = await answer.text();
    expect(html).toContain('EXERCISE · EXERCISE · EXERCISE');
    expect(html).toContain('follows from the payoffs assumed in the scenario');
    expect(html).toMatch(/<svg [^>]*aria-label="Escalation by turn/);
  });

  it('sends version 2 to sponsors with the PDF attached and keeps a record of the send', async () => {
    const sent = await facilitator.json(`/api/exercises/${exerciseId}/report/versions/2/send`, {
      method: 'POST',
      json: { to: [DEMO.sponsor, 'Deputy.Director@ministry.example'], note: 'Version 2, with the crash paragraph.' },
    });
    expect(sent).toMatchObject({ status: 201, body: { sent: { version: 2, to: [DEMO.sponsor, 'deputy.director@ministry.example'] } } });
    const mail = await waitForMail(admin, 'deputy.director@ministry.example', /version 2/);
    expect(mail.subject).toContain('EXERCISE');
    expect(mail.text).toContain('Version 2, with the crash paragraph.');
    expect(mail.attachments).toHaveLength(1);
    const attachment = await admin.fetch(`/api/outbox/${mail.id}/attachments/0`);
    expect(attachment.headers.get('content-type')).toBe('application/pdf');
    expect(await pdfText(await attachment.arrayBuffer())).toContain('Written just before the crash');
    const { body } = await facilitator.json(`/api/exercises/${exerciseId}/report`);
    expect(body.dispatches.at(-1)).toMatchObject({ versionNumber: 2, recipients: [DEMO.sponsor, 'deputy.director@ministry.example'], note: 'Version 2, with the crash paragraph.', sentByName: 'Ines Marlow' });
  });
});

describe('report and review: refusals and bad input over HTTP', () => {
  it('lets sponsors read issued versions only', async () => {
    expect((await sponsor.json(`/api/exercises/${exerciseId}/report/versions`)).status).toBe(200);
    expect((await sponsor.json(`/api/exercises/${exerciseId}/report/comments`)).status).toBe(403);
    expect((await sponsor.json(`/api/exercises/${exerciseId}/review`)).status).toBe(403);
    const issue = await sponsor.json(`/api/exercises/${exerciseId}/report/versions`, { method: 'POST', json: {} });
    expect(issue).toEqual({ status: 403, body: { error: "Only the exercise's facilitators may do this" } });
    expect((await sponsor.json(`/api/exercises/${exerciseId}/report/versions/2/send`, { method: 'POST', json: { to: [DEMO.sponsor], note: 'x' } })).status).toBe(403);
    const page = await sponsor.fetch(`/exercises/${exerciseId}/report`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('data-testid="issued-version"');
  });

  it('keeps issuing and sending to facilitators, and everything from outsiders', async () => {
    expect((await observer.json(`/api/exercises/${exerciseId}/report/versions`, { method: 'POST', json: {} })).status).toBe(403);
    expect((await player.json(`/api/exercises/${exerciseId}/report/versions/1.pdf`)).status).toBe(403);
    expect((await admin.json(`/api/exercises/${exerciseId}/report`)).body).toEqual({ error: 'You are not part of this exercise' });
    expect((await anonymous(app).json(`/api/exercises/${exerciseId}/report`)).status).toBe(401);
    expect((await admin.fetch(`/exercises/${exerciseId}/review`)).status).toBe(403);
  });

  it('answers bad input with the field and the reason', async () => {
    const noNote = await facilitator.json(`/api/exercises/${exerciseId}/report/versions/2/send`, { method: 'POST', json: { to: ['not-an-address'], note: '' } });
    expect(noNote.status).toBe(400);
    expect(noNote.body.fields.map((f: { field: string }) => f.field).sort()).toEqual(['note', 'to.0']);
    expect((await facilitator.json(`/api/exercises/${exerciseId}/report/versions/zero.pdf`)).status).toBe(400);
    expect((await facilitator.json(`/api/exercises/${exerciseId}/report/versions/99`)).body).toEqual({ error: 'This report has no version 99' });
    expect((await facilitator.json(`/api/exercises/${exerciseId}/review/nonsense.csv`)).status).toBe(404);
    const empty = await player.json(`/api/exercises/${exerciseId}/report/comments`, { method: 'POST', json: { body: '   ' } });
    expect(empty.body.fields).toEqual([{ field: 'body', reason: 'write the comment' }]);
  });
});

describe('review over HTTP', () => {
  it('gives facilitators and observers the review and its CSV tables', async () => {
    const { status, body } = await observer.json(`/api/exercises/${exerciseId}/review`);
    expect(status).toBe(200);
    expect(body.review.moves.length).toBeGreaterThan(3);
    expect(body.review.moves.some((m: { deviated: boolean }) => m.deviated)).toBe(true);
    const csv = await observer.fetch(`/api/exercises/${exerciseId}/review/moves.csv`);
    expect(csv.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    const bytes = new Uint8Array(await csv.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]); // the byte-order mark spreadsheets look for
    const lines = new TextDecoder().decode(bytes).split('\r\n');
    expect(lines[0]).toBe('step,turn,mover,move,kind,equilibrium action,deviated,regret,QRE probability,rung after,equilibrium rung,confidence,rationale,adjudication reason,node,at');
    expect(lines).toHaveLength(body.review.moves.length + 2);
  });

  it('reviews an exercise that has not started yet as empty, with the equilibrium ahead', async () => {
    const { body } = await facilitator.json<{ exercises: { id: string; state: string }[] }>('/api/exercises');
    const waiting = body.exercises.find((e) => e.state === 'briefing')!.id;
    const review = await facilitator.json(`/api/exercises/${waiting}/review`);
    expect(review.status).toBe(200);
    expect(review.body.review.moves).toEqual([]);
    expect(review.body.review.equilibrium.end.terminal).toBe(true);
    expect(review.body.review.equilibrium).toMatchObject({ count: 294912, countExact: true, plays: 1, playsExact: true, distinctPayoffs: 1 });
  });

  it('compares the runs of the scenario', async () => {
    scenarioId = (await facilitator.json(`/api/exercises/${exerciseId}/review`)).body.scenarioId;
    const { status, body } = await facilitator.json(`/api/runs/${scenarioId}`);
    expect(status).toBe(200);
    expect(body.overview.runs.map((r: { exerciseId: string }) => r.exerciseId)).toContain(exerciseId);
    expect(body.overview.rungs.reduce((s: number, r: { total: number }) => s + r.total, 0)).toBeGreaterThan(0);
    expect((await facilitator.fetch(`/api/runs/${scenarioId}/rungs.csv`)).status).toBe(200);
    expect((await player.json(`/api/runs/${scenarioId}`)).status).toBe(403);
  });
});

describe('report: writing the generated sections again', () => {
  type Sections = { sections: { key: string; title: string; state: string }[]; rewritten?: string[] };
  const url = () => `/api/exercises/${exerciseId}/report/generated`;
  const stateOf = (body: Sections, key: string) => body.sections.find((s) => s.key === key)?.state;
  const rewrite = (sections: unknown, client = facilitator) => client.json<Sections>(url(), { method: 'POST', json: { sections } });
  async function lateNote(text: string): Promise<void> {
    const added = await observer.json(`/api/exercises/${exerciseId}/intents`, { method: 'POST', json: { key: `late-note-${crypto.randomUUID()}`, intent: { kind: 'note', turn: null, moveId: null, tags: ['good practice'], text } } });
    expect(added, JSON.stringify(added.body)).toMatchObject({ status: 200 });
  }
  const occurrences = (haystack: string, needle: string) => haystack.split(needle).length - 1;

  it('rewrites a section the record has moved past, with nobody in the document, and stores it', async () => {
    const note = `Noted after the draft was written ${crypto.randomUUID()}`;
    await lateNote(note);
    const before = await facilitator.json<Sections>(url());
    expect(before.status).toBe(200);
    expect(stateOf(before.body, 'notes')).toBe('outdated');
    expect(before.body.sections.map((s) => s.title)).toEqual(['Summary', 'Timeline', 'Play against the equilibrium', 'Observer notes']);
    const answer = await rewrite(['notes']);
    expect(answer.status).toBe(200);
    expect(answer.body.rewritten).toEqual(['notes']);
    expect(stateOf(answer.body, 'notes')).toBe('current');
    const reader = await openReport(app, observer, exerciseId);
    try {
      expect(occurrences(reader.text(), note)).toBe(1);
      expect(reader.text()).toContain('Written just before the crash'); // typed by hand earlier: kept
    } finally {
      reader.close();
    }
    expect((await rewrite(['notes'])).body.rewritten).toEqual([]);
  });

  it('rewrites only the chosen sections in front of the people editing, and keeps what they typed elsewhere', async () => {
    const editor = await openReport(app, facilitator, exerciseId);
    try {
      const note = `Noted while the report was open ${crypto.randomUUID()}`;
      await lateNote(note);
      appendParagraph(editor.doc, 'Typed into the last section while the notes were rewritten');
      await eventually(() => storedText().includes('Typed into the last section'), 'the typing to be stored');
      const answer = await rewrite(['notes', 'timeline']);
      expect(answer.status).toBe(200);
      expect(answer.body.rewritten).toEqual(['notes']); // the timeline already matched the record
      await eventually(() => editor.text().includes(note), 'the rewritten notes at the open editor');
      expect(occurrences(editor.text(), note)).toBe(1);
      expect(editor.text()).toContain('Typed into the last section while the notes were rewritten');
    } finally {
      editor.close();
    }
  });

  it('leaves a section whose heading was renamed alone and says so', async () => {
    const editor = await openReport(app, facilitator, exerciseId);
    try {
      const fragment = editor.doc.getXmlFragment('default');
      const heading = fragment.toArray().find((n) => n instanceof Y.XmlElement && n.nodeName === 'heading' && JSON.stringify(n.toJSON()).includes('Observer notes')) as Y.XmlElement;
      (heading.get(0) as Y.XmlText).insert(0, 'What the ');
      await eventually(() => storedText().includes('What the Observer notes'), 'the renamed heading to be stored');
      await lateNote('A note for a section that is not there any more');
      const status = await facilitator.json<Sections>(url());
      expect(stateOf(status.body, 'notes')).toBe('missing');
      const before = editor.text();
      expect((await rewrite(['notes'])).body.rewritten).toEqual([]);
      await new Promise((r) => setTimeout(r, 300));
      expect(editor.text()).toBe(before);
    } finally {
      editor.close();
    }
  });

  it('refuses players, sponsors, outsiders and the signed-out, and names the field of bad input', async () => {
    for (const client of [player, sponsor, admin]) {
      expect((await client.json(url())).status).toBe(403);
      expect((await rewrite(['summary'], client)).status).toBe(403);
    }
    expect((await anonymous(app).json(url(), { method: 'POST', json: { sections: ['summary'] } })).status).toBe(401);
    const writtenByPeople = await rewrite(['hotWash']);
    expect(writtenByPeople.status).toBe(400);
    expect(writtenByPeople.body).toMatchObject({ fields: [{ field: 'sections.0', reason: expect.stringContaining('summary, timeline, comparison, notes') }] });
    expect((await rewrite([])).body).toMatchObject({ fields: [{ field: 'sections', reason: 'choose at least one section' }] });
    expect((await facilitator.json(`/api/exercises/no-such-exercise/report/generated`)).status).toBe(404);
  });

  /** The draft as stored in SQLite, read through a fresh Yjs document. */
  function storedText(): string {
    const file = new Database(app.databasePath, { readonly: true, fileMustExist: true });
    try {
      const rows = file.prepare('select "update" from report_update where exercise_id = ? order by seq').all(exerciseId) as { update: Buffer }[];
      const doc = new Y.Doc();
      for (const row of rows) Y.applyUpdate(doc, new Uint8Array(row.update));
      const text = JSON.stringify(doc.getXmlFragment('default').toJSON());
      doc.destroy();
      return text;
    } finally {
      file.close();
    }
  }
});
