import { authorize, endpoint } from '../../../../../../lib/http';
import { exerciseFromRoute, versionNumber } from '../../../../../../lib/report/exercise';
import { htmlResponse } from '../../../../../../lib/report/http';
import { reportHtml } from '../../../../../../lib/report/render/html';
import { pdfFilename } from '../../../../../../lib/report/send';
import { getVersion } from '../../../../../../lib/report/versions';

export const GET = endpoint(({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.readIssued', ctx);
  const version = getVersion(exercise.id, versionNumber(params), exercise.title);
  return htmlResponse(reportHtml(version), pdfFilename(version).replace(/\.pdf$/, '.html'));
});
