import type { AnyTable, Cell, ColumnKind, TableName } from './tables';

/**
 * CSV after RFC 4180: comma-separated, CRLF line ends, a field quoted when it holds a comma, a
 * quote, a line break or edge spaces, quotes inside doubled. UTF-8 without a byte-order mark.
 *
 * Text that a spreadsheet would run as a formula (starting with =, +, -, @, tab or CR: a room
 * someone named "=HYPERLINK(…)") gets a leading apostrophe; numbers are written as numbers.
 */

const FORMULA_START = /^[=+\-@\t\r]/;

/** One field, quoted when needed, e.g. csvField('Room 2, east') → '"Room 2, east"'. */
export function csvField(value: string): string {
  return /[",\r\n]|^\s|\s$/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * A cell as written to the file: text as is (made safe from formulas), counts and minutes and
 * percent as plain numbers, money in major units with two decimals (12345 cents → "123.45"),
 * nothing as an empty field.
 */
export function csvCell(value: Cell, kind: ColumnKind): string {
  if (value === null) return '';
  if (kind === 'text') {
    const text = String(value);
    return csvField(FORMULA_START.test(text) ? `'${text}` : text);
  }
  const n = Number(value);
  if (kind === 'money') return (n / 100).toFixed(2);
  return String(n);
}

/** A whole table: the header of column labels, then one line per row. */
export function toCsv(table: Pick<AnyTable, 'columns' | 'rows'>): string {
  const lines = [table.columns.map((c) => csvField(c.label)).join(',')];
  for (const row of table.rows) lines.push(table.columns.map((c) => csvCell((row as Record<string, Cell>)[c.key] ?? null, c.kind)).join(','));
  return lines.join('\r\n') + '\r\n';
}

/** The file name of an export, e.g. csvFileName('rooms', …) → 'crestline-rooms-2026-11-30-to-2026-12-06.csv'. */
export function csvFileName(name: TableName, from: string, to: string): string {
  return `crestline-${name}-${from}-to-${to}.csv`;
}
