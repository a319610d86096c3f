import { seatInput, seatPerson } from '../../../../../lib/exercise/service';
import { endpoint, json, readJson, requireActor } from '../../../../../lib/http';

/** Seat a person by e-mail: straight onto the roster if they have an account, else an invitation. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const user = requireActor(locals);
  const input = await readJson(request, seatInput);
  return json(await seatPerson(params.id!, user, input), 201);
});
