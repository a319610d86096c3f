import { authorize, endpoint, HttpError, requireActor } from '../../../../../lib/http';
import { getAttachment } from '../../../../../lib/outbox';

export const GET = endpoint(async ({ locals, params }) => {
  authorize(requireActor(locals), 'outbox.read', {});
  const index = Number(params.index);
  if (!Number.isInteger(index) || index < 0) throw new HttpError(400, 'Attachment index must be a whole number', [{ field: 'index', reason: 'not a whole number' }]);
  const file = await getAttachment(params.id!, index);
  return new Response(new Uint8Array(file.content), {
    headers: {
      'content-type': file.contentType,
      'content-disposition': `attachment; filename="${file.filename.replace(/["\\\r\n]/g, '_')}"`,
      'x-content-type-options': 'nosniff',
    },
  });
});
