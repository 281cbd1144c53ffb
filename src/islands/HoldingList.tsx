import { QueryClientProvider, useQuery, useQueryClient } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { Fragment, useMemo, useState } from 'react';
import { heldQuery } from '../lib/queries/holding';
import { queryClient } from '../lib/query-client';
import type { HeldObject } from '../lib/schemas/holding';
import { AttachPanel } from './holding/AttachPanel';
import { DiscardPanel } from './holding/DiscardPanel';

interface Props {
  /** Front desk and manager attach and discard; the server checks the role again. */
  canAct: boolean;
  /** Roles that may see images get the thumbnails (the front desk sees identifiers only). */
  showThumbnails: boolean;
}

type Open = { id: number; mode: 'attach' | 'discard' } | null;
const col = createColumnHelper<HeldObject>();

/** What to call a held object in a label, e.g. "A2612020007" or "patient ID P0000012". */
const nameOf = (h: HeldObject) => h.accessionNumber ?? (h.patientId ? `patient ID ${h.patientId}` : `object ${h.id}`);

function Identifiers({ h }: { h: HeldObject }) {
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-3 text-xs">
      <dt className="text-ink-500">Patient ID</dt>
      <dd className="font-mono text-ink-900">{h.patientId ?? '(none)'}</dd>
      <dt className="text-ink-500">Accession</dt>
      <dd className="font-mono text-ink-900">{h.accessionNumber ?? '(none)'}</dd>
      <dt className="text-ink-500">Study UID</dt>
      <dd className="max-w-56 truncate font-mono text-ink-700" title={h.studyInstanceUid ?? undefined}>{h.studyInstanceUid ?? '(none)'}</dd>
      <dt className="text-ink-500">Object</dt>
      <dd className="text-ink-700">{[h.modality, h.sopClassName].filter(Boolean).join(' · ') || 'DICOM'}{h.acquiredLabel ? `, acquired ${h.acquiredLabel}` : ''}</dd>
    </dl>
  );
}

function Thumbnail({ h, show }: { h: HeldObject; show: boolean }) {
  if (show && h.thumbnailUrl) return <img src={h.thumbnailUrl} alt={`First frame of ${nameOf(h)}`} loading="lazy" className="h-16 w-20 rounded bg-ink-900 object-contain" />;
  return <span className="flex h-16 w-20 items-center justify-center rounded bg-ink-800 text-xs font-semibold tracking-wide text-ink-100" aria-hidden="true">DICOM</span>;
}

