import { z } from 'zod';
import { endpoint, HttpError, json, readJson, requireActor } from '../../../../lib/http';
import { parseScenario } from '../../../../lib/scenario';
import { startJob } from '../../../../lib/studio/analysis';
import { StudioJobSchema } from '../../../../lib/studio/analysis-types';
import { faultFields } from '../../../../lib/studio/document';
import { scenarioFor } from '../../../../lib/studio/library';

const request = z.object({ document: z.unknown(), job: StudioJobSchema });

/** Start an analysis of the document the author has open (saved or not). Answers 202 with the job id. */
export const POST = endpoint(async ({ locals, params, request: http }) => {
  const actor = requireActor(locals);
  scenarioFor(actor, params.id!, 'scenario.read');
  const input = await readJson(http, request);
  const parsed = parseScenario(input.document);
  if (!parsed.ok) throw new HttpError(400, 'The scenario has faults; fix them before analysing it', faultFields(parsed.faults));
  return json({ jobId: await startJob(actor, params.id!, parsed.scenario, input.job) }, 202);
});
