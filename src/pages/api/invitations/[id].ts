import { authorize, endpoint, requireActor } from '../../../lib/http';
import { revokeInvitation } from '../../../lib/invitations';

export const DELETE = endpoint(({ locals, params }) => {
  authorize(requireActor(locals), 'user.manage', {});
  revokeInvitation(params.id!);
  return new Response(null, { status: 204 });
});
