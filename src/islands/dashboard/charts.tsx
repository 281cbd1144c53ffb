import { Bar, BarChart, CartesianGrid, ComposedChart, Legend, Line, ReferenceLine, Tooltip, XAxis, YAxis } from 'recharts';
import { formatMoney } from '../../lib/booking/refunds';
import { formatMinutes } from '../../lib/dashboard/format';
import { ALL_EXAM_TYPES, ALL_RADIOLOGISTS, ALL_ROOMS, type ExamsRow, type RoomRow, type TakingsRow, type TurnaroundReaderRow, type TurnaroundTypeRow } from '../../lib/dashboard/tables';
import { AXIS, PALETTE, STATUS_COLOURS } from './palette';

// Charts size themselves to their box (recharts' `responsive`); the height is fixed so the
// table beside each chart lines up.
const BOX = { width: '100%', height: 280 } as const;
const tooltipStyle = { borderRadius: 8, borderColor: PALETTE.ink100, fontSize: 13 } as const;

/** Exams of each type, stacked by status (bars lie down: exam type names are long). */
export function ExamsChart({ rows }: { rows: ExamsRow[] }) {
  const data = rows.filter((r) => r.examType !== ALL_EXAM_TYPES);
  const bars: Array<[keyof typeof STATUS_COLOURS, string]> = [
    ['completed', 'Scanned'],
    ['inProgress', 'Scanning'],
    ['arrived', 'Arrived'],
    ['booked', 'Booked'],
    ['noshow', 'Did not attend'],
    ['cancelled', 'Cancelled'],
  ];
  return (
    <BarChart responsive style={BOX} data={data} layout="vertical" margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
      <CartesianGrid horizontal={false} stroke={PALETTE.ink100} />
      <XAxis type="number" allowDecimals={false} {...AXIS} />
      <YAxis type="category" dataKey="examType" width={150} {...AXIS} />
      <Tooltip contentStyle={tooltipStyle} />
      <Legend wrapperStyle={{ fontSize: 12 }} />
      {bars.map(([key, name]) => (
        <Bar key={key} dataKey={key} name={name} stackId="status" fill={STATUS_COLOURS[key]} isAnimationActive={false} />
      ))}
    </BarChart>
  );
}

/**
 * Median and 90th percentile of each step, every exam type together. Steps run from minutes
 * (a scan) to days (booking ahead), so the axis is logarithmic; under a minute is drawn as one.
 */
export function TurnaroundChart({ rows }: { rows: TurnaroundTypeRow[] }) {
  const data = rows
    .filter((r) => r.examType === ALL_EXAM_TYPES)
    .map((r) => ({ step: r.step, median: r.medianMinutes === null ? null : Math.max(1, r.medianMinutes), p90: r.p90Minutes === null ? null : Math.max(1, r.p90Minutes), real: r }));
  return (
    <BarChart responsive style={BOX} data={data} layout="vertical" margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
      <CartesianGrid horizontal={false} stroke={PALETTE.ink100} />
      <XAxis type="number" scale="log" domain={[1, 'auto']} allowDataOverflow tickFormatter={(v: number) => formatMinutes(v)} {...AXIS} />
      <YAxis type="category" dataKey="step" width={150} {...AXIS} />
      <Tooltip
        contentStyle={tooltipStyle}
        formatter={(_value, name, item) => {
          const real = (item.payload as { real: TurnaroundTypeRow }).real;
          return [formatMinutes(name === 'Median' ? real.medianMinutes : real.p90Minutes), name];
        }}
      />
      <Legend wrapperStyle={{ fontSize: 12 }} />
      <Bar dataKey="median" name="Median" fill={PALETTE.crest600} isAnimationActive={false} />
      <Bar dataKey="p90" name="90th percentile" fill={PALETTE.dune300} isAnimationActive={false} />
    </BarChart>
  );
}

