import { endpoint, json, requireActor } from '../../../../../../../lib/http';
import { removeAttachment } from '../../../../../../../lib/studio/attachments';

export const DELETE = endpoint(({ locals, params }) =>
  json(removeAttachment(requireActor(locals), params.id!, params.versionId!, params.attachmentId!)),
);
