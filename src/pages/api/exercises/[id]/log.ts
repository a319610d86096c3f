/** The whole audit log of an exercise, for its facilitators: every committed change, numbered. */
import { z } from 'zod';
import { auditLog } from '../../../../lib/exercise/service';
import { endpoint, json, requireActor, validate } from '../../../../lib/http';

const query = z.object({ after: z.coerce.number().int().min(0).default(0) });

export const GET = endpoint(({ locals, params, url }) => {
  const { after } = validate(query, Object.fromEntries(url.searchParams), 'Invalid query');
  return json({ events: auditLog(params.id!, requireActor(locals), after) });
});
