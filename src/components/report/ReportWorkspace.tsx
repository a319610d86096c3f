/**
 * The report workspace: the shared draft on the left; on the right who is
 * here, the generated sections against the record now, the issued versions
 * with their exports, sending to sponsors with the record of every send, and
 * comments.
 */
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback, useState } from 'react';
import { api, describeError } from '../../lib/client/api';
import type { ReportPermissions } from '../../lib/report/permissions';
import { FormMessage } from '../ui/Field';
import { withQueryClient } from '../ui/QueryRoot';
import { CommentsPanel } from './CommentsPanel';
import { GeneratedSectionsPanel } from './GeneratedSectionsPanel';
import { ReportEditor, type Person } from './ReportEditor';
import { IssueButton, VersionsPanel } from './VersionsPanel';
import { SendPanel } from './SendPanel';

export type ReportState = {
  exercise: { id: string; title: string; state: string };
  may: ReportPermissions;
  versions: { id: string; number: number; title: string; issuedAt: string; issuedByName: string }[];
  dispatches: { id: string; versionNumber: number; sentByName: string; recipients: string[]; note: string; sentAt: string }[];
  sponsors: { name: string; email: string }[];
};

type Props = { exerciseId: string; user: { id: string; name: string } };

function PeoplePanel({ people }: { people: Person[] }) {
  return (
    <section className="panel p-4" aria-labelledby="people-heading">
      <h2 id="people-heading" className="mb-2 text-base">Here now</h2>
      {people.length === 0 ? (
        <p className="text-sm text-ink-600">Connecting…</p>
      ) : (
        <ul className="space-y-1 text-sm" data-testid="people">
          {people.map((p) => (
            <li key={p.clientId} className="flex items-center gap-2">
              <span aria-hidden="true" className="inline-block h-2.5 w-2.5 rounded-full" style={{ background: p.color }} />
              <span className="font-medium">{p.name}</span>
              {p.self && <span className="text-ink-500">(you)</span>}
              {p.mode === 'read' && <span className="tag bg-ink-100 text-ink-600">reading</span>}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function ReportWorkspace({ exerciseId, user }: Props) {
  const queries = useQueryClient();
  const [people, setPeople] = useState<Person[]>([]);
  const onPeople = useCallback((list: Person[]) => setPeople(list), []);
  const state = useQuery({ queryKey: ['report', exerciseId], queryFn: () => api<ReportState>(`/api/exercises/${exerciseId}/report`) });
  const refresh = () => queries.invalidateQueries({ queryKey: ['report', exerciseId] });
  if (state.isPending) return <p className="text-sm text-ink-600">Opening the report…</p>;
  if (state.isError) return <FormMessage tone="error">{describeError(state.error)}</FormMessage>;
  const report = state.data;
  return (
    <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_22rem]">
      <div className="min-w-0 space-y-3">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <p className="text-sm text-ink-600">
            {report.may.edit
              ? 'Everyone editing sees each other’s typing and carets. The analysis tables and charts were generated from the exercise; write the hot wash, findings and recommendations around them.'
              : 'You may read the draft as it is written' + (report.may.comment ? ' and leave comments on the right.' : '.')}
          </p>
          {report.may.issue && <IssueButton exerciseId={exerciseId} nextNumber={(report.versions[0]?.number ?? 0) + 1} onIssued={refresh} />}
        </div>
        <ReportEditor exerciseId={exerciseId} user={user} editable={report.may.edit} onPeople={onPeople} />
      </div>
      <aside className="space-y-4" aria-label="Report tools">
        <PeoplePanel people={people} />
        {report.may.edit && <GeneratedSectionsPanel exerciseId={exerciseId} />}
        <VersionsPanel exerciseId={exerciseId} versions={report.versions} />
        {report.may.send && <SendPanel exerciseId={exerciseId} report={report} onSent={refresh} />}
        {report.may.readDraft && <CommentsPanel exerciseId={exerciseId} may={report.may} />}
      </aside>
    </div>
  );
}

export default withQueryClient(ReportWorkspace);
