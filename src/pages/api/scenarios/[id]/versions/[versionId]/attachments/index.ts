import { endpoint, HttpError, json, requireActor } from '../../../../../../../lib/http';
import { listAttachments, uploadAttachment } from '../../../../../../../lib/studio/attachments';
import { MAX_ATTACHMENT_BYTES, tooLarge } from '../../../../../../../lib/studio/files';

export const GET = endpoint(({ locals, params }) => json({ attachments: listAttachments(requireActor(locals), params.id!, params.versionId!) }));

/** Room for the multipart framing and the small fields around the file. */
const FORM_OVERHEAD = 64 * 1024;

/** multipart/form-data with `file` and, for one team's brief, `teamId`. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const actor = requireActor(locals);
  const declared = Number(request.headers.get('content-length') ?? 0);
  if (declared > MAX_ATTACHMENT_BYTES + FORM_OVERHEAD) throw tooLarge(declared);
  const form = await request.formData().catch(() => {
    throw new HttpError(400, 'Send the document as multipart/form-data with a "file" field', [{ field: 'file', reason: 'missing' }]);
  });
  const file = form.get('file');
  if (!(file instanceof File)) throw new HttpError(400, 'Choose a file to upload', [{ field: 'file', reason: 'missing' }]);
  if (file.size > MAX_ATTACHMENT_BYTES) throw tooLarge(file.size);
  const team = form.get('teamId');
  const uploaded = await uploadAttachment(actor, params.id!, {
    versionId: params.versionId!,
    teamId: typeof team === 'string' && team !== '' ? team : null,
    filename: file.name,
    bytes: new Uint8Array(await file.arrayBuffer()),
  });
  return json(uploaded, 201);
});
