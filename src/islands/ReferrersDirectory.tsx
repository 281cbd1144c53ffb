import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { queryClient } from '../lib/query-client';
import { referrersQuery } from '../lib/queries/referrers';
import type { ReferrerListParams, ReferrerRow } from '../lib/schemas/referrers';
import { ReferrerForm } from './referrers/ReferrerForm';
import { SortableTh } from './table/SortableTh';

const col = createColumnHelper<ReferrerRow>();
const PAGE_SIZE = 20;
const SORTABLE = new Set(['name', 'practice', 'email']);
type Shown = 'true' | 'false' | '';

function ReferrersTable() {
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'name', desc: false }]);
  const [search, setSearch] = useState('');
  const [shown, setShown] = useState<Shown>('true');
  const [creating, setCreating] = useState(false);
  const [editing, setEditing] = useState<ReferrerRow | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  const sort = sorting[0];
  const params: Partial<ReferrerListParams> = {
    page,
    pageSize: PAGE_SIZE,
    sort: (sort?.id as ReferrerListParams['sort']) ?? 'name',
    dir: sort?.desc ? 'desc' : 'asc',
    q: search.trim() || undefined,
    active: shown || undefined,
  };
  const { data, isPending, isError, error, isFetching } = useQuery(referrersQuery(params));

  const columns = useMemo(
    () => [
      col.accessor('name', { header: 'Name', cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      col.accessor('practice', { header: 'Practice' }),
      col.accessor('email', { header: 'E-mail' }),
      col.accessor('phone', { header: 'Phone', enableSorting: false, cell: (c) => <span className="whitespace-nowrap">{c.getValue() ?? '—'}</span> }),
      col.accessor('active', {
        header: 'Status',
        enableSorting: false,
        cell: (c) =>
          c.getValue() ? (
            <span className="rounded-full bg-crest-50 px-2 py-0.5 text-xs font-semibold text-crest-800">Active</span>
          ) : (
            <span className="rounded-full bg-ink-100 px-2 py-0.5 text-xs font-semibold text-ink-500">Deactivated</span>
          ),
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        cell: (c) => (
          <button type="button" className="btn-quiet py-1" onClick={() => { setEditing(c.row.original); setCreating(false); setNotice(null); }}>
            Edit<span className="sr-only"> {c.row.original.name}</span>
          </button>
        ),
      }),
    ],
    [],
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
        <div role="search">
          <label htmlFor="referrer-search" className="field-label">Search</label>
          <input id="referrer-search" type="search" className="field-input w-72" placeholder="Name, practice or e-mail" autoComplete="off" value={search}
            onChange={(e) => { setSearch(e.target.value); setPage(1); }} />
        </div>
        <div>
          <label htmlFor="referrer-shown" className="field-label">Show</label>
          <select id="referrer-shown" className="field-input" value={shown} onChange={(e) => { setShown(e.target.value as Shown); setPage(1); }}>
            <option value="true">Active</option>
            <option value="false">Deactivated</option>
            <option value="">All</option>
          </select>
        </div>
        <div className="ml-auto">
          <button type="button" className="btn-primary" aria-expanded={creating} onClick={() => { setCreating((v) => !v); setEditing(null); setNotice(null); }}>
            {creating ? 'Close' : 'New referring clinician'}
          </button>
        </div>
      </div>

      {notice && <p role="status" className="rounded-md bg-crest-50 px-3 py-2 text-sm text-crest-800">{notice}</p>}
      {creating && <ReferrerForm onDone={(m) => { setCreating(false); setNotice(m); }} onCancel={() => setCreating(false)} />}
      {editing && (
        <ReferrerForm key={editing.id} referrer={editing} onDone={(m) => { setEditing(null); setNotice(m); }} onCancel={() => setEditing(null)} />
      )}

      <div className="card overflow-x-auto">
        <table className="data-table" aria-busy={isFetching}>
          <caption className="sr-only">Referring clinicians</caption>
          <thead className="bg-ink-50/60">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <SortableTh key={h.id} header={h} sortable={SORTABLE.has(h.column.id)} />
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-50">
            {isPending && <tr><td colSpan={6} className="py-6 text-center text-ink-500">Loading the directory…</td></tr>}
            {isError && <tr><td colSpan={6} className="py-6 text-center text-high-800" role="alert">{(error as Error).message}</td></tr>}
            {data && data.rows.length === 0 && <tr><td colSpan={6} className="py-6 text-center text-ink-500">No referring clinician matches.</td></tr>}
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id}>
                {row.getVisibleCells().map((cell) => <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
        <div className="flex items-center justify-between border-t border-ink-100 px-4 py-2 text-sm text-ink-600">
          <span>{data ? `${data.total} entr${data.total === 1 ? 'y' : 'ies'}` : ' '}</span>
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

export default function ReferrersDirectory() {
  return (
    <QueryClientProvider client={queryClient}>
      <ReferrersTable />
    </QueryClientProvider>
  );
}
