import { authorize, endpoint, json, requireActor } from '../../../lib/http';
import { listMessages } from '../../../lib/outbox';

export const GET = endpoint(({ locals }) => {
  authorize(requireActor(locals), 'outbox.read', {});
  return json({ messages: listMessages() });
});
