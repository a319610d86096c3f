import { authorize, endpoint, json } from '../../../../../../lib/http';
import { ensureReportDraft } from '../../../../../../lib/report/draft-store';
import { exerciseFromRoute } from '../../../../../../lib/report/exercise';
import { issueVersion, listVersions } from '../../../../../../lib/report/versions';

export const GET = endpoint(({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.readIssued', ctx);
  return json({ versions: listVersions(exercise.id) });
});

/** Issue the draft as it stands now: the next numbered, frozen version. */
export const POST = endpoint(async ({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.issue', ctx);
  await ensureReportDraft(exercise.id);
  return json({ version: issueVersion(exercise.id, exercise.title, actor) }, 201);
});
