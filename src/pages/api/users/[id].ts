import { z } from 'zod';
import { PLATFORM_ROLES } from '../../../db/schema';
import { changeRole, setActive } from '../../../lib/accounts';
import { authorize, endpoint, HttpError, json, readJson, requireActor } from '../../../lib/http';

const change = z
  .object({ role: z.enum(PLATFORM_ROLES).optional(), active: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.active !== undefined, { message: 'Give a role or active' });

export const PATCH = endpoint(async ({ locals, params, request }) => {
  const actor = requireActor(locals);
  authorize(actor, 'user.manage', {});
  const input = await readJson(request, change);
  if (params.id === actor.id && input.active === false) throw new HttpError(409, 'You cannot deactivate your own account');
  if (input.role) changeRole(params.id!, input.role);
  if (input.active !== undefined) setActive(params.id!, input.active);
  return json({ ok: true });
});
