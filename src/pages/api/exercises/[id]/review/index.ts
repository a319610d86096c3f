import { authorize, endpoint, HttpError, json } from '../../../../../lib/http';
import { exerciseReview } from '../../../../../lib/report/analysis';
import { exerciseFromRoute } from '../../../../../lib/report/exercise';
import { PlayMismatch } from '../../../../../lib/review';

/** The solver pool's refusals (a bad game, a failed solve) carry a kind; they cross the bundle boundary, so no instanceof. */
const isSolveError = (error: unknown): error is Error & { kind: string } => error instanceof Error && typeof (error as { kind?: unknown }).kind === 'string';

export const GET = endpoint(async ({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'review.read', ctx);
  try {
    const { review, scenarioTitle } = await exerciseReview(exercise.id);
    return json({ review, scenarioTitle, scenarioId: exercise.scenarioId });
  } catch (error) {
    if (error instanceof PlayMismatch) throw new HttpError(409, `The play record does not fit its scenario: ${error.message}`);
    if (isSolveError(error)) throw new HttpError(409, `The scenario could not be analysed: ${error.message}`);
    throw error;
  }
});
