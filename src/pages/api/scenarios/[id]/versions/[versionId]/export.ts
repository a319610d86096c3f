import { endpoint, requireActor } from '../../../../../../lib/http';
import { exportFileName, exportText } from '../../../../../../lib/studio/document';
import { versionView } from '../../../../../../lib/studio/library';

/** The version's document as a file, in the format the import reads back. */
export const GET = endpoint(({ locals, params }) => {
  const { document } = versionView(requireActor(locals), params.id!, params.versionId!);
  return new Response(exportText(document), {
    headers: {
      'content-type': 'application/json; charset=utf-8',
      'content-disposition': `attachment; filename="${exportFileName(document)}"`,
      'cache-control': 'no-store',
    },
  });
});
