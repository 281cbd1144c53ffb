import { formatCell } from '../../lib/dashboard/format';
import type { AnyTable, Cell } from '../../lib/dashboard/tables';

interface Props {
  table: AnyTable;
  /** The clinic's currency, for money cells of rows that name none. */
  currency: string;
}

/** A dashboard table as it is exported: the same columns and rows, formatted for reading. */
export function DataTable({ table, currency }: Props) {
  const first = table.columns[0]!.key;
  return (
    <div className="max-h-96 overflow-auto rounded-md ring-1 ring-ink-100">
      <table className="data-table" aria-label={table.title}>
        <thead className="sticky top-0 bg-ink-50">
          <tr>
            {table.columns.map((c) => (
              <th key={c.key} scope="col" className={`!px-2 align-bottom ${c.kind === 'text' ? '' : 'text-right'}`}>{c.label}</th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-50 bg-white">
          {table.rows.map((raw, i) => {
            const row = raw as Record<string, Cell>;
            const total = String(row[first] ?? '').startsWith('All ');
            return (
              <tr key={i} className={total ? 'bg-crest-50/60 font-semibold' : undefined}>
                {table.columns.map((c) => (
                  <td key={c.key} className={`!px-2 ${c.kind === 'text' ? '' : 'text-right whitespace-nowrap tabular-nums'}`}>
                    {formatCell(row[c.key] ?? null, c.kind, typeof row.currency === 'string' ? row.currency : currency)}
                  </td>
                ))}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
