import { formatMoney } from '../booking/refunds';
import type { Cell, ColumnKind } from './tables';

/**
 * A duration as the dashboard shows it: minutes below 2 hours, hours with one decimal below
 * 2 days, days with one decimal beyond (the precision the percentiles are counted in).
 *
 * @example formatMinutes(45) → '45 min'; formatMinutes(150) → '2.5 h'; formatMinutes(4320) → '3.0 days'
 */
export function formatMinutes(minutes: number | null): string {
  if (minutes === null) return '—';
  if (minutes < 120) return `${Math.round(minutes)} min`;
  if (minutes < 2_880) return `${(minutes / 60).toFixed(1)} h`;
  return `${(minutes / 1_440).toFixed(1)} days`;
}

/** A percentage with one decimal, e.g. formatPercent(6.25) → '6.3 %'. */
export function formatPercent(value: number | null): string {
  return value === null ? '—' : `${value.toFixed(1)} %`;
}

/** A table cell for the screen; money needs the row's currency. */
export function formatCell(value: Cell, kind: ColumnKind, currency: string): string {
  if (value === null) return '—';
  switch (kind) {
    case 'minutes':
      return formatMinutes(Number(value));
    case 'percent':
      return formatPercent(Number(value));
    case 'money':
      return formatMoney(Number(value), currency);
    case 'count':
      return Number(value).toLocaleString('en-US');
    default:
      return String(value);
  }
}
