/** Versions of the scenario and the change log of the open one: who changed what, and when. */
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { api, describeError } from '../../../lib/client/api';
import type { ChangeEntry } from '../../../lib/studio/library';
import { FormMessage } from '../../ui/Field';
import { useWorkbench } from './context';
import type { Detail } from './Workbench';

const when = (iso: string) => new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });

type Props = { detail: Detail; versionId: string; status: 'draft' | 'frozen'; openVersion: (id: string) => void; onFrozen: () => void; dirty: boolean };

export function HistoryTab({ detail, versionId, status, openVersion, onFrozen, dirty }: Props) {
  const { scenarioId, readOnly, faults } = useWorkbench();
  const [error, setError] = useState<string | null>(null);
  const changes = useQuery({
    queryKey: ['changes', versionId, status],
    queryFn: () => api<{ changes: ChangeEntry[] }>(`/api/scenarios/${scenarioId}/versions/${versionId}/changes`),
  });
  const freeze = async () => {
    setError(null);
    try {
      await api(`/api/scenarios/${scenarioId}/versions/${versionId}/freeze`, { method: 'POST', json: {} });
      onFrozen();
      void changes.refetch();
    } catch (e) {
      setError(describeError(e));
    }
  };
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <section className="panel space-y-3 p-4" aria-labelledby="versions-heading">
        <h2 id="versions-heading">Versions</h2>
        <p className="text-sm text-ink-700">
          A version is frozen once an exercise uses it (or you freeze it); it never changes again, and the next edit starts a new draft.
        </p>
        <table className="data-table" data-testid="versions-table">
          <thead>
            <tr>
              <th>Version</th>
              <th>Started</th>
              <th>Exercises</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {detail.versions.map((v) => (
              <tr key={v.id} className={v.id === versionId ? 'bg-paper' : ''}>
                <td>
                  v{v.number}{' '}
                  <span className={`tag ${v.status === 'frozen' ? 'bg-haze-100 text-haze-700' : 'bg-ink-100 text-ink-700'}`}>{v.status}</span>
                  {v.basedOnNumber !== null && <span className="block text-xs text-ink-500">from v{v.basedOnNumber}</span>}
                </td>
                <td>
                  {when(v.createdAt)}
                  <span className="block text-xs text-ink-500">by {v.createdByName}</span>
                  {v.frozenAt && <span className="block text-xs text-ink-500">frozen {when(v.frozenAt)}</span>}
                </td>
                <td>{v.exercises}</td>
                <td>
                  {v.id === versionId ? (
                    <span className="text-xs text-ink-500">open</span>
                  ) : (
                    <button type="button" className="btn-quiet py-1" onClick={() => openVersion(v.id)}>
                      Open
                    </button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {!readOnly && status === 'draft' && (
          <div className="space-y-1">
            <button type="button" className="btn-quiet" disabled={dirty || faults.length > 0} onClick={() => void freeze()}>
              Freeze this version
            </button>
            <p className="text-xs text-ink-600">
              {dirty ? 'Save your changes first.' : faults.length > 0 ? 'Fix the faults first: a frozen version must be sound.' : 'Exercises freeze the version they use by themselves; freeze it now to fix it for review.'}
            </p>
          </div>
        )}
        {error && <FormMessage tone="error">{error}</FormMessage>}
      </section>
      <section className="panel space-y-3 p-4" aria-labelledby="changes-heading">
        <h2 id="changes-heading">Changes to this version</h2>
        {changes.isError && <FormMessage tone="error">{describeError(changes.error)}</FormMessage>}
        <ol className="space-y-2" data-testid="change-log">
          {changes.data?.changes.map((c) => (
            <li key={c.id} className="border-b border-ink-100 pb-2 text-sm">
              <p>{c.summary}</p>
              <p className="text-xs text-ink-500">
                {c.userName} · {when(c.at)}
              </p>
              {c.paths.length > 0 && (
                <details className="text-xs text-ink-600">
                  <summary>Where</summary>
                  <ul className="font-mono">
                    {c.paths.slice(0, 40).map((p) => (
                      <li key={p}>{p}</li>
                    ))}
                    {c.paths.length > 40 && <li>…and {c.paths.length - 40} more</li>}
                  </ul>
                </details>
              )}
            </li>
          ))}
        </ol>
      </section>
    </div>
  );
}
