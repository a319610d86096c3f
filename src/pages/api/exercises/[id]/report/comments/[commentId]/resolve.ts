import { authorize, endpoint, json } from '../../../../../../../lib/http';
import { resolveComment } from '../../../../../../../lib/report/comments';
import { exerciseFromRoute } from '../../../../../../../lib/report/exercise';

/** Editors mark a comment as dealt with. */
export const POST = endpoint(({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.edit', ctx);
  resolveComment(exercise.id, params.commentId ?? '');
  return json({ resolved: params.commentId });
});
