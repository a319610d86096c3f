import { authorize, endpoint, json, requireActor } from '../../../lib/http';
import { getMessage } from '../../../lib/outbox';

export const GET = endpoint(({ locals, params }) => {
  authorize(requireActor(locals), 'outbox.read', {});
  return json({ message: getMessage(params.id!) });
});
