import { unseatPerson } from '../../../../../lib/exercise/service';
import { endpoint, json, requireActor } from '../../../../../lib/http';

export const DELETE = endpoint(({ locals, params }) => json(unseatPerson(params.id!, requireActor(locals), params.membershipId!)));
