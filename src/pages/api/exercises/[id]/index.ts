import { snapshotFor } from '../../../../lib/exercise/service';
import { endpoint, json, requireActor } from '../../../../lib/http';

/** The same snapshot the socket sends first, filtered for the caller's seat. */
export const GET = endpoint(({ locals, params }) => json(snapshotFor(params.id!, requireActor(locals))));
