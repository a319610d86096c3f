/** The stored draft of an exercise's report, generated from its review the first time anyone opens it. */
import { loadPlayRecord } from '../exercise/record';
import { exerciseReview } from './analysis';
import { firstDraft, SECTION_TITLES } from './draft';
import type { JSONContent } from './schema';
import { ensureDraft, hasDraft } from './store';

/** When the review cannot be computed (a record that does not fit its scenario), the draft says why and keeps the sections. */
function draftWithoutAnalysis(exerciseId: string, reason: string): JSONContent {
  const record = loadPlayRecord(exerciseId);
  const section = (title: string): JSONContent[] => [{ type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text: title }] }, { type: 'paragraph' }];
  return {
    type: 'doc',
    content: [
      { type: 'heading', attrs: { level: 1 }, content: [{ type: 'text', text: `After-action report: ${record.title}` }] },
      { type: 'paragraph', content: [{ type: 'text', text: `The comparison with the equilibrium could not be made: ${reason}`, marks: [{ type: 'italic' }] }] },
      ...Object.values(SECTION_TITLES).flatMap(section),
    ],
  };
}

async function generated(exerciseId: string): Promise<JSONContent> {
  try {
    const { review, record, scenarioTitle } = await exerciseReview(exerciseId);
    return firstDraft({ review, scenarioTitle, startedAt: record.startedAt, endedAt: record.endedAt });
  } catch (error) {
    return draftWithoutAnalysis(exerciseId, error instanceof Error ? error.message : String(error));
  }
}

/** True when this call stored the first draft. */
export async function ensureReportDraft(exerciseId: string): Promise<boolean> {
  if (hasDraft(exerciseId)) return false;
  const content = await generated(exerciseId);
  return ensureDraft(exerciseId, () => content);
}
