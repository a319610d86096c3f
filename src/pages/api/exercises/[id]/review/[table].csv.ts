import { authorize, endpoint, HttpError } from '../../../../../lib/http';
import { exerciseReview } from '../../../../../lib/report/analysis';
import { exerciseFromRoute } from '../../../../../lib/report/exercise';
import { REVIEW_TABLES, type ReviewTable } from '../../../../../lib/review';
import { csvResponse } from '../../../../../lib/report/http';

export const GET = endpoint(async ({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'review.read', ctx);
  const table = params.table as ReviewTable;
  if (!(table in REVIEW_TABLES)) {
    throw new HttpError(404, `No table "${params.table}"; the review has ${Object.keys(REVIEW_TABLES).join(', ')}`, [{ field: 'table', reason: 'unknown table' }]);
  }
  return csvResponse(REVIEW_TABLES[table].csv((await exerciseReview(exercise.id)).review), `${exercise.title}-${table}`);
});
