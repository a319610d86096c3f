import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { PLATFORM_ROLES, type PlatformRole } from '../../lib/roles';
import { api, describeError } from '../../lib/client/api';
import { FormMessage } from '../ui/Field';
import { withQueryClient } from '../ui/QueryRoot';
import { InviteForm } from './InviteForm';

type UserRow = { id: string; name: string; email: string; role: PlatformRole; deactivatedAt: string | null; createdAt: string };
type Invitation = { id: string; email: string; role: PlatformRole; createdAt: string; expiresAt: string };

const column = createColumnHelper<UserRow>();

function UsersAdmin({ selfId }: { selfId: string }) {
  const queries = useQueryClient();
  const users = useQuery({ queryKey: ['users'], queryFn: () => api<{ users: UserRow[] }>('/api/users') });
  const invitations = useQuery({ queryKey: ['invitations'], queryFn: () => api<{ invitations: Invitation[] }>('/api/invitations') });
  const update = useMutation({
    mutationFn: ({ id, ...change }: { id: string; role?: PlatformRole; active?: boolean }) =>
      api(`/api/users/${id}`, { method: 'PATCH', json: change }),
    onSettled: () => queries.invalidateQueries({ queryKey: ['users'] }),
  });
  const revoke = useMutation({
    mutationFn: (id: string) => api(`/api/invitations/${id}`, { method: 'DELETE' }),
    onSettled: () => queries.invalidateQueries({ queryKey: ['invitations'] }),
  });
  const [sorting, setSorting] = useState<SortingState>([{ id: 'name', desc: false }]);

  const columns = useMemo(
    () => [
      column.accessor('name', { header: 'Name' }),
      column.accessor('email', { header: 'E-mail' }),
      column.accessor('role', {
        header: 'Role',
        cell: ({ row }) => (
          <select
            aria-label={`Role of ${row.original.name}`}
            className="field-input py-1"
            value={row.original.role}
            onChange={(e) => update.mutate({ id: row.original.id, role: e.target.value as PlatformRole })}
          >
            {PLATFORM_ROLES.map((r) => (
              <option key={r}>{r}</option>
            ))}
          </select>
        ),
      }),
      column.accessor((u) => (u.deactivatedAt ? 'deactivated' : 'active'), {
        id: 'status',
        header: 'Status',
        cell: ({ getValue }) => (
          <span className={`tag ${getValue() === 'active' ? 'bg-moss-100 text-moss-700' : 'bg-ink-200 text-ink-700'}`}>{getValue()}</span>
        ),
      }),
      column.display({
        id: 'actions',
        header: '',
        cell: ({ row }) =>
          row.original.id === selfId ? (
            <span className="text-xs text-ink-500">you</span>
          ) : (
            <button
              type="button"
              className={row.original.deactivatedAt ? 'btn-quiet py-1' : 'btn-danger py-1'}
              onClick={() => update.mutate({ id: row.original.id, active: Boolean(row.original.deactivatedAt) })}
            >
              {row.original.deactivatedAt ? 'Reactivate' : 'Deactivate'}
            </button>
          ),
      }),
    ],
    [selfId, update],
  );

  const table = useReactTable({
    data: users.data?.users ?? [],
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  return (
    <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
      <section className="panel overflow-x-auto p-4" aria-labelledby="users-heading">
        <h2 id="users-heading" className="mb-3">
          Accounts
        </h2>
        {update.isError && <FormMessage tone="error">{describeError(update.error)}</FormMessage>}
        {users.isPending && <p className="text-sm text-ink-600">Loading accounts…</p>}
        {users.isError && <FormMessage tone="error">{describeError(users.error)}</FormMessage>}
        <table className="data-table" data-testid="users-table">
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <th key={header.id} aria-sort={header.column.getIsSorted() === 'asc' ? 'ascending' : header.column.getIsSorted() === 'desc' ? 'descending' : undefined}>
                    {header.column.getCanSort() ? (
                      <button type="button" className="uppercase" onClick={header.column.getToggleSortingHandler()}>
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        {{ asc: ' ▲', desc: ' ▼' }[header.column.getIsSorted() as string] ?? ''}
                      </button>
                    ) : (
                      flexRender(header.column.columnDef.header, header.getContext())
                    )}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <div className="space-y-6">
        <section className="panel p-4" aria-labelledby="invite-heading">
          <h2 id="invite-heading" className="mb-3">
            Invite someone
          </h2>
          <InviteForm roles={[...PLATFORM_ROLES]} />
        </section>
        <section className="panel p-4" aria-labelledby="pending-heading">
          <h2 id="pending-heading" className="mb-3">
            Open invitations
          </h2>
          {invitations.data?.invitations.length === 0 && <p className="text-sm text-ink-600">No open invitations.</p>}
          <ul className="divide-y divide-ink-100 text-sm">
            {invitations.data?.invitations.map((inv) => (
              <li key={inv.id} className="flex items-center justify-between gap-2 py-2">
                <span>
                  {inv.email} <span className="text-ink-500">({inv.role})</span>
                </span>
                <button type="button" className="btn-quiet py-1" onClick={() => revoke.mutate(inv.id)}>
                  Withdraw
                </button>
              </li>
            ))}
          </ul>
        </section>
      </div>
    </div>
  );
}

export default withQueryClient(UsersAdmin);
