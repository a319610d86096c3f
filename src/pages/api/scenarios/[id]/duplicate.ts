import { endpoint, json, requireActor } from '../../../../lib/http';
import { duplicateScenario } from '../../../../lib/studio/library';

export const POST = endpoint(({ locals, params }) => json(duplicateScenario(requireActor(locals), params.id!), 201));
