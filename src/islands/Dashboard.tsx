import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { presetPeriod, type PeriodPreset } from '../lib/dashboard/period';
import { queryClient } from '../lib/query-client';
import { dashboardQuery } from '../lib/queries/dashboard';
import type { DashboardPeriod } from '../lib/schemas/dashboard';
import { formatDay } from '../lib/time';
import { Cards } from './dashboard/Cards';
import { ExamsChart, ReadersChart, RoomsChart, TakingsChart, TurnaroundChart } from './dashboard/charts';
import { PeriodPicker } from './dashboard/PeriodPicker';
import { Section } from './dashboard/Section';

interface Props {
  /** The clinic's today (its time zone), YYYY-MM-DD. */
  today: string;
  /** A period named in the page's address (?from=&to=), already checked; else this week. */
  initial: DashboardPeriod | null;
}

function ClinicDashboard({ today, initial }: Props) {
  const [preset, setPreset] = useState<PeriodPreset>(initial ? 'custom' : 'week');
  const [period, setPeriod] = useState<DashboardPeriod>(initial ?? presetPeriod('week', today));
  const { data, isPending, isError, error, isFetching } = useQuery(dashboardQuery(period));

  const change = (nextPreset: PeriodPreset, next: DashboardPeriod) => {
    setPreset(nextPreset);
    setPeriod(next);
    // The address names the period, so a reload or a shared link shows the same figures.
    window.history.replaceState(null, '', `?from=${next.from}&to=${next.to}`);
  };

  return (
    <div className="space-y-5" aria-busy={isFetching}>
      <PeriodPicker today={today} preset={preset} period={period} onChange={change} />
      <p className="text-sm text-ink-600" role="status">
        {formatDay(period.from)} to {formatDay(period.to)}
        {data && ` · ${data.period.days} days · clinic time (${data.period.timeZone})`}
        {isFetching && !isPending && ' · updating…'}
      </p>
      {isPending && <p className="card p-6 text-center text-ink-500">Counting the period’s exams…</p>}
      {isError && <p role="alert" className="card p-6 text-center text-high-800">{(error as Error).message}</p>}
      {data && (
        <>
          <Cards cards={data.cards} />
          <Section table={data.tables.exams} period={period} currency={data.period.currency} chart={<ExamsChart rows={data.tables.exams.rows} />}
            note="Every exam scheduled in the period. No-show rate: did not attend, of the patients expected (came or did not); cancellation rate: of all bookings." />
          <Section table={data.tables.turnaroundTypes} period={period} currency={data.period.currency} chart={<TurnaroundChart rows={data.tables.turnaroundTypes.rows} />}
            empty={data.tables.turnaroundTypes.rows.every((r) => r.exams === 0) ? 'No exam of this period has the times of a whole step recorded yet.' : null}
            note="Median and 90th percentile of each step, for the exams that reached both ends of it (linear interpolation between closest ranks, times rounded to the precision shown)." />
          <Section table={data.tables.turnaroundRadiologists} period={period} currency={data.period.currency} chart={<ReadersChart rows={data.tables.turnaroundRadiologists.rows} />}
            empty={data.tables.turnaroundRadiologists.rows.every((r) => r.signed === 0) ? 'No report of this period’s exams is signed yet.' : null}
            note="Reports signed for the period’s exams, by the radiologist who signed them." />
          <Section table={data.tables.rooms} period={period} currency={data.period.currency} chart={<RoomsChart rows={data.tables.rooms.rows} />}
            note="Minutes booked (cancelled exams left out, no-shows kept: the room was held) over minutes open by the clinic hours, for each room in use; the dashed line is all rooms together." />
          <Section table={data.tables.takings} period={period} currency={data.period.currency} chart={<TakingsChart rows={data.tables.takings.rows} currency={data.period.currency} />}
            note="Payments that went through, on the clinic day they were taken; refunds on the day they were made." />
        </>
      )}
    </div>
  );
}

export default function Dashboard(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <ClinicDashboard {...props} />
    </QueryClientProvider>
  );
}
