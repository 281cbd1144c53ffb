import type { ReactNode } from 'react';
import type { AnyTable } from '../../lib/dashboard/tables';
import type { DashboardPeriod } from '../../lib/schemas/dashboard';
import { dashboardExportUrl } from '../../lib/queries/dashboard';
import { DataTable } from './DataTable';

interface Props {
  table: AnyTable;
  period: DashboardPeriod;
  currency: string;
  /** One line on how to read the figures. */
  note: string;
  chart: ReactNode;
  /** Said above the chart when the period has nothing to draw. */
  empty?: string | null;
}

/** One block of the dashboard: its chart, the table beside it, and the table's CSV. */
export function Section({ table, period, currency, note, chart, empty = null }: Props) {
  const id = `dashboard-${table.name}`;
  return (
    <section aria-labelledby={id} className="card p-4">
      <div className="mb-3 flex items-start justify-between gap-4">
        <div className="min-w-0">
          <h2 id={id} className="text-base font-semibold text-ink-900">{table.title}</h2>
          <p className="text-sm text-ink-500">{note}</p>
        </div>
        <a className="btn-quiet shrink-0 py-1" href={dashboardExportUrl(table.name, period)} download aria-label={`Export CSV: ${table.title}`}>
          Export CSV
        </a>
      </div>
      <div className="grid gap-4 xl:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
        <figure aria-label={`Chart: ${table.title}`} className="min-w-0">
          {empty && <figcaption className="mb-2 rounded-md bg-dune-50 px-3 py-2 text-sm text-ink-700">{empty}</figcaption>}
          {chart}
        </figure>
        <div className="min-w-0">
          <DataTable table={table} currency={currency} />
        </div>
      </div>
    </section>
  );
}
