import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { queryClient } from '../lib/query-client';
import { zonedClock, zonedDate } from '../lib/time';
import { usersQuery } from '../lib/queries/users';
import { ROLES, ROLE_LABELS, type Role } from '../lib/roles';
import type { UserListQuery, UserRow } from '../lib/schemas/users';
import { NewUserForm } from './users/NewUserForm';
import { ManageUser } from './users/ManageUser';
import type { ReferrerChoice } from './users/types';
import { SortableTh } from './table/SortableTh';

interface Props {
  referrers: ReferrerChoice[];
  currentUserId: number;
  /** The clinic's time zone, for showing sign-in times as the clinic reads them. */
  timeZone: string;
}

const col = createColumnHelper<UserRow>();
const PAGE_SIZE = 20;

function StatusPill({ row }: { row: UserRow }) {
  if (!row.active) return <span className="rounded-full bg-ink-100 px-2 py-0.5 text-xs font-semibold text-ink-500">Deactivated</span>;
  if (row.locked) return <span className="rounded-full bg-high-50 px-2 py-0.5 text-xs font-semibold text-high-800">Locked</span>;
  return <span className="rounded-full bg-crest-50 px-2 py-0.5 text-xs font-semibold text-crest-800">Active</span>;
}

function UsersTable({ referrers, currentUserId, timeZone }: Props) {
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'displayName', desc: false }]);
  const [search, setSearch] = useState('');
  const [role, setRole] = useState<Role | ''>('');
  const [creating, setCreating] = useState(false);
  const [managing, setManaging] = useState<UserRow | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  const sort = sorting[0];
  const params: Partial<UserListQuery> = {
    page,
    pageSize: PAGE_SIZE,
    sort: (sort?.id as UserListQuery['sort']) ?? 'displayName',
    dir: sort?.desc ? 'desc' : 'asc',
    q: search || undefined,
    role: role || undefined,
  };
  const { data, isPending, isError, error, isFetching } = useQuery(usersQuery(params));

  const columns = useMemo(
    () => [
      col.accessor('displayName', { header: 'Name', cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      col.accessor('email', { header: 'E-mail' }),
      col.accessor('role', {
        header: 'Role',
        cell: (c) => (
          <span>
            {ROLE_LABELS[c.getValue()]}
            {c.row.original.referrerName && <span className="block text-xs text-ink-500">{c.row.original.referrerName}</span>}
          </span>
        ),
      }),
      col.display({ id: 'status', header: 'Status', cell: (c) => <StatusPill row={c.row.original} /> }),
      col.accessor('lastSignInAt', {
        header: 'Last sign-in',
        cell: (c) => {
          const at = c.getValue();
          return at ? `${zonedDate(new Date(at), timeZone)} ${zonedClock(new Date(at), timeZone)}` : '—';
        },
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        cell: (c) => (
          <button type="button" className="btn-quiet py-1" onClick={() => { setManaging(c.row.original); setNotice(null); }}>
            Manage<span className="sr-only"> {c.row.original.displayName}</span>
          </button>
        ),
      }),
    ],
    [timeZone],
  );

  const table = useReactTable({
    data: data?.rows ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    rowCount: data?.total ?? 0,
    state: { sorting },
    onSortingChange: (updater) => {
      setSorting(updater);
      setPage(1);
    },
    enableSortingRemoval: false,
  });
  const pages = Math.max(1, Math.ceil((data?.total ?? 0) / PAGE_SIZE));

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor="user-search" className="field-label">Search</label>
          <input id="user-search" type="search" className="field-input w-64" placeholder="Name or e-mail" value={search}
            onChange={(e) => { setSearch(e.target.value); setPage(1); }} />
        </div>
        <div>
          <label htmlFor="user-role-filter" className="field-label">Role</label>
          <select id="user-role-filter" className="field-input" value={role} onChange={(e) => { setRole(e.target.value as Role | ''); setPage(1); }}>
            <option value="">All roles</option>
            {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
          </select>
        </div>
        <div className="ml-auto">
          <button type="button" className="btn-primary" onClick={() => { setCreating((v) => !v); setManaging(null); setNotice(null); }} aria-expanded={creating}>
            {creating ? 'Close' : 'New account'}
          </button>
        </div>
      </div>

      {notice && <p role="status" className="rounded-md bg-crest-50 px-3 py-2 text-sm text-crest-800">{notice}</p>}

      {creating && (
        <NewUserForm
          referrers={referrers}
          onCreated={(u) => { setCreating(false); setNotice(`Account created for ${u.displayName}. Hand over the first password in person.`); }}
        />
      )}
      {managing && (
        <ManageUser
          key={managing.id}
          user={managing}
          referrers={referrers}
          isSelf={managing.id === currentUserId}
          onDone={(message) => { setManaging(null); setNotice(message); }}
          onClose={() => setManaging(null)}
        />
      )}

      <div className="card overflow-x-auto">
        <table className="data-table" aria-busy={isFetching}>
          <thead className="bg-ink-50/60">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <SortableTh key={h.id} header={h} sortable={h.column.getCanSort() && h.column.id !== 'status' && h.column.id !== 'actions'} />
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-50">
            {isPending && <tr><td colSpan={6} className="py-6 text-center text-ink-500">Loading accounts…</td></tr>}
            {isError && <tr><td colSpan={6} className="py-6 text-center text-high-800" role="alert">{(error as Error).message}</td></tr>}
            {data && data.rows.length === 0 && <tr><td colSpan={6} className="py-6 text-center text-ink-500">No accounts match.</td></tr>}
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id}>
                {row.getVisibleCells().map((cell) => <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
        <div className="flex items-center justify-between border-t border-ink-100 px-4 py-2 text-sm text-ink-600">
          <span>{data ? `${data.total} account${data.total === 1 ? '' : 's'}` : ' '}</span>
          <span className="flex items-center gap-2">
            <button type="button" className="btn-quiet py-1" disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>Previous</button>
            <span>Page {page} of {pages}</span>
            <button type="button" className="btn-quiet py-1" disabled={page >= pages} onClick={() => setPage((p) => p + 1)}>Next</button>
          </span>
        </div>
      </div>
    </div>
  );
}

export default function UsersAdmin(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <UsersTable {...props} />
    </QueryClientProvider>
  );
}
