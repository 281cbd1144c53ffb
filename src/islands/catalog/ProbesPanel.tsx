import { createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import { PROBE_KINDS } from '../../lib/clinical/probes';
import type { ProbeRow } from '../../lib/schemas/catalog-admin';
import { CatalogPanel } from './CatalogPanel';
import { ProbeForm } from './ProbeForm';

const col = createColumnHelper<ProbeRow>();

function serviceLabel(r: ProbeRow, today: string): string {
  if (r.inServiceFrom > today) return `From ${r.inServiceFrom}`;
  if (!r.inService) return `Out of service since ${r.inServiceTo}`;
  return r.inServiceTo ? `In service until ${r.inServiceTo}` : 'In service';
}

/** Probes: no active flag of their own; their service dates say when they are in use. */
export function ProbesPanel({ today }: { today: string }) {
  const columns = useMemo(
    () => [
      col.accessor('modelLabel', { header: 'Model label', cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      col.accessor('kind', { header: 'Kind', cell: (c) => PROBE_KINDS[c.getValue()]?.label ?? c.getValue() }),
      col.accessor('serialNumber', { header: 'Serial number', cell: (c) => <span className="font-mono">{c.getValue()}</span> }),
      col.accessor('minFrequencyMhz', { header: 'Band', cell: (c) => <span className="whitespace-nowrap">{`${c.getValue()}–${c.row.original.maxFrequencyMhz} MHz`}</span> }),
      col.accessor('endocavitary', { header: 'Endocavitary', cell: (c) => (c.getValue() ? 'Yes' : 'No') }),
      col.accessor((r) => r.scannerName ?? '', { id: 'scanner', header: 'Scanner', cell: (c) => c.getValue() || 'On the shelf' }),
    ],
    [],
  );
  return (
    <CatalogPanel
      list="probes"
      noun="probe"
      columns={columns}
      initialSort="modelLabel"
      rowName={(r) => `${r.modelLabel} (${r.serialNumber})`}
      status={(r) => ({ inUse: r.inService, label: serviceLabel(r, today) })}
      toggle={(r) => (r.inServiceTo === null ? { label: 'Take out of service', active: false, danger: true } : { label: 'Return to service', active: true })}
      toggled={(r, { row }) => (row.inServiceTo === null ? `${r.modelLabel} (${r.serialNumber}) is back in service.` : `${r.modelLabel} (${r.serialNumber}) is out of service after ${row.inServiceTo}.`)}
      form={({ row, onDone, onCancel }) => <ProbeForm key={row?.id ?? 'new'} row={row} today={today} onDone={onDone} onCancel={onCancel} />}
    />
  );
}
