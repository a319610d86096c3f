import { authorize, endpoint, json, readJson } from '../../../../../../lib/http';
import { addComment, commentSchema, listComments } from '../../../../../../lib/report/comments';
import { exerciseFromRoute } from '../../../../../../lib/report/exercise';

export const GET = endpoint(({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.readDraft', ctx);
  return json({ comments: listComments(exercise.id) });
});

export const POST = endpoint(async ({ locals, params, request }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.comment', ctx);
  return json({ comment: addComment(exercise.id, actor, await readJson(request, commentSchema)) }, 201);
});
