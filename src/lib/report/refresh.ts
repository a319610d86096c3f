/**
 * Bringing the generated sections of a report draft up to date with the record
 * of play. The first draft is generated once; play may go on after that (a
 * report opened during a live exercise), notes get written, the exercise ends.
 * Summary, Timeline, Play against the equilibrium and Observer notes can then
 * be written again from a fresh review, each on its own. The sections people
 * write (Hot wash, Findings, Recommendations, and any they add) are never
 * touched. A section is found by its level-2 heading: one whose heading was
 * renamed or removed is left as it is and reported as not found.
 */
import { prosemirrorJSONToYXmlFragment } from '@tiptap/y-tiptap';
import { z } from 'zod';
import * as Y from 'yjs';
import { HttpError } from '../http';
import { exerciseReview } from './analysis';
import { firstDraft, SECTION_TITLES } from './draft';
import { ensureReportDraft } from './draft-store';
import { openReportDoc } from './open-docs';
import { REPORT_FIELD, reportSchema, type JSONContent } from './schema';
import { appendUpdate, docToJson, loadInto } from './store';

export const GENERATED_SECTIONS = ['summary', 'timeline', 'comparison', 'notes'] as const;
export type GeneratedSection = (typeof GENERATED_SECTIONS)[number];

/** current: the draft says what the record says now; outdated: the record has moved on (or someone edited the section); missing: no heading of that name. */
export type SectionState = 'current' | 'outdated' | 'missing';
export type SectionStatus = { key: GeneratedSection; title: string; state: SectionState };

export const refreshInput = z.object({
  sections: z.array(z.enum(GENERATED_SECTIONS, { message: `one of ${GENERATED_SECTIONS.join(', ')}` })).min(1, 'choose at least one section').max(GENERATED_SECTIONS.length),
});

type Block = { heading: { level: number; text: string } | null };
type Range = { start: number; end: number };

/** Where each level-2 section's body lies among the top-level blocks (the first section of a title wins). */
function sectionRanges(blocks: Block[]): Map<string, Range> {
  const ranges = new Map<string, Range>();
  blocks.forEach((block, index) => {
    if (block.heading?.level !== 2 || ranges.has(block.heading.text)) return;
    let end = index + 1;
    while (end < blocks.length && !(blocks[end]!.heading && blocks[end]!.heading!.level <= 2)) end++;
    ranges.set(block.heading.text, { start: index + 1, end });
  });
  return ranges;
}

const jsonText = (node: JSONContent): string => (node.text ?? '') + (node.content ?? []).map(jsonText).join('');
const jsonBlock = (node: JSONContent): Block => ({ heading: node.type === 'heading' ? { level: Number(node.attrs?.level), text: jsonText(node).trim() } : null });

function yText(node: Y.XmlElement | Y.XmlText | Y.XmlHook): string {
  if (node instanceof Y.XmlText) return (node.toDelta() as { insert: unknown }[]).map((d) => (typeof d.insert === 'string' ? d.insert : '')).join('');
  if (node instanceof Y.XmlElement) return node.toArray().map(yText).join('');
  return '';
}
const yBlock = (node: Y.XmlElement | Y.XmlText | Y.XmlHook): Block => ({
  heading: node instanceof Y.XmlElement && node.nodeName === 'heading' ? { level: Number(node.getAttribute('level')), text: yText(node).trim() } : null,
});

/** The generated sections as they would be written now; refuses (409) when the review cannot be made. */
async function freshSections(exerciseId: string): Promise<Map<GeneratedSection, JSONContent[]>> {
  let draft: JSONContent;
  try {
    const { review, record, scenarioTitle } = await exerciseReview(exerciseId);
    draft = firstDraft({ review, scenarioTitle, startedAt: record.startedAt, endedAt: record.endedAt });
  } catch (error) {
    throw new HttpError(409, `The sections cannot be generated: ${error instanceof Error ? error.message : String(error)}`);
  }
  // Through the schema, so that the comparison with the stored draft sees the same shape.
  const blocks = (reportSchema().nodeFromJSON(draft).toJSON() as JSONContent).content ?? [];
  const ranges = sectionRanges(blocks.map(jsonBlock));
  return new Map(GENERATED_SECTIONS.map((key) => [key, sliceOf(blocks, ranges.get(SECTION_TITLES[key]))]));
}

