import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useEffect, useMemo, useState } from 'react';
import { queryClient } from '../lib/query-client';
import { patientsQuery } from '../lib/queries/patients';
import { describePatientSearch, formatIsoDate } from '../lib/schemas/patient-search';
import { patientName, SEX_LABELS, type PatientListQuery, type PatientSummary } from '../lib/schemas/patients';
import { PatientForm } from './patients/PatientForm';
import { SortableTh } from './table/SortableTh';

interface Props {
  /** Front desk and manager register patients; other roles only look them up. */
  canCreate: boolean;
}

const col = createColumnHelper<PatientSummary>();
const PAGE_SIZE = 20;
const SORTABLE = new Set(['name', 'mrn', 'birthDate']);

/** The search text, settled: the list follows typing after a short pause, not every key. */
function useSettled(value: string, ms = 250): string {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return settled;
}

function PatientsList({ canCreate }: Props) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'name', desc: false }]);
  const [text, setText] = useState('');
  const [creating, setCreating] = useState(false);
  const search = useSettled(text.trim());
  // The page belongs to one search: new search text starts again at page 1.
  const [paging, setPaging] = useState({ search, page: 1 });
  const page = paging.search === search ? paging.page : 1;
  const setPage = (next: (p: number) => number) => setPaging({ search, page: next(page) });

  const sort = sorting[0];
  const params: Partial<PatientListQuery> = {
    page,
    pageSize: PAGE_SIZE,
    sort: (sort?.id as PatientListQuery['sort']) ?? 'name',
    dir: sort?.desc ? 'desc' : 'asc',
    q: search || undefined,
  };
  const { data, isPending, isError, error, isFetching } = useQuery(patientsQuery(params));

  const columns = useMemo(
    () => [
      col.accessor((p) => patientName(p), {
        id: 'name',
        header: 'Name',
        cell: (c) => (
          <a href={`/patients/${c.row.original.id}`} className="font-medium text-crest-700 underline-offset-2 hover:underline">
            {c.getValue()}
          </a>
        ),
      }),
      col.accessor('mrn', { header: 'MRN', cell: (c) => <span className="font-mono text-xs">{c.getValue()}</span> }),
      col.accessor('birthDate', { header: 'Birth date', cell: (c) => <span className="whitespace-nowrap">{formatIsoDate(c.getValue())}</span> }),
      col.accessor('sex', { header: 'Sex', enableSorting: false, cell: (c) => SEX_LABELS[c.getValue()] }),
      col.accessor('city', { header: 'City', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
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
      setPage(() => 1);
    },
    enableSortingRemoval: false,
  });
  const pages = Math.max(1, Math.ceil((data?.total ?? 0) / PAGE_SIZE));

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end gap-3">
        <div role="search" className="w-full max-w-md">
          <label htmlFor="patient-search" className="field-label">Find a patient</label>
          <input
            id="patient-search"
            type="search"
            className="field-input"
            placeholder="Morgan Alice · P0000012 · 12/03/1980"
            autoComplete="off"
            aria-describedby="patient-search-hint"
            value={text}
            onChange={(e) => setText(e.target.value)}
          />
          <p id="patient-search-hint" className="mt-1 text-xs text-ink-500">
            Name (start of family or given name, any order), MRN, or birth date as 1980-03-12, 12/03/1980 (day first) or 12 Mar 1980.
          </p>
        </div>
        {canCreate && (
          <div className="ml-auto">
            <button type="button" className="btn-primary" aria-expanded={creating} onClick={() => setCreating((v) => !v)}>
              {creating ? 'Close' : 'New patient'}
            </button>
          </div>
        )}
      </div>

      {creating && (
        <PatientForm
          onSaved={(p) => window.location.assign(`/patients/${p.id}?created=1`)}
          onCancel={() => setCreating(false)}
        />
      )}

      <div className="card overflow-x-auto">
        <p className="px-4 pt-3 text-xs text-ink-500" role="status" aria-live="polite">
          {!data ? ' ' : data.search.kind === 'invalidDate' ? `${text.trim()}: ${describePatientSearch(data.search)}` : `${describePatientSearch(data.search)} — ${data.total} found`}
        </p>
        <table className="data-table" aria-busy={isFetching}>
          <caption className="sr-only">Patients</caption>
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
            {isPending && <tr><td colSpan={5} className="py-6 text-center text-ink-500">Loading patients…</td></tr>}
            {isError && <tr><td colSpan={5} className="py-6 text-center text-high-800" role="alert">{(error as Error).message}</td></tr>}
            {data && data.rows.length === 0 && (
              <tr><td colSpan={5} className="py-6 text-center text-ink-500">No patient matches. Check the spelling, or search by MRN or birth date.</td></tr>
            )}
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id}>
                {row.getVisibleCells().map((cell) => <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
        <div className="flex items-center justify-between border-t border-ink-100 px-4 py-2 text-sm text-ink-600">
          <span>{data ? `${data.total} patient${data.total === 1 ? '' : 's'}` : ' '}</span>
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

export default function PatientsDirectory(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <PatientsList {...props} />
    </QueryClientProvider>
  );
}
