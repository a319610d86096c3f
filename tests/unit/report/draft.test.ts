/** The generated summary's opening says where the exercise stands: not started, under way, or ended. */
import { describe, expect, it } from 'vitest';
import { firstDraft } from '../../../src/lib/report/draft';
import type { JSONContent } from '../../../src/lib/report/schema';
import type { PlayRecord } from '../../../src/lib/exercise/record';
import { reviewPlay } from '../../../src/lib/review';
import { LADDER, playRecord } from '../review/fixtures';

const text = (node: JSONContent): string => (node.text ?? '') + (node.content ?? []).map(text).join('');

function summaryOf(record: PlayRecord): string {
  const draft = firstDraft({ review: reviewPlay(LADDER, record), scenarioTitle: 'Two harbours', startedAt: record.startedAt, endedAt: record.endedAt });
  return text(draft.content![2]!); // title, "Summary", then its first paragraph
}

describe('the summary of the first draft', () => {
  it('gives the span of an ended exercise and its moves', () => {
    const words = summaryOf(playRecord(LADDER, [['b', 'Raise'], ['w', 'Calm'], ['r', 'Match']]));
    expect(words).toContain('ran on the scenario Two harbours from 5 January 2026 at 09:00 UTC to 5 January 2026 at 11:00 UTC');
    expect(words).toMatch(/Play took 3 moves and ended at “[^”]+”\./);
  });

  it('says a running exercise started and is under way, with one move in the singular', () => {
    const words = summaryOf(playRecord(LADDER, [['b', 'Raise']], { state: 'live', endedAt: null }));
    expect(words).toContain('on the scenario Two harbours started on 5 January 2026 at 09:00 UTC, with');
    expect(words).toContain('Play took 1 move and is still under way.');
    expect(words).not.toContain('not recorded');
  });

  it('says an exercise in its briefing has not started and has no moves yet', () => {
    const words = summaryOf(playRecord(LADDER, [], { state: 'briefing', startedAt: null, endedAt: null }));
    expect(words).toContain('has not started.');
    expect(words).toContain('No move has been played yet. Under the authored payoffs');
  });
});
