import { endpoint, requireActor } from '../../../lib/http';
import { readableAttachment } from '../../../lib/studio/attachments';
import { fileStream } from '../../../lib/studio/files';

/** The file, to those the access rules allow; PDFs and images open in the browser. */
export const GET = endpoint(({ locals, params, url }) => {
  const row = readableAttachment(requireActor(locals), params.id!);
  const disposition = url.searchParams.get('download') === '1' ? 'attachment' : 'inline';
  return new Response(fileStream(row.sha256), {
    headers: {
      'content-type': row.contentType,
      'content-length': String(row.size),
      'content-disposition': `${disposition}; filename="${row.filename.replace(/[^\x20-\x7e]/g, '_')}"; filename*=UTF-8''${encodeURIComponent(row.filename)}`,
      'x-content-type-options': 'nosniff',
      'cache-control': 'private, no-store',
    },
  });
});
