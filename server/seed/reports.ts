/**
 * The demo report of the finished run: the generated first draft with the hot
 * wash, findings and recommendations written in, issued as version 1 and sent
 * to the sponsor, Maren Solt. Everything in it is invented.
 */
import { eq } from 'drizzle-orm';
import { db, schema } from '../../src/db/client';
import type { SessionUser } from '../../src/lib/auth';
import { exerciseReview } from '../../src/lib/report/analysis';
import { firstDraft, SECTION_TITLES } from '../../src/lib/report/draft';
import type { JSONContent } from '../../src/lib/report/schema';
import { sendVersion } from '../../src/lib/report/send';
import { ensureDraft } from '../../src/lib/report/store';
import { getVersion, issueVersion } from '../../src/lib/report/versions';
import type { SeededExercises } from './exercises';
import { DEMO_PEOPLE, type DemoIds } from './people';

const paragraph = (text: string): JSONContent => ({ type: 'paragraph', content: [{ type: 'text', text }] });
const bullets = (items: string[]): JSONContent => ({ type: 'bulletList', content: items.map((text) => ({ type: 'listItem', content: [paragraph(text)] })) });

const WRITTEN: Record<string, JSONContent[]> = {
  [SECTION_TITLES.hotWash]: [
    paragraph('Velmora’s team said the exclusion zone felt like the only answer that would not look weak at home; two members had argued for holding at shadowing and were overruled in the last minute of the turn.'),
    paragraph('Ostrakh’s team did not expect the survey offer to be read as a plain hold and felt the adjudication took away their most creative move. Everyone agreed the night-time collision changed the mood of the room more than any decision did.'),
  ],
  [SECTION_TITLES.findings]: [
    bullets([
      'Both capitals escalated to be seen as resolute, not because they expected the other to back down: the first climb cost Velmora more than the equilibrium action would have.',
      'The simultaneous round produced the clearest misreading: a step down and a climb, each meant as a reply to the collision.',
      'The Lantern Isles Council’s timing worked: it stayed out while nobody asked and brokered once both sides were paying for the crisis.',
    ]),
  ],
  [SECTION_TITLES.recommendations]: [
    bullets([
      'Agree a channel for search and rescue before the next exercise turn that involves naval forces at close range.',
      'Rehearse how a de-escalating move is announced, so that a step down is not read as a reply to an incident.',
      'Invite the mediator earlier in the next run and test whether an early offer changes the first climb.',
    ]),
  ],
};

/** The draft with the blocks under each written section's heading replaced by the written text. */
function writeSections(draft: JSONContent): JSONContent {
  const out: JSONContent[] = [];
  let skipping = false;
  for (const block of draft.content ?? []) {
    if (block.type === 'heading') {
      const title = block.content?.[0]?.text ?? '';
      out.push(block);
      skipping = title in WRITTEN;
      if (skipping) out.push(...WRITTEN[title]!);
      continue;
    }
    if (!skipping) out.push(block);
  }
  return { ...draft, content: out };
}

function sessionUser(id: string): SessionUser {
  const row = db().select().from(schema.user).where(eq(schema.user.id, id)).get()!;
  return { id: row.id, name: row.name, email: row.email, role: row.role };
}

export async function seedReports(people: DemoIds, exercises: SeededExercises): Promise<void> {
  const exerciseId = exercises.finishedExerciseId;
  const { review, record, scenarioTitle } = await exerciseReview(exerciseId);
  ensureDraft(exerciseId, () => writeSections(firstDraft({ review, scenarioTitle, startedAt: record.startedAt, endedAt: record.endedAt })));
  const facilitator = sessionUser(people.facilitator);
  const issued = issueVersion(exerciseId, record.title, facilitator);
  await sendVersion(getVersion(exerciseId, issued.number, record.title), facilitator, {
    to: [DEMO_PEOPLE.sponsor.email],
    note: `Dear ${DEMO_PEOPLE.sponsor.name},\n\nplease find attached the after-action report of yesterday’s run of the Serrin Strait exercise, with the hot wash and our first findings.\n\nIn the analysis, the equilibrium is computed from the payoffs the scenario assumed; please read it as an aid to the discussion we will have at the wrap-up.`,
  });
}
