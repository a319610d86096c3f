/** The generated sections of the report draft: how each compares with the record now (GET), and writing chosen ones again (POST). */
import { authorize, endpoint, json, readJson } from '../../../../../lib/http';
import { exerciseFromRoute } from '../../../../../lib/report/exercise';
import { generatedSectionStatus, refreshGeneratedSections, refreshInput } from '../../../../../lib/report/refresh';

export const GET = endpoint(async ({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.edit', ctx);
  return json({ sections: await generatedSectionStatus(exercise.id) });
});

export const POST = endpoint(async ({ locals, params, request }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  authorize(actor, 'report.edit', ctx);
  const { sections } = await readJson(request, refreshInput);
  return json(await refreshGeneratedSections(exercise.id, sections));
});
