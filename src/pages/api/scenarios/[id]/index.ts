import { z } from 'zod';
import { endpoint, json, readJson, requireActor } from '../../../../lib/http';
import { scenarioDetail, setArchived } from '../../../../lib/studio/library';

export const GET = endpoint(({ locals, params }) => json(scenarioDetail(requireActor(locals), params.id!)));

const change = z.object({ archived: z.boolean({ error: 'archived must be true or false' }) }).strict();

export const PATCH = endpoint(async ({ locals, params, request }) => {
  const actor = requireActor(locals);
  const { archived } = await readJson(request, change);
  setArchived(actor, params.id!, archived);
  return json(scenarioDetail(actor, params.id!));
});
