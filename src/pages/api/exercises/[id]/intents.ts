/** An intent over HTTP, for clients without a socket: the same schema, access rules, commit and broadcast. */
import { parseIntentBody } from '../../../../lib/exercise/messages';
import { applyIntent, requireViewer } from '../../../../lib/exercise/service';
import { HTTP_STATUS, IntentError } from '../../../../lib/exercise/state';
import { endpoint, HttpError, json, requireActor } from '../../../../lib/http';

const refusal = (error: IntentError) => json({ error: error.message, code: error.code, fields: error.fields }, HTTP_STATUS[error.code]);

export const POST = endpoint(async ({ locals, params, request }) => {
  const user = requireActor(locals);
  const viewer = requireViewer(params.id!, user);
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new HttpError(400, 'The request body is not valid JSON', [{ field: '(body)', reason: 'not JSON' }]);
  }
  const parsed = parseIntentBody(body);
  if (!parsed.ok) return refusal(parsed.error);
  try {
    const committed = applyIntent(params.id!, { id: user.id, name: viewer.name, role: user.role }, parsed.message.key, parsed.message.intent);
    return json({ seq: committed.seq, duplicate: committed.duplicate, result: committed.result });
  } catch (error) {
    if (error instanceof IntentError) return refusal(error);
    throw error;
  }
});
