import { endpoint, json, requireActor } from '../../../../../../lib/http';
import { freezeByAuthor, versionView } from '../../../../../../lib/studio/library';

export const POST = endpoint(({ locals, params }) => {
  const actor = requireActor(locals);
  freezeByAuthor(actor, params.id!, params.versionId!);
  return json(versionView(actor, params.id!, params.versionId!).version);
});
