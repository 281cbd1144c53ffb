import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { ApiError } from '../../lib/api-client';
import type { ActiveChangeResult } from '../../lib/schemas/catalog-admin';
import { catalogQuery, setActive, type CatalogList, type CatalogRows } from './queries';
import { SortableTh } from '../table/SortableTh';

export interface Toggle {
  /** The button's words, e.g. "Deactivate". */
  label: string;
  /** The active flag the button asks for. */
  active: boolean;
  danger?: boolean;
}

interface Props<L extends CatalogList> {
  list: L;
  /** What one row is, for headings: "exam type". */
  noun: string;
  /** Its data columns; status and actions are added here. (`any`: each column has its own value type, as TanStack's docs do it.) */
  columns: Array<ColumnDef<CatalogRows[L], any>>;
  initialSort: string;
  rowName: (row: CatalogRows[L]) => string;
  status: (row: CatalogRows[L]) => { inUse: boolean; label: string };
  toggle: (row: CatalogRows[L]) => Toggle;
  /** What the notice says after a (de)activation. */
  toggled: (row: CatalogRows[L], result: ActiveChangeResult<CatalogRows[L]>) => string;
  form: (props: { row?: CatalogRows[L]; onDone: (message: string) => void; onCancel: () => void }) => ReactNode;
}

/** One tab of the catalog: its list (sortable), a form to add or edit, and (de)activation per row. */
export function CatalogPanel<L extends CatalogList>({ list, noun, columns, initialSort, rowName, status, toggle, toggled, form }: Props<L>) {
  type Row = CatalogRows[L];
  const client = useQueryClient();
  const { data, isPending, isError, error, isFetching } = useQuery(catalogQuery(list));
  const [sorting, setSorting] = useState<SortingState>([{ id: initialSort, desc: false }]);
  const [editing, setEditing] = useState<Row | 'new' | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const formBox = useRef<HTMLDivElement>(null);
  // The form opens above the list: bring it into view when Edit was pressed far down.
  useEffect(() => {
    if (editing !== null) formBox.current?.scrollIntoView({ block: 'nearest', behavior: 'smooth' });
  }, [editing]);

  const change = useMutation({
    mutationFn: ({ row, active }: { row: Row; active: boolean }) => setActive(list, row, active),
    // Also after a refusal: a stale version means the list is out of date.
    onSettled: () => void client.invalidateQueries({ queryKey: ['catalog'] }),
  });
  const run = async (row: Row, active: boolean) => {
    setNotice(null);
    setProblem(null);
    try {
      setNotice(toggled(row, await change.mutateAsync({ row, active })));
    } catch (e) {
      setProblem(e instanceof ApiError ? e.message : 'The change could not be saved. Nothing was changed.');
    }
  };
  const open = (target: Row | 'new') => {
    setEditing(target);
    setNotice(null);
    setProblem(null);
  };

  const allColumns = useMemo<Array<ColumnDef<Row, unknown>>>(
    () => [
      ...columns,
      {
        id: 'status',
        header: 'Status',
        enableSorting: false,
        cell: (c) => {
          const s = status(c.row.original);
          return (
            <span className={`rounded-full px-2 py-0.5 text-xs font-semibold whitespace-nowrap ${s.inUse ? 'bg-crest-50 text-crest-800' : 'bg-ink-100 text-ink-500'}`}>{s.label}</span>
          );
        },
      },
      {
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        enableSorting: false,
        cell: (c) => {
          const row = c.row.original;
          const t = toggle(row);
          return (
            <span className="flex justify-end gap-2 whitespace-nowrap">
              <button type="button" className="btn-quiet py-1" onClick={() => open(row)}>
                Edit<span className="sr-only"> {rowName(row)}</span>
              </button>
              <button type="button" className={`btn-quiet py-1 ${t.danger ? 'text-high-800' : ''}`} disabled={change.isPending} onClick={() => void run(row, t.active)}>
                {t.label}<span className="sr-only"> {rowName(row)}</span>
              </button>
            </span>
          );
        },
      },
    ],
    // The callbacks are the panel's own and fixed; only the columns and the pending state change.
    [columns, change.isPending],
  );

  const table = useReactTable({
    data: data ?? [],
    columns: allColumns,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    state: { sorting },
    onSortingChange: setSorting,
    enableSortingRemoval: false,
  });
  const span = allColumns.length;

  return (
    <div className="space-y-4">
      <div className="flex items-center justify-between gap-3">
        <p className="text-sm text-ink-500">{data ? `${data.length} ${noun}${data.length === 1 ? '' : 's'}, ${data.filter((r) => status(r).inUse).length} in use` : ' '}</p>
        <button type="button" className="btn-primary" aria-expanded={editing === 'new'} onClick={() => (editing === 'new' ? setEditing(null) : open('new'))}>
          {editing === 'new' ? 'Close' : `New ${noun}`}
        </button>
      </div>

      {notice && <p role="status" className="rounded-md bg-crest-50 px-3 py-2 text-sm text-crest-800">{notice}</p>}
      {problem && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{problem}</p>}

      <div ref={formBox} className="scroll-mt-4">
        {editing !== null &&
          form({
            row: editing === 'new' ? undefined : editing,
            onDone: (message) => {
              setEditing(null);
              setNotice(message);
            },
            onCancel: () => setEditing(null),
          })}
      </div>

      <div className="card overflow-x-auto">
        <table className="data-table" aria-busy={isFetching} aria-label={`${noun[0]!.toUpperCase()}${noun.slice(1)}s`}>
          <thead className="bg-ink-50/60">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <SortableTh key={h.id} header={h} sortable={h.column.getCanSort()} />
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-50">
            {isPending && <tr><td colSpan={span} className="py-6 text-center text-ink-500">Loading…</td></tr>}
            {isError && <tr><td colSpan={span} className="py-6 text-center text-high-800" role="alert">{(error as Error).message}</td></tr>}
            {data && data.length === 0 && <tr><td colSpan={span} className="py-6 text-center text-ink-500">Nothing here yet.</td></tr>}
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={status(row.original).inUse ? undefined : 'bg-ink-50/40 text-ink-500'}>
                {row.getVisibleCells().map((cell) => <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
