import { extractText, getDocumentProxy } from 'unpdf';
import { describe, expect, it } from 'vitest';
import { firstDraft, SECTION_TITLES } from '../../../src/lib/report/draft';
import { reportHtml } from '../../../src/lib/report/render/html';
import { CAUTION, EXERCISE_MARKING, type IssuedReport } from '../../../src/lib/report/render/issued';
import { reportPdf } from '../../../src/lib/report/render/pdf';
import { splitBySubset } from '../../../src/lib/report/render/fonts';
import type { JSONContent } from '../../../src/lib/report/schema';
import { reviewPlay } from '../../../src/lib/review';
import { LADDER, ladderVariant, playRecord } from '../review/fixtures';

const record = playRecord(LADDER, [['b', 'Raise'], ['w', 'Calm'], ['r', 'Match']], {
  title: 'Harbour drill',
  notes: [{ id: 'o1', turn: 3, moveId: 'm3', tags: ['escalation risk'], text: 'Red matched the closure within a minute — Łódź desk agreed', authorName: 'Oren Hale', at: '2026-01-05T09:21:00.000Z' }],
});
const review = reviewPlay(LADDER, record);
const draft = firstDraft({ review, scenarioTitle: 'Two harbours', startedAt: record.startedAt, endedAt: record.endedAt });

function issued(content: JSONContent): IssuedReport {
  return { title: 'After-action report: Harbour drill', exerciseTitle: 'Harbour drill', number: 2, issuedAt: new Date('2026-01-06T10:00:00Z'), issuedByName: 'Ines Marlow', content };
}

async function pdfText(pdf: Buffer): Promise<{ pages: number; text: string }> {
  const doc = await getDocumentProxy(new Uint8Array(pdf));
  const { totalPages, text } = await extractText(doc, { mergePages: true });
  return { pages: totalPages, text: text.replace(/\s+/g, ' ') };
}

describe('the first draft', () => {
  it('has every section, the analysis as data, and empty places for people to write', () => {
    const headings = draft.content!.filter((n) => n.type === 'heading').map((n) => n.content?.[0]?.text);
    expect(headings).toEqual(['After-action report: Harbour drill', ...Object.values(SECTION_TITLES)]);
    const kinds = draft.content!.filter((n) => n.type?.startsWith('analysis')).map((n) => [n.type, JSON.parse(n.attrs!.spec).title]);
    expect(kinds).toEqual([
      ['analysisTable', 'Moves against the equilibrium'],
      ['analysisFigure', 'Escalation by turn: actual play and the subgame-perfect path'],
      ['analysisFigure', 'Regret by turn: continuation value given up under the authored payoffs'],
      ['analysisTable', 'How well each team’s play is explained'],
      ['analysisTable', 'Where equilibrium play would have ended'],
    ]);
    expect(JSON.stringify(draft)).toContain('Red matched the closure within a minute');
    expect(JSON.stringify(draft)).toContain('These comparisons follow from the payoffs the scenario assumed');
  });

  it('says how many equilibrium plays there are, the strategy profiles after them', () => {
    expect(JSON.stringify(draft)).not.toContain('strategy profiles');
    // Red's tie lies off the path (Blue holds for 3): one play, two profiles.
    const tied = ladderVariant({ hold: [3, 1], match: [-2, -1] });
    const tiedRecord = playRecord(tied, [['b', 'Hold']]);
    const tiedDraft = firstDraft({ review: reviewPlay(tied, tiedRecord), scenarioTitle: 'Two harbours', startedAt: tiedRecord.startedAt, endedAt: tiedRecord.endedAt });
    const summary = JSON.stringify(tiedDraft);
    expect(summary).toContain('subgame-perfect play ends at “Talks”. The scenario has one equilibrium play (2 strategy profiles that differ only at moves off the path).');
  });
});

describe('PDF export (pdfkit with the shipped Libre Franklin files, read back with unpdf)', () => {
  it('contains its sections, the EXERCISE marking on every page and the caution', async () => {
    const { pages, text } = await pdfText(await reportPdf(issued(draft)));
    for (const title of Object.values(SECTION_TITLES)) expect(text).toContain(title);
    expect(text).toContain('Moves against the equilibrium');
    expect(text).toContain('Harbour closure'); // a rung name drawn as chart text
    expect(text).toContain('version 2, issued 6 January 2026 by Ines Marlow');
    expect(text).toContain(CAUTION.slice(0, 60));
    expect(text.split(EXERCISE_MARKING).length - 1).toBe(2 * pages);
    expect(text).toContain(`Page ${pages} of ${pages}`);
    expect(text).toContain('Łódź'); // from the latin-ext file
  });

  it('draws the charts as vector paths, not images', async () => {
    const pdf = (await reportPdf(issued(draft))).toString('latin1');
    expect(pdf).not.toMatch(/\/Subtype\s*\/Image/);
    expect(pdf).toMatch(/\/FontFile2/);
  });

  it('survives a figure whose data an editor broke, saying so', async () => {
    const broken: JSONContent = { type: 'doc', content: [{ type: 'heading', attrs: { level: 1 }, content: [{ type: 'text', text: 'Broken' }] }, { type: 'analysisFigure', attrs: { spec: '{"kind":"escalation"' } }] };
    const { text } = await pdfText(await reportPdf(issued(broken)));
    expect(text).toContain('This figure could not be read from the document.');
  });
});

describe('HTML export', () => {
  const html = reportHtml(issued(draft));

  it('is one file with the fonts inlined, the marking top and bottom, the caution, and charts as inline SVG', () => {
    expect(html.split(EXERCISE_MARKING).length - 1).toBe(2);
    expect(html).toContain(CAUTION.replace('’', '&#39;').slice(0, 40).replace('&#39;', '’'));
    expect(html).toMatch(/@font-face\{font-family:'Libre Franklin'.*src:url\(data:font\/woff2;base64,/);
    expect((html.match(/<svg /g) ?? []).length).toBe(2);
    expect(html).not.toMatch(/<script|https?:\/\/(?!www\.w3\.org)/);
  });

  it('escapes whatever people typed', () => {
    const typed: JSONContent = { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: '<script>alert(1)</script>' }, { type: 'text', text: 'link', marks: [{ type: 'link', attrs: { href: 'javascript:alert(1)' } }] }] }] };
    const out = reportHtml(issued(typed));
    expect(out).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(out).not.toContain('javascript:');
  });
});

describe('font subsets (the unicode-range of @fontsource/libre-franklin)', () => {
  it('sends each character to the subset that covers it', () => {
    expect(splitBySubset('Ab Łódź')).toEqual([
      { subset: 'latin', text: 'Ab ' },
      { subset: 'latin-ext', text: 'Ł' },
      { subset: 'latin', text: 'ód' },
      { subset: 'latin-ext', text: 'ź' },
    ]);
    expect(splitBySubset('漢')).toEqual([{ subset: 'latin', text: '\uFFFD' }]);
  });
});
