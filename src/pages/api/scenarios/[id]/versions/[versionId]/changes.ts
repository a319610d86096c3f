import { endpoint, json, requireActor } from '../../../../../../lib/http';
import { changeLog } from '../../../../../../lib/studio/library';

export const GET = endpoint(({ locals, params }) => json({ changes: changeLog(requireActor(locals), params.id!, params.versionId!) }));
