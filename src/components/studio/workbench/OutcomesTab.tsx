/**
 * Outcomes: every terminal of the tree with its attributes and each team's
 * payoff, editable inline (a bad value stays in its cell with the reason),
 * sortable and filterable.
 */
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { indexGame, type Num, type TerminalNode } from '../../../lib/engine';
import { applyEdit, type TreeEdit } from '../../../lib/studio/tree-edits';
import { SortHeader } from '../SortHeader';
import { useWorkbench } from './context';
import { NumField } from './fields';

type Row = { id: string; node: TerminalNode; path: string; outcome: string; payoffs: number[]; onPath: boolean };

const column = createColumnHelper<Row>();

export function OutcomesTab() {
  const { document, game, payoffs, change, readOnly, equilibrium, selectNode, show } = useWorkbench();
  const [sorting, setSorting] = useState<SortingState>([]);
  const [filter, setFilter] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const end = equilibrium?.pathNodes[equilibrium.pathNodes.length - 1];

  const rows: Row[] = useMemo(() => {
    if (!game) return [];
    const index = indexGame(game);
    return index.nodes.flatMap((node) => {
      if (node.kind !== 'terminal') return [];
      const labels: string[] = [];
      for (let link = index.parentOf.get(node); link; link = index.parentOf.get(link.parent)) labels.unshift(link.label);
      return [{ id: node.id, node, path: labels.join(' › '), outcome: node.outcome ?? '', payoffs: (payoffs.get(node.id) ?? []).map(Number), onPath: node.id === end }];
    });
  }, [game, payoffs, end]);

  const edit = (label: string, treeEdit: TreeEdit) => {
    const result = applyEdit(document.tree, treeEdit);
    if (!result.ok) return setProblem(result.reason);
    setProblem(null);
    change(label, (d) => ({ ...d, tree: result.root }));
  };

  const columns = useMemo(
    () => [
      column.accessor('outcome', {
        header: 'Outcome',
        cell: ({ row }) => (
          <div className="min-w-64">
            <button type="button" className="text-left font-medium text-haze-700 hover:underline" onClick={() => { selectNode(row.original.id); show('tree'); }}>
              {row.original.outcome || 'Outcome'}
            </button>
            {row.original.onPath && <span className="tag ml-2 bg-bronze-100 text-bronze-800">equilibrium outcome</span>}
            <p className="max-w-md truncate text-xs text-ink-600" title={row.original.path}>
              {row.original.path}
            </p>
          </div>
        ),
      }),
      ...document.attributes.map((a) =>
        column.accessor((r) => Number(r.node.attributes?.[a.key] ?? NaN), {
          id: `attr:${a.key}`,
          header: a.unit ? `${a.label} (${a.unit})` : a.label,
          sortUndefined: 'last',
          cell: ({ row }) => (
            <NumField
              label={`${a.label} of ${row.original.outcome || row.original.id}`}
              value={row.original.node.attributes?.[a.key]}
              className="w-20"
              readOnly={readOnly}
              onChange={(value: Num) => edit(`${a.key} at ${row.original.id}`, { kind: 'attribute', nodeId: row.original.id, key: a.key, value })}
              onClear={() => edit(`${a.key} at ${row.original.id}`, { kind: 'attribute', nodeId: row.original.id, key: a.key, value: null })}
            />
          ),
        }),
      ),
      ...document.teams.map((t, i) =>
        column.accessor((r) => r.payoffs[i] ?? NaN, {
          id: `payoff:${t.id}`,
          header: `Payoff ${t.name}`,
          cell: ({ row }) => (
            <NumField
              label={`Payoff of ${t.name} at ${row.original.outcome || row.original.id}`}
              value={row.original.node.payoffs?.[t.id]}
              placeholder={String(row.original.payoffs[i] ?? '')}
              className="w-20"
              readOnly={readOnly}
              onChange={(value: Num) => edit(`payoff of ${t.id} at ${row.original.id}`, { kind: 'payoff', nodeId: row.original.id, team: t.id, value })}
              onClear={() => edit(`payoff of ${t.id} at ${row.original.id}`, { kind: 'payoff', nodeId: row.original.id, team: t.id, value: null })}
            />
          ),
        }),
      ),
    ],
    [document.attributes, document.teams, readOnly, document.tree],
  );

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    globalFilterFn: (row, _id, value: string) => `${row.original.outcome} ${row.original.path}`.toLowerCase().includes(value.toLowerCase()),
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize: 25 } },
    getRowId: (row) => row.id,
    autoResetPageIndex: false,
  });
  const shown = table.getFilteredRowModel().rows.length;

  return (
    <section className="panel space-y-3 p-4" aria-labelledby="outcomes-heading">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="outcomes-heading">Outcomes</h2>
        <span className="text-sm text-ink-600" data-testid="outcome-count">
          {shown === rows.length ? `${rows.length} outcomes` : `${shown} of ${rows.length} outcomes`}
        </span>
        <input type="search" className="field-input ml-auto w-72" placeholder="Filter by outcome or path" aria-label="Filter outcomes" value={filter} onChange={(e) => { setFilter(e.target.value); table.setPageIndex(0); }} />
      </div>
      <p className="text-xs text-ink-600">
        A payoff typed here is set by hand and overrides the team’s weighted attributes; clear it to score the outcome from its attributes again. The grey
        figure is the payoff in use.
      </p>
      {problem && (
        <p role="alert" className="text-sm text-brick-700">
          {problem}
        </p>
      )}
      {rows.length === 0 ? (
        <p className="rounded-md border border-dashed border-ink-300 p-6 text-center text-sm text-ink-600">The tree has no outcomes yet. Build a ladder or add actions in the Tree tab.</p>
      ) : (
        <>
          <div className="overflow-x-auto">
            <table className="data-table" data-testid="outcomes-table">
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
                {table.getRowModel().rows.map((row) => (
                  <tr key={row.id} data-node={row.original.id} className={row.original.onPath ? 'bg-bronze-100/50' : ''}>
                    {row.getVisibleCells().map((cell) => (
                      <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {table.getPageCount() > 1 && (
            <nav className="flex items-center gap-2 text-sm" aria-label="Outcome pages">
              <button type="button" className="btn-quiet py-1" disabled={!table.getCanPreviousPage()} onClick={() => table.previousPage()}>
                Previous
              </button>
              <span>
                Page {table.getState().pagination.pageIndex + 1} of {table.getPageCount()}
              </span>
              <button type="button" className="btn-quiet py-1" disabled={!table.getCanNextPage()} onClick={() => table.nextPage()}>
                Next
              </button>
            </nav>
          )}
        </>
      )}
    </section>
  );
}
