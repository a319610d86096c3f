/** Issuing the draft as a numbered version, and the list of issued versions with their exports. */
import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { api, describeError } from '../../lib/client/api';
import { dateTime } from '../review/format';
import { FormMessage } from '../ui/Field';
import type { ReportState } from './ReportWorkspace';

export function IssueButton({ exerciseId, nextNumber, onIssued }: { exerciseId: string; nextNumber: number; onIssued: () => void }) {
  const [confirming, setConfirming] = useState(false);
  const issue = useMutation({
    mutationFn: () => api<{ version: { number: number } }>(`/api/exercises/${exerciseId}/report/versions`, { method: 'POST', json: {} }),
    onSuccess: () => {
      setConfirming(false);
      onIssued();
    },
  });
  if (!confirming) {
    return (
      <div className="flex items-center gap-2">
        {issue.isSuccess && <span className="text-sm text-moss-700" role="status">Version {issue.data.version.number} issued.</span>}
        <button type="button" className="btn-accent" onClick={() => setConfirming(true)}>
          Issue version {nextNumber}
        </button>
      </div>
    );
  }
  return (
    <div className="flex flex-wrap items-center gap-2 rounded-md border border-bronze-200 bg-bronze-100 px-3 py-2 text-sm" role="group" aria-label="Confirm issue">
      <span>Freeze the draft as it stands now as version {nextNumber}? Sponsors can then read it.</span>
      <button type="button" className="btn-accent py-1" onClick={() => issue.mutate()} disabled={issue.isPending} autoFocus>
        {issue.isPending ? 'Issuing…' : 'Issue'}
      </button>
      <button type="button" className="btn-quiet py-1" onClick={() => setConfirming(false)}>
        Cancel
      </button>
      {issue.isError && <FormMessage tone="error">{describeError(issue.error)}</FormMessage>}
    </div>
  );
}

export function VersionsPanel({ exerciseId, versions }: { exerciseId: string; versions: ReportState['versions'] }) {
  const base = `/api/exercises/${exerciseId}/report/versions`;
  return (
    <section className="panel p-4" aria-labelledby="versions-heading">
      <h2 id="versions-heading" className="mb-2 text-base">Issued versions</h2>
      {versions.length === 0 ? (
        <p className="text-sm text-ink-600" data-empty="versions">None yet. Issue the draft when it is ready; each version is frozen with its date and author.</p>
      ) : (
        <ul className="divide-y divide-ink-100 text-sm" data-testid="versions">
          {versions.map((v) => (
            <li key={v.id} className="py-2">
              <div className="font-medium">
                <a href={`/exercises/${exerciseId}/report?version=${v.number}`}>Version {v.number}</a>
              </div>
              <div className="text-xs text-ink-600">
                {dateTime(v.issuedAt)} · {v.issuedByName}
              </div>
              <div className="mt-1 flex gap-2 text-xs">
                <a href={`${base}/${v.number}.pdf`}>PDF</a>
                <a href={`${base}/${v.number}.html`}>HTML</a>
              </div>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
