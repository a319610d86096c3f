import { authorize, endpoint, json, readJson } from '../../../../../../../lib/http';
import { exerciseFromRoute, versionNumber } from '../../../../../../../lib/report/exercise';
import { sendSchema, sendVersion } from '../../../../../../../lib/report/send';
import { getVersion } from '../../../../../../../lib/report/versions';

/** Mail an issued version to sponsors with a covering note; the PDF goes as an attachment. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.send', ctx);
  const body = await readJson(request, sendSchema);
  const version = getVersion(exercise.id, versionNumber(params), exercise.title);
  const sent = await sendVersion(version, actor, body);
  return json({ sent: { version: version.number, to: body.to, attachment: sent.filename } }, 201);
});
