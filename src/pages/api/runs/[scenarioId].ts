import { endpoint, json, requireActor } from '../../../lib/http';
import { scenarioRuns } from '../../../lib/report/runs';

/** Every run of one scenario side by side: rung frequencies, lambda by run, outcomes. */
export const GET = endpoint(async ({ locals, params }) => json(await scenarioRuns(requireActor(locals), params.scenarioId ?? '')));