const sliceOf = (blocks: JSONContent[], range: Range | undefined) => (range ? blocks.slice(range.start, range.end) : []);

function statuses(doc: Y.Doc, fresh: Map<GeneratedSection, JSONContent[]>): SectionStatus[] {
  const blocks = docToJson(doc).content ?? [];
  const ranges = sectionRanges(blocks.map(jsonBlock));
  return GENERATED_SECTIONS.map((key) => {
    const title = SECTION_TITLES[key];
    const range = ranges.get(title);
    if (!range) return { key, title, state: 'missing' };
    const same = JSON.stringify(sliceOf(blocks, range)) === JSON.stringify(fresh.get(key));
    return { key, title, state: same ? 'current' : 'outdated' };
  });
}

/**
 * Run `use` on the report's Yjs document: the copy a room holds open when someone
 * is editing (so the change reaches them at once and is stored by the room), else
 * the stored one, whose new update is appended here. Synchronous from lookup to write.
 */
function withReportDoc<T>(exerciseId: string, use: (doc: Y.Doc) => T): T {
  const open = openReportDoc(exerciseId);
  if (open) return use(open);
  const doc = loadInto(exerciseId);
  doc.on('update', (update: Uint8Array) => appendUpdate(exerciseId, update));
  try {
    return use(doc);
  } finally {
    doc.destroy();
  }
}

/** Yjs nodes for `blocks`, not yet part of any document. */
function yNodes(blocks: JSONContent[]): (Y.XmlElement | Y.XmlText)[] {
  if (blocks.length === 0) return [];
  const scratch = new Y.Doc();
  const fragment = scratch.getXmlFragment(REPORT_FIELD);
  prosemirrorJSONToYXmlFragment(reportSchema(), { type: 'doc', content: blocks }, fragment);
  const nodes = fragment.toArray().map((node) => (node as Y.XmlElement | Y.XmlText).clone());
  scratch.destroy();
  return nodes;
}

export async function generatedSectionStatus(exerciseId: string): Promise<SectionStatus[]> {
  await ensureReportDraft(exerciseId);
  const fresh = await freshSections(exerciseId);
  return withReportDoc(exerciseId, (doc) => statuses(doc, fresh));
}

/** Write the chosen sections again from the record; returns what each section says afterwards and which were rewritten. */
export async function refreshGeneratedSections(exerciseId: string, chosen: GeneratedSection[]): Promise<{ sections: SectionStatus[]; rewritten: GeneratedSection[] }> {
  await ensureReportDraft(exerciseId);
  const fresh = await freshSections(exerciseId);
  return withReportDoc(exerciseId, (doc) => {
    const fragment = doc.getXmlFragment(REPORT_FIELD);
    const before = statuses(doc, fresh);
    const targets = before.filter((s) => chosen.includes(s.key) && s.state === 'outdated').map((s) => s.key);
    const ranges = sectionRanges(fragment.toArray().map(yBlock));
    // From the last section up, so that earlier positions stay valid.
    const edits = targets.map((key) => ({ key, range: ranges.get(SECTION_TITLES[key])! })).sort((a, b) => b.range.start - a.range.start);
    doc.transact(() => {
      for (const { key, range } of edits) {
        if (range.end > range.start) fragment.delete(range.start, range.end - range.start);
        fragment.insert(range.start, yNodes(fresh.get(key)!));
      }
    }, 'refresh-generated-sections');
    return { sections: statuses(doc, fresh), rewritten: targets };
  });
}
