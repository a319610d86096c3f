import { endpoint, HttpError, requireActor } from '../../../../lib/http';
import { csvResponse } from '../../../../lib/report/http';
import { scenarioRuns } from '../../../../lib/report/runs';
import { RUNS_TABLES, type RunsTable } from '../../../../lib/review';

export const GET = endpoint(async ({ locals, params }) => {
  const table = params.table as RunsTable;
  if (!(table in RUNS_TABLES)) {
    throw new HttpError(404, `No table "${params.table}"; the runs have ${Object.keys(RUNS_TABLES).join(', ')}`, [{ field: 'table', reason: 'unknown table' }]);
  }
  const { scenario, overview } = await scenarioRuns(requireActor(locals), params.scenarioId ?? '');
  return csvResponse(RUNS_TABLES[table].csv(overview), `${scenario.title}-${table}`);
});
