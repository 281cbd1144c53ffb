import { flexRender, type Header } from '@tanstack/react-table';

/**
 * A column heading of a TanStack table: a button that toggles the sort when the column sorts,
 * with the direction shown (▲ ▼, ↕ unsorted) and announced through aria-sort.
 */
export function SortableTh<T>({ header, sortable }: { header: Header<T, unknown>; sortable: boolean }) {
  const dir = header.column.getIsSorted();
  const label = flexRender(header.column.columnDef.header, header.getContext());
  return (
    <th scope="col" aria-sort={dir ? (dir === 'asc' ? 'ascending' : 'descending') : undefined}>
      {sortable ? (
        <button type="button" className="inline-flex items-center gap-1 uppercase hover:text-ink-800" onClick={header.column.getToggleSortingHandler()}>
          {label}
          <span aria-hidden="true">{dir === 'asc' ? '▲' : dir === 'desc' ? '▼' : '↕'}</span>
        </button>
      ) : (
        label
      )}
    </th>
  );
}
