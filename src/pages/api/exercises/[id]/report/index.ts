import { authorize, endpoint, json } from '../../../../../lib/http';
import { exerciseFromRoute, sponsorAddresses } from '../../../../../lib/report/exercise';
import { reportPermissions } from '../../../../../lib/report/permissions';
import { listDispatches, listVersions } from '../../../../../lib/report/versions';

/** What the reader may do with the report, its issued versions and (for facilitators) who was sent which. */
export const GET = endpoint(({ locals, params }) => {
  const { actor, ctx, exercise } = exerciseFromRoute(locals, params);
  const may = reportPermissions(actor, ctx);
  if (!may.readDraft) authorize(actor, 'report.readIssued', ctx);
  return json({
    exercise: { id: exercise.id, title: exercise.title, state: exercise.state },
    may,
    versions: may.readIssued ? listVersions(exercise.id) : [],
    dispatches: may.send ? listDispatches(exercise.id) : [],
    sponsors: may.send ? sponsorAddresses(exercise.id) : [],
  });
});
