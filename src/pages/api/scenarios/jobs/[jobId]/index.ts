import { endpoint, json, requireActor } from '../../../../../lib/http';
import { cancelJob, jobStatus } from '../../../../../lib/studio/analysis';

export const GET = endpoint(({ locals, params }) => json(jobStatus(requireActor(locals), params.jobId!)));

export const DELETE = endpoint(({ locals, params }) => json(cancelJob(requireActor(locals), params.jobId!)));
