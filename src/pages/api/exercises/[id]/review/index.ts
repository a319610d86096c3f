import { authorize, endpoint, HttpError, json } from '../../../../../lib/http';
import { exerciseReview } from '../../../../../lib/report/analysis';
import { exerciseFromRoute } from '../../../../../lib/report/exercise';
import { PlayMismatch } from '../../../../../lib/review';

export const GET = endpoint(({ locals, params }) => {
  const { actor, ctx } = exerciseFromRoute(locals, params);
  authorize(actor, 'review.read', ctx);
  try {
    const { review, scenarioTitle } = exerciseReview(params.id!);
    return json({ review, scenarioTitle });
  } catch (error) {
    if (error instanceof PlayMismatch) throw new HttpError(409, `The play record does not fit its scenario: ${error.message}`);
    throw error;
  }
});
