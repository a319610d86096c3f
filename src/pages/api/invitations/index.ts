import { authorize, endpoint, json, readJson, requireActor } from '../../../lib/http';
import { invitationInput, invite, pendingInvitations } from '../../../lib/invitations';

export const GET = endpoint(({ locals }) => {
  authorize(requireActor(locals), 'user.manage', {});
  return json({ invitations: pendingInvitations() });
});

export const POST = endpoint(async ({ locals, request }) => {
  const actor = requireActor(locals);
  const input = await readJson(request, invitationInput);
  authorize(actor, 'invitation.create', { role: input.role });
  const { id } = await invite(actor, input);
  return json({ id, email: input.email.toLowerCase(), role: input.role }, 201);
});
