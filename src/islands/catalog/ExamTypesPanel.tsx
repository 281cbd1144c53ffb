import { createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import { formatMoney } from '../../lib/booking/refunds';
import { PROBE_KINDS } from '../../lib/clinical/probes';
import type { ExamTypeRow } from '../../lib/schemas/catalog-admin';
import { CatalogPanel } from './CatalogPanel';
import { ExamTypeForm, type TemplateChoice } from './ExamTypeForm';

const col = createColumnHelper<ExamTypeRow>();

/** Exam types: what can be booked, for how long, at what self-pay price, with which template. */
export function ExamTypesPanel({ templates, currency }: { templates: TemplateChoice[]; currency: string }) {
  const columns = useMemo(
    () => [
      col.accessor('name', { header: 'Name', cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      col.accessor('templateId', { header: 'Template', cell: (c) => templates.find((t) => t.id === c.getValue())?.title ?? c.getValue() }),
      col.accessor('durationMinutes', { header: 'Duration', cell: (c) => `${c.getValue()} min` }),
      col.accessor('probeKind', { header: 'Probe', cell: (c) => PROBE_KINDS[c.getValue()]?.label ?? c.getValue() }),
      col.accessor('selfPayPriceCents', { header: 'Self-pay price', cell: (c) => formatMoney(c.getValue(), c.row.original.currency) }),
      col.accessor('depositCents', { header: 'Deposit', cell: (c) => formatMoney(c.getValue(), c.row.original.currency) }),
      col.accessor('examCount', { header: 'Exams', cell: (c) => c.getValue() }),
    ],
    [templates],
  );
  return (
    <CatalogPanel
      list="exam-types"
      noun="exam type"
      columns={columns}
      initialSort="name"
      rowName={(r) => r.name}
      status={(r) => ({ inUse: r.active, label: r.active ? 'Bookable' : 'Deactivated' })}
      toggle={(r) => (r.active ? { label: 'Deactivate', active: false, danger: true } : { label: 'Reactivate', active: true })}
      toggled={(r, { row }) =>
        row.active ? `${r.name} can be booked again.` : `${r.name} is deactivated: it is no longer offered for booking. Exams already booked keep it.`
      }
      form={({ row, onDone, onCancel }) => <ExamTypeForm key={row?.id ?? 'new'} row={row} templates={templates} currency={currency} onDone={onDone} onCancel={onCancel} />}
    />
  );
}
