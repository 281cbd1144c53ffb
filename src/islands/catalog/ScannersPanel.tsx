import { createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import type { ScannerRow } from '../../lib/schemas/catalog-admin';
import { CatalogPanel } from './CatalogPanel';
import { ScannerForm } from './ScannerForm';

const col = createColumnHelper<ScannerRow>();
const exams = (n: number) => `${n} booked exam${n === 1 ? '' : 's'}`;

/** Scanners: only active ones are booked, listed in the DICOM worklist and let in by the listener. */
export function ScannersPanel() {
  const columns = useMemo(
    () => [
      col.accessor('name', { header: 'Name', cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      col.accessor('roomName', { header: 'Room' }),
      col.accessor('aeTitle', { header: 'AE title', cell: (c) => <span className="font-mono">{c.getValue()}</span> }),
      col.accessor('upcomingExams', { header: 'Upcoming exams' }),
    ],
    [],
  );
  return (
    <CatalogPanel
      list="scanners"
      noun="scanner"
      columns={columns}
      initialSort="name"
      rowName={(r) => r.name}
      status={(r) => ({ inUse: r.active, label: r.active ? 'In use' : 'Deactivated' })}
      toggle={(r) => (r.active ? { label: 'Deactivate', active: false, danger: true } : { label: 'Reactivate', active: true })}
      toggled={(r, { row, upcomingExams = 0 }) =>
        row.active
          ? `${r.name} is in use again; the listener lets ${r.aeTitle} in within a few seconds.`
          : `${r.name} is deactivated: no longer booked or in the DICOM worklist, and ${r.aeTitle} is refused within a few seconds.` +
            (upcomingExams > 0 ? ` ${exams(upcomingExams)} still name it; move them to another scanner.` : '')
      }
      form={({ row, onDone, onCancel }) => <ScannerForm key={row?.id ?? 'new'} row={row} onDone={onDone} onCancel={onCancel} />}
    />
  );
}