function Held({ canAct, showThumbnails }: Props) {
  const client = useQueryClient();
  const { data, isPending, isError, error, dataUpdatedAt } = useQuery(heldQuery());
  const [open, setOpen] = useState<Open>(null);
  const [notice, setNotice] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const finish = (tone: 'ok' | 'error') => (text: string) => {
    setOpen(null);
    setNotice({ tone, text });
    void client.invalidateQueries({ queryKey: heldQuery().queryKey });
  };

  const columns = useMemo(
    () => [
      col.display({ id: 'image', header: 'Image', cell: (c) => <Thumbnail h={c.row.original} show={showThumbnails} /> }),
      col.display({ id: 'identifiers', header: 'In the file', cell: (c) => <Identifiers h={c.row.original} /> }),
      col.accessor('heldReason', { header: 'Why it is held', cell: (c) => <span className="block max-w-72 text-sm text-ink-800">{c.getValue() ?? 'No exam matched.'}</span> }),
      col.accessor('receivedLabel', {
        header: 'Received',
        cell: (c) => (
          <span className="text-sm whitespace-nowrap">
            {c.getValue()}
            <span className="block text-xs text-ink-500">from <span className="font-mono">{c.row.original.receivedFrom ?? 'unknown scanner'}</span></span>
          </span>
        ),
      }),
      ...(canAct
        ? [
            col.display({
              id: 'actions',
              header: () => <span className="sr-only">Actions</span>,
              cell: (c) => {
                const h = c.row.original;
                const toggle = (mode: 'attach' | 'discard') => {
                  setNotice(null);
                  setOpen((o) => (o?.id === h.id && o.mode === mode ? null : { id: h.id, mode }));
                };
                return (
                  <span className="flex flex-col gap-1">
                    <button type="button" className="btn-primary py-1 whitespace-nowrap" aria-expanded={open?.id === h.id && open.mode === 'attach'} onClick={() => toggle('attach')}>
                      Attach to exam<span className="sr-only"> ({nameOf(h)})</span>
                    </button>
                    <button type="button" className="btn-quiet py-1" aria-expanded={open?.id === h.id && open.mode === 'discard'} onClick={() => toggle('discard')}>
                      Discard<span className="sr-only"> ({nameOf(h)})</span>
                    </button>
                  </span>
                );
              },
            }),
          ]
        : []),
    ],
    [canAct, showThumbnails, open],
  );
  const table = useReactTable({ data: data?.rows ?? [], columns, getCoreRowModel: getCoreRowModel(), getRowId: (r) => String(r.id) });
  const width = columns.length;

  return (
    <div className="space-y-4">
      <p className="text-xs text-ink-500" aria-live="polite">
        {data ? `${data.total} waiting` : ' '} · updated {dataUpdatedAt ? new Date(dataUpdatedAt).toLocaleTimeString([], { hour: '2-digit', minute: '2-digit', second: '2-digit' }) : '…'}
      </p>
      {notice && <p role={notice.tone === 'ok' ? 'status' : 'alert'} className={`rounded-md px-3 py-2 text-sm ${notice.tone === 'ok' ? 'bg-crest-50 text-crest-800' : 'bg-high-50 text-high-800'}`}>{notice.text}</p>}

      {data && data.rows.length === 0 ? (
        <p className="card px-4 py-6 text-center text-sm text-ink-500">Nothing is waiting. Objects a scanner sends that match no exam appear here.</p>
      ) : (
        <div className="card overflow-x-auto">
          <table className="data-table" aria-label="Held for matching">
            <thead className="bg-ink-50/60">
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>{hg.headers.map((h) => <th key={h.id} scope="col">{flexRender(h.column.columnDef.header, h.getContext())}</th>)}</tr>
              ))}
            </thead>
            <tbody className="divide-y divide-ink-50">
              {isPending && <tr><td colSpan={width} className="py-6 text-center text-ink-500">Loading the list…</td></tr>}
              {isError && <tr><td colSpan={width} className="py-6 text-center text-high-800" role="alert">{(error as Error).message}</td></tr>}
              {table.getRowModel().rows.map((row) => {
                const h = row.original;
                const panel = open?.id === h.id ? open.mode : null;
                const props = { held: h, onDone: finish('ok'), onGone: finish('error'), onClose: () => setOpen(null) };
                return (
                  <Fragment key={row.id}>
                    <tr className="align-top">{row.getVisibleCells().map((cell) => <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>)}</tr>
                    {panel && (
                      <tr>
                        <td colSpan={width} className="bg-ink-50/40">
                          <section aria-label={`${panel === 'attach' ? 'Attach' : 'Discard'} ${nameOf(h)}`} className="max-w-3xl">
                            {panel === 'attach' ? <AttachPanel {...props} /> : <DiscardPanel {...props} />}
                          </section>
                        </td>
                      </tr>
                    )}
                  </Fragment>
                );
              })}
            </tbody>
          </table>
          {data && data.total > data.rows.length && (
            <p className="border-t border-ink-100 px-4 py-2 text-sm text-ink-600">Showing the newest {data.rows.length} of {data.total}. Attach or discard these to see the rest.</p>
          )}
        </div>
      )}
    </div>
  );
}

export default function HoldingList(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <Held {...props} />
    </QueryClientProvider>
  );
}
