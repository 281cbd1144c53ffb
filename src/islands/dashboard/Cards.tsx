import { formatMoney } from '../../lib/booking/refunds';
import { formatMinutes, formatPercent } from '../../lib/dashboard/format';
import type { DashboardCards } from '../../lib/dashboard/tables';

/** The headline figures of the period, each read from its table's total. */
export function Cards({ cards }: { cards: DashboardCards }) {
  const items = [
    { label: 'Exams', value: cards.exams.toLocaleString('en-US'), hint: `${cards.completed.toLocaleString('en-US')} scanned` },
    { label: 'No-show rate', value: formatPercent(cards.noShowRatePercent), hint: 'of patients expected' },
    { label: 'Cancellation rate', value: formatPercent(cards.cancellationRatePercent), hint: 'of all bookings' },
    { label: 'Room utilisation', value: formatPercent(cards.utilisationPercent), hint: 'booked of open minutes' },
    { label: 'Reading time', value: formatMinutes(cards.readingMedianMinutes), hint: 'median, preliminary to signed' },
    { label: 'Net takings', value: formatMoney(cards.netCents, cards.currency), hint: 'deposits and balances less refunds' },
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 md:grid-cols-3 xl:grid-cols-6">
      {items.map((item) => (
        <div key={item.label} className="card border-t-4 border-crest-500 px-4 py-3">
          <dt className="text-xs font-semibold tracking-wide text-ink-500 uppercase">{item.label}</dt>
          <dd className="mt-1 text-2xl font-semibold text-ink-900 tabular-nums">{item.value}</dd>
          <dd className="text-xs text-ink-500">{item.hint}</dd>
        </div>
      ))}
    </dl>
  );
}
