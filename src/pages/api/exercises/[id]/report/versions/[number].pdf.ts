import { authorize, endpoint } from '../../../../../../lib/http';
import { exerciseFromRoute, versionNumber } from '../../../../../../lib/report/exercise';
import { pdfResponse } from '../../../../../../lib/report/http';
import { reportPdf } from '../../../../../../lib/report/render/pdf';
import { pdfFilename } from '../../../../../../lib/report/send';
import { getVersion } from '../../../../../../lib/report/versions';

export const GET = endpoint(async ({ locals, params, url }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.readIssued', ctx);
  const version = getVersion(exercise.id, versionNumber(params), exercise.title);
  return pdfResponse(await reportPdf(version), pdfFilename(version), url.searchParams.has('inline'));
});
