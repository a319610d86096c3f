import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useEffect, useMemo, useState } from 'react';
import { api, describeError } from '../../lib/client/api';
import type { LibraryEntry } from '../../lib/studio/library';
import { FormMessage } from '../ui/Field';
import { withQueryClient } from '../ui/QueryRoot';
import { ImportButton } from './ImportButton';
import { SortHeader } from './SortHeader';

const column = createColumnHelper<LibraryEntry>();

function useDebounced<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return settled;
}

const goTo = (scenarioId: string) => window.location.assign(`/studio/${scenarioId}`);

function StudioLibrary() {
  const queries = useQueryClient();
  const [query, setQuery] = useState('');
  const [archived, setArchived] = useState(false);
  const [sorting, setSorting] = useState<SortingState>([]);
  const q = useDebounced(query, 250);
  const list = useQuery({
    queryKey: ['scenarios', q, archived],
    queryFn: () => api<{ scenarios: LibraryEntry[] }>(`/api/scenarios?q=${encodeURIComponent(q)}${archived ? '&archived=1' : ''}`),
    placeholderData: keepPreviousData,
  });
  const refresh = () => queries.invalidateQueries({ queryKey: ['scenarios'] });
  const duplicate = useMutation({
    mutationFn: (id: string) => api<{ scenarioId: string }>(`/api/scenarios/${id}/duplicate`, { method: 'POST', json: {} }),
    onSuccess: ({ scenarioId }) => goTo(scenarioId),
  });
  const archive = useMutation({
    mutationFn: ({ id, archived }: { id: string; archived: boolean }) => api(`/api/scenarios/${id}`, { method: 'PATCH', json: { archived } }),
    onSettled: refresh,
  });

  const columns = useMemo(
    () => [
      column.accessor('title', {
        header: 'Scenario',
        cell: ({ row }) => (
          <div>
            <a href={`/studio/${row.original.id}`} className="font-medium">
              {row.original.title}
            </a>
            {row.original.summary && <p className="mt-0.5 line-clamp-2 text-xs text-ink-600">{row.original.summary}</p>}
          </div>
        ),
      }),
      column.accessor('ownerName', { header: 'Author', cell: ({ row }) => (row.original.mine ? 'you' : row.original.ownerName) }),
      column.accessor((s) => s.latest.number, {
        id: 'version',
        header: 'Version',
        cell: ({ row }) => (
          <span className="whitespace-nowrap">
            v{row.original.latest.number}{' '}
            <span className={`tag ${row.original.latest.status === 'frozen' ? 'bg-haze-100 text-haze-700' : 'bg-ink-100 text-ink-700'}`}>
              {row.original.latest.status}
            </span>
          </span>
        ),
      }),
      column.accessor('updatedAt', {
        header: 'Changed',
        cell: ({ getValue }) => <span className="whitespace-nowrap">{new Date(getValue()).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })}</span>,
      }),
      column.display({
        id: 'actions',
        header: '',
        cell: ({ row }) => (
          <div className="flex justify-end gap-2">
            <button type="button" className="btn-quiet py-1" onClick={() => duplicate.mutate(row.original.id)} aria-label={`Duplicate ${row.original.title}`}>
              Duplicate
            </button>
            {row.original.canEdit && (
              <button
                type="button"
                className="btn-quiet py-1"
                onClick={() => archive.mutate({ id: row.original.id, archived: !row.original.archived })}
                aria-label={`${row.original.archived ? 'Restore' : 'Archive'} ${row.original.title}`}
              >
                {row.original.archived ? 'Restore' : 'Archive'}
              </button>
            )}
          </div>
        ),
      }),
    ],
    [duplicate, archive],
  );

  const table = useReactTable({
    data: list.data?.scenarios ?? [],
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  const rows = table.getRowModel().rows;
  const failure = list.error ?? duplicate.error ?? archive.error;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-start gap-3">
        <a className="btn-accent" href="/studio/new">
          New scenario
        </a>
        <ImportButton onImported={({ scenarioId }) => goTo(scenarioId)} />
        <div className="ml-auto flex items-center gap-3">
          <label className="flex items-center gap-2 text-sm text-ink-700">
            <input type="checkbox" checked={archived} onChange={(e) => setArchived(e.target.checked)} /> Archived only
          </label>
          <input
            type="search"
            className="field-input w-64"
            placeholder="Search titles and settings"
            aria-label="Search scenarios"
            value={query}
            onChange={(e) => setQuery(e.target.value)}
          />
        </div>
      </div>
      {failure && <FormMessage tone="error">{describeError(failure)}</FormMessage>}
      <section className="panel overflow-x-auto p-2" aria-label="Scenario library">
        {list.isPending ? (
          <p className="p-4 text-sm text-ink-600">Loading the library…</p>
        ) : rows.length === 0 ? (
          <EmptyLibrary searching={q !== ''} archived={archived} />
        ) : (
          <table className="data-table" data-testid="library-table">
            <thead>
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id}>
                  {group.headers.map((header) => (
                    <SortHeader key={header.id} header={header} />
                  ))}
                </tr>
              ))}
            </thead>
            <tbody>
              {rows.map((row) => (
                <tr key={row.id}>
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}

function EmptyLibrary({ searching, archived }: { searching: boolean; archived: boolean }) {
  const text = searching
    ? 'No scenario matches this search. Try fewer words, or clear the search box.'
    : archived
      ? 'Nothing is archived. Archive a scenario from the library to put it away without deleting it.'
      : 'No scenarios yet. Start one with New scenario, or import a scenario file (JSON) exported from Rungwise.';
  return (
    <p className="m-2 rounded-md border border-dashed border-ink-300 p-6 text-center text-sm text-ink-600" data-empty="library">
      {text}
    </p>
  );
}

export default withQueryClient(StudioLibrary);
