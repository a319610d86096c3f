import { listUsers } from '../../../lib/accounts';
import { authorize, endpoint, json, requireActor } from '../../../lib/http';

export const GET = endpoint(({ locals }) => {
  authorize(requireActor(locals), 'user.manage', {});
  return json({ users: listUsers() });
});
