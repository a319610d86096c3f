import { endpoint, HttpError, json, requireActor } from '../../../../../../../lib/http';
import { listAttachments, uploadAttachment } from '../../../../../../../lib/studio/attachments';
import { MAX_ATTACHMENT_BYTES, readBody } from '../../../../../../../lib/studio/files';

export const GET = endpoint(({ locals, params }) => json({ attachments: listAttachments(requireActor(locals), params.id!, params.versionId!) }));

/**
 * The file is the raw request body (any content type but a form's); its name
 * and, for one team's brief, the team come in the query: ?name=map.png&teamId=red.
 * The type is read from the content, never from the name or the header.
 */
export const POST = endpoint(async ({ locals, params, request, url }) => {
  const actor = requireActor(locals);
  const bytes = await readBody(request, MAX_ATTACHMENT_BYTES);
  const name = url.searchParams.get('name');
  if (!name) throw new HttpError(400, 'Give the file name as ?name=', [{ field: 'name', reason: 'missing' }]);
  const team = url.searchParams.get('teamId');
  const uploaded = await uploadAttachment(actor, params.id!, { versionId: params.versionId!, teamId: team || null, filename: name, bytes });
  return json(uploaded, 201);
});
