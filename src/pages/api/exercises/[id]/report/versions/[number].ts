import { authorize, endpoint, json } from '../../../../../../lib/http';
import { exerciseFromRoute, versionNumber } from '../../../../../../lib/report/exercise';
import { reportBodyHtml } from '../../../../../../lib/report/render/html';
import { getVersion } from '../../../../../../lib/report/versions';

export const GET = endpoint(({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.readIssued', ctx);
  const version = getVersion(exercise.id, versionNumber(params), exercise.title);
  return json({ version: { ...version, html: reportBodyHtml(version.content) } });
});
