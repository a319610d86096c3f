import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseScenario } from '../../../src/lib/scenario';
import { engineJob } from '../../../src/lib/studio/analysis';
import { blankScenario, checkDraft, checkImport, exportFileName, exportText } from '../../../src/lib/studio/document';
import { checkUpload, MAX_ATTACHMENT_BYTES } from '../../../src/lib/studio/files';
import { HttpError } from '../../../src/lib/http';

const demo = () => JSON.parse(readFileSync('scenarios/serrin-strait.json', 'utf8'));

describe('studio: scenario documents', () => {
  it('starts a new scenario as a sound document with a ladder that built its tree', () => {
    const blank = blankScenario('Harbour');
    expect(parseScenario(blank)).toMatchObject({ ok: true });
    expect(blank.tree.id).toBe('n');
    expect(exportFileName(blank)).toBe('harbour.rungwise.json');
    expect(JSON.parse(exportText(blank))).toEqual(blank);
  });

  it('keeps a draft with faults of meaning, refuses one of the wrong shape', () => {
    const draft = blankScenario('Draft');
    const wrongTeam = { ...draft, tree: { ...draft.tree, team: 'nobody' } };
    const kept = checkDraft(wrongTeam);
    expect(kept.ok).toBe(true);
    expect(kept.faults.map((f) => f.path)).toEqual(['tree.team']);
    const refused = checkDraft({ ...draft, teams: 'two' });
    expect(refused.ok).toBe(false);
    expect(refused.faults.map((f) => f.path)).toContain('teams');
  });

  it('accepts the demo file, and names unknown fields and a foreign format on import', () => {
    expect(checkImport(demo()).ok).toBe(true);
    const extra = demo();
    extra.teams[0].flag = 'blue';
    extra.ladder.rungs[2].colour = 'grey';
    expect(checkImport(extra)).toEqual({
      ok: false,
      faults: [
        { path: 'teams[0].flag', message: 'is not a field of a Rungwise scenario' },
        { path: 'ladder.rungs[2].colour', message: 'is not a field of a Rungwise scenario' },
      ],
    });
    const foreign = checkImport({ ...demo(), format: 'rungwise.scenario/2' });
    expect(foreign.ok).toBe(false);
    expect(!foreign.ok && foreign.faults[0]!.path).toBe('format');
  });

  it('turns a Studio request into the engine job on the open document', () => {
    const scenario = parseScenario(demo());
    if (!scenario.ok) throw new Error('demo invalid');
    const mc = engineJob(scenario.scenario, { analysis: 'monte-carlo', samples: 100, seed: 1 });
    expect(mc).toMatchObject({ analysis: 'monte-carlo', samples: 100, seed: 1 });
    expect(mc.analysis === 'monte-carlo' && mc.ranges[0]).toEqual({
      terminalId: scenario.scenario.payoffRanges[0]!.nodeId,
      team: scenario.scenario.payoffRanges[0]!.team,
      distribution: scenario.scenario.payoffRanges[0]!.distribution,
    });
    expect(() => engineJob({ ...scenario.scenario, marks: [] }, { analysis: 'credibility' })).toThrow(HttpError);
  });
});

describe('studio: briefing document types', () => {
  const bytes = (text: string) => new TextEncoder().encode(text);
  const PNG = Uint8Array.from(Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64'));
  // The JPEG start of image and a JFIF application segment (ISO/IEC 10918-1, JFIF 1.02).
  const JPEG = Uint8Array.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00, 0xff, 0xd9]);

  it('reads the type from the content', async () => {
    expect(await checkUpload(PNG)).toBe('image/png');
    expect(await checkUpload(JPEG)).toBe('image/jpeg');
    expect(await checkUpload(bytes('%PDF-1.7\n%%EOF\n'))).toBe('application/pdf');
  });

  it('refuses other types, empty files and files over 20 MB, saying why', async () => {
    await expect(checkUpload(bytes('GIF89a\x01\x00\x01\x00'))).rejects.toMatchObject({ status: 415, message: expect.stringContaining('a GIF file (image/gif)') });
    await expect(checkUpload(bytes('a plain text file named brief.pdf'))).rejects.toMatchObject({ status: 415, message: expect.stringContaining('not a file type we recognise') });
    await expect(checkUpload(new Uint8Array())).rejects.toMatchObject({ status: 400 });
    const big = new Uint8Array(MAX_ATTACHMENT_BYTES + 1);
    big.set(PNG);
    await expect(checkUpload(big)).rejects.toMatchObject({ status: 413 });
  });
});
