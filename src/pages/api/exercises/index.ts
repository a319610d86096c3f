import { createExercise, createExerciseInput, exercisesFor } from '../../../lib/exercise/service';
import { endpoint, json, readJson, requireActor } from '../../../lib/http';

export const GET = endpoint(({ locals }) => json({ exercises: exercisesFor(requireActor(locals)) }));

export const POST = endpoint(async ({ locals, request }) => {
  const actor = requireActor(locals);
  const input = await readJson(request, createExerciseInput);
  return json(createExercise(actor, input), 201);
});