/** Each radiologist's time from preliminary to signed report. */
export function ReadersChart({ rows }: { rows: TurnaroundReaderRow[] }) {
  const data = rows.filter((r) => r.radiologist !== ALL_RADIOLOGISTS);
  return (
    <BarChart responsive style={BOX} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
      <CartesianGrid vertical={false} stroke={PALETTE.ink100} />
      <XAxis dataKey="radiologist" {...AXIS} interval={0} />
      <YAxis tickFormatter={(v: number) => formatMinutes(v)} {...AXIS} width={64} />
      <Tooltip contentStyle={tooltipStyle} formatter={(value, name) => [formatMinutes(Number(value)), name]} />
      <Legend wrapperStyle={{ fontSize: 12 }} />
      <Bar dataKey="readingMedianMinutes" name="Median" fill={PALETTE.crest600} isAnimationActive={false} />
      <Bar dataKey="readingP90Minutes" name="90th percentile" fill={PALETTE.dune300} isAnimationActive={false} />
    </BarChart>
  );
}

/** Booked minutes over open minutes, per room, with all rooms together as a dashed line. */
export function RoomsChart({ rows }: { rows: RoomRow[] }) {
  const data = rows.filter((r) => r.room !== ALL_ROOMS);
  const overall = rows.find((r) => r.room === ALL_ROOMS)?.utilisationPercent ?? null;
  return (
    <BarChart responsive style={BOX} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 0 }}>
      <CartesianGrid vertical={false} stroke={PALETTE.ink100} />
      <XAxis dataKey="room" {...AXIS} interval={0} />
      <YAxis domain={[0, (max: number) => Math.max(100, Math.ceil(max / 10) * 10)]} tickFormatter={(v: number) => `${v} %`} {...AXIS} width={56} />
      <Tooltip contentStyle={tooltipStyle} formatter={(value) => [`${Number(value).toFixed(1)} %`, 'Utilisation']} />
      {overall !== null && <ReferenceLine y={overall} stroke={PALETTE.dune500} strokeDasharray="4 4" strokeWidth={2} />}
      <Bar dataKey="utilisationPercent" name="Utilisation" fill={PALETTE.crest600} isAnimationActive={false} />
    </BarChart>
  );
}

/** Money in and out per day: deposits and balances stacked, refunds below the line, net as a line. */
export function TakingsChart({ rows, currency }: { rows: TakingsRow[]; currency: string }) {
  const data = rows
    .filter((r) => r.currency === currency)
    .map((r) => ({ day: r.day.slice(5), deposits: r.depositsCents / 100, balances: r.balancesCents / 100, refunds: -r.refundsCents / 100, net: r.netCents / 100 }));
  const money = (v: number) => formatMoney(Math.round(v * 100), currency);
  return (
    <ComposedChart responsive style={BOX} data={data} stackOffset="sign" margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
      <CartesianGrid vertical={false} stroke={PALETTE.ink100} />
      <XAxis dataKey="day" {...AXIS} minTickGap={16} />
      <YAxis tickFormatter={(v: number) => money(v)} {...AXIS} width={80} />
      <Tooltip contentStyle={tooltipStyle} formatter={(value, name) => [money(Number(value)), name]} />
      <Legend wrapperStyle={{ fontSize: 12 }} />
      <ReferenceLine y={0} stroke={PALETTE.ink300} />
      <Bar dataKey="deposits" name="Deposits" stackId="money" fill={PALETTE.crest300} isAnimationActive={false} />
      <Bar dataKey="balances" name="Balances" stackId="money" fill={PALETTE.crest600} isAnimationActive={false} />
      <Bar dataKey="refunds" name="Refunds" stackId="money" fill={PALETTE.high600} isAnimationActive={false} />
      <Line dataKey="net" name="Net takings" type="linear" stroke={PALETTE.ink700} dot strokeWidth={2} isAnimationActive={false} />
    </ComposedChart>
  );
}
