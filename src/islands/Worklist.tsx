import { QueryClientProvider, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { api, ApiError } from '../lib/api-client';
import { EXAM_STATUSES, EXAM_STATUS_LABELS, type ExamStatus } from '../lib/exam-status';
import { queryClient } from '../lib/query-client';
import { worklistQuery } from '../lib/queries/exams';
import type { WorklistQuery, WorklistRow } from '../lib/schemas/exams';
import { addDays, formatDay } from '../lib/time';
import { PaymentLabel, StatusPill } from './worklist/badges';
import { SortableTh } from './table/SortableTh';

interface Props {
  today: string;
  /** The day to open on (?day= in the address), default today. */
  initialDay?: string;
  rooms: Array<{ id: number; name: string }>;
  sonographers: Array<{ id: number; name: string }>;
  /** Front desk and manager may check patients in from the list. */
  canCheckIn: boolean;
  /** Sonographers (and the manager) start the scan of an arrived exam from the list. */
  canStart?: boolean;
  /** Open on one sonographer's exams (a sonographer's own list). */
  initialSonographerId?: number;
  showPayment: boolean;
  initialRoomId?: number;
}

const col = createColumnHelper<WorklistRow>();
const PAGE_SIZE = 25;

function WorklistTable({ today, initialDay, rooms, sonographers, canCheckIn, canStart = false, initialSonographerId, showPayment, initialRoomId }: Props) {
  const client = useQueryClient();
  const [day, setDay] = useState(initialDay ?? today);
  const [roomId, setRoomId] = useState<number | undefined>(initialRoomId);
  const [sonographerId, setSonographerId] = useState<number | undefined>(initialSonographerId);
  const [status, setStatus] = useState<ExamStatus | undefined>();
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'time', desc: false }]);
  const [notice, setNotice] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);

  const params: Partial<WorklistQuery> = {
    day, roomId, sonographerId, status, page, pageSize: PAGE_SIZE,
    sort: (sorting[0]?.id as WorklistQuery['sort']) ?? 'time',
    dir: sorting[0]?.desc ? 'desc' : 'asc',
  };
  const { data, isPending, isError, error, dataUpdatedAt } = useQuery(worklistQuery(params));

  const checkIn = useMutation({
    mutationFn: (row: WorklistRow) => api(`/api/exams/${row.id}/status`, { method: 'POST', body: { version: row.version, to: 'arrived' } }),
    onSuccess: (_d, row) => setNotice({ tone: 'ok', text: `${row.patientName} is checked in.` }),
    onError: (e) => setNotice({ tone: 'error', text: e instanceof ApiError ? e.message : 'Check-in failed.' }),
    onSettled: () => client.invalidateQueries({ queryKey: ['worklist'] }),
  });

  const start = useMutation({
    mutationFn: (row: WorklistRow) => api<{ reportId: number }>(`/api/exams/${row.id}/start`, { method: 'POST', body: { version: row.version } }),
    onSuccess: (_d, row) => window.location.assign(`/exams/${row.id}/report`),
    onError: (e) => setNotice({ tone: 'error', text: e instanceof ApiError ? e.message : 'The scan could not be started.' }),
    onSettled: () => client.invalidateQueries({ queryKey: ['worklist'] }),
  });

  const columns = useMemo(
    () => [
      col.accessor('time', {
        id: 'time',
        header: 'Time',
        cell: (c) => (
          <span className="font-medium whitespace-nowrap">
            {c.getValue()}
            {c.row.original.priority === 'urgent' && <span className="ml-2 rounded bg-high-50 px-1.5 text-xs font-semibold text-high-800">Urgent</span>}
          </span>
        ),
      }),
      col.accessor('patientName', {
        id: 'patient',
        header: 'Patient',
        cell: (c) => (
          <a className="font-medium text-ink-900 hover:text-crest-700 hover:underline" href={`/exams/${c.row.original.id}`}>
            {c.getValue()}
            <span className="block text-xs font-normal text-ink-500">{c.row.original.mrn} · {c.row.original.accessionNumber}</span>
          </a>
        ),
      }),
      col.accessor('examType', { id: 'examType', header: 'Exam' }),
      col.accessor('room', { id: 'room', header: 'Room', cell: (c) => <span>{c.getValue()}<span className="block text-xs text-ink-500">{c.row.original.sonographer}</span></span> }),
      col.accessor('status', { id: 'status', header: 'Status', cell: (c) => <StatusPill status={c.getValue()} /> }),
      ...(showPayment ? [col.accessor('paymentState', { id: 'payment', header: 'Payment', cell: (c) => <PaymentLabel state={c.getValue()} /> })] : []),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        cell: (c) => {
          const row = c.row.original;
          if (canCheckIn && row.status === 'booked') {
            return (
              <button type="button" className="btn-quiet py-1" disabled={checkIn.isPending} onClick={() => checkIn.mutate(row)}>
                Check in<span className="sr-only"> {row.patientName}</span>
              </button>
            );
          }
          if (canStart && row.status === 'arrived') {
            return (
              <button type="button" className="btn-primary py-1" disabled={start.isPending} onClick={() => start.mutate(row)}>
                Start scan<span className="sr-only"> {row.patientName}</span>
              </button>
            );
          }
          if (canStart && (row.status === 'in-progress' || row.status === 'completed')) {
            return (
              <a className="btn-quiet py-1" href={`/exams/${row.id}/report`}>
                {row.status === 'in-progress' ? 'Open report' : 'View report'}<span className="sr-only"> {row.patientName}</span>
              </a>
            );
          }
          return null;
        },
      }),
    ],
    [canCheckIn, canStart, showPayment, checkIn, start],
  );

  const table = useReactTable({
    data: data?.rows ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    rowCount: data?.total ?? 0,
    state: { sorting },
    onSortingChange: (u) => { setSorting(u); setPage(1); },
    enableSortingRemoval: false,
  });
  const pages = Math.max(1, Math.ceil((data?.total ?? 0) / PAGE_SIZE));
  const resetPage = <T,>(set: (v: T) => void) => (v: T) => { set(v); setPage(1); };

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end gap-3">
        <div className="flex items-end gap-1">
          <button type="button" className="btn-quiet px-2" aria-label="Previous day" onClick={() => resetPage(setDay)(addDays(day, -1))}>‹</button>
          <div>
            <label htmlFor="wl-day" className="field-label">Day</label>
            <input id="wl-day" type="date" className="field-input" value={day} onChange={(e) => e.target.value && resetPage(setDay)(e.target.value)} />
          </div>
          <button type="button" className="btn-quiet px-2" aria-label="Next day" onClick={() => resetPage(setDay)(addDays(day, 1))}>›</button>
          {day !== today && <button type="button" className="btn-quiet ml-1" onClick={() => resetPage(setDay)(today)}>Today</button>}
        </div>
        <div>
          <label htmlFor="wl-room" className="field-label">Room</label>
          <select id="wl-room" className="field-input" value={roomId ?? ''} onChange={(e) => resetPage(setRoomId)(e.target.value ? Number(e.target.value) : undefined)}>
            <option value="">All rooms</option>
            {rooms.map((r) => <option key={r.id} value={r.id}>{r.name}</option>)}
          </select>
        </div>
        <div>
          <label htmlFor="wl-status" className="field-label">Status</label>
          <select id="wl-status" className="field-input" value={status ?? ''} onChange={(e) => resetPage(setStatus)((e.target.value || undefined) as ExamStatus | undefined)}>
            <option value="">Any status</option>
            {EXAM_STATUSES.map((s) => <option key={s} value={s}>{EXAM_STATUS_LABELS[s]}</option>)}
          </select>
        </div>
        <div>
          <label htmlFor="wl-sono" className="field-label">Sonographer</label>
          <select id="wl-sono" className="field-input" value={sonographerId ?? ''} onChange={(e) => resetPage(setSonographerId)(e.target.value ? Number(e.target.value) : undefined)}>
            <option value="">Anyone</option>
            {sonographers.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </select>
        </div>
        <p className="ml-auto text-xs text-ink-500" aria-live="polite">{formatDay(day)} · updated {dataUpdatedAt ? new Date(dataUpdatedAt).toLocaleTimeString([], { hour: '2-digit', minute: '2-digit', second: '2-digit' }) : '…'}</p>
      </div>

      {notice && <p role={notice.tone === 'ok' ? 'status' : 'alert'} className={`rounded-md px-3 py-2 text-sm ${notice.tone === 'ok' ? 'bg-crest-50 text-crest-800' : 'bg-high-50 text-high-800'}`}>{notice.text}</p>}

      <div className="card overflow-x-auto">
        <table className="data-table" aria-label="Worklist">
          <thead className="bg-ink-50/60">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <SortableTh key={h.id} header={h} sortable={h.column.id !== 'actions'} />
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-50">
            {isPending && <tr><td colSpan={7} className="py-6 text-center text-ink-500">Loading the list…</td></tr>}
            {isError && <tr><td colSpan={7} className="py-6 text-center text-high-800" role="alert">{(error as Error).message}</td></tr>}
            {data && data.rows.length === 0 && <tr><td colSpan={7} className="py-6 text-center text-ink-500">No exams match.</td></tr>}
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={row.original.status === 'cancelled' ? 'opacity-60' : undefined}>
                {row.getVisibleCells().map((cell) => <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
        <div className="flex items-center justify-between border-t border-ink-100 px-4 py-2 text-sm text-ink-600">
          <span>{data ? `${data.total} exam${data.total === 1 ? '' : 's'}` : ' '}</span>
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

export default function Worklist(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <WorklistTable {...props} />
    </QueryClientProvider>
  );
}
