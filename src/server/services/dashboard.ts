import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import type { ExamStatus } from '../../lib/exam-status';
import { offsetSegments, periodDays, eachDay, type Period } from '../../lib/dashboard/period';
import { percentileOfCounts } from '../../lib/dashboard/percentile';
import {
  ALL_EXAM_TYPES,
  ALL_RADIOLOGISTS,
  ALL_ROOMS,
  cardsOf,
  EXAMS_COLUMNS,
  ROOM_COLUMNS,
  TAKINGS_COLUMNS,
  TURNAROUND_READER_COLUMNS,
  TURNAROUND_STEPS,
  TURNAROUND_TYPE_COLUMNS,
  type AnyTable,
  type DashboardDto,
  type DashboardTable,
  type ExamsRow,
  type RoomRow,
  type TableName,
  type TakingsRow,
  type TurnaroundReaderRow,
  type TurnaroundTypeRow,
} from '../../lib/dashboard/tables';
import { openMinutesPerRoom, ratePercent } from '../../lib/dashboard/utilisation';
import { zonedDayRange } from '../../lib/time';
import { clinicHours, clinicProfile } from './settings';

/**
 * The clinic manager's dashboard for a period of clinic days, one function per block. Every
 * block is aggregated in SQL over the covering indexes of migration 20261203000200 (exams by
 * scheduled start; payments by creation), so a year costs a handful of index range scans and
 * small answers, never a read of every exam. An exam belongs to the period of its scheduled day.
 */

export interface Range extends Period {
  /** The period as UTC instants: start of the first day to the start of the day after the last. */
  start: Date;
  end: Date;
  timeZone: string;
}

function rangeOf(period: Period, timeZone: string): Range {
  return { ...period, start: zonedDayRange(period.from, timeZone).start, end: zonedDayRange(period.to, timeZone).end, timeZone };
}

const select = <T extends object>(sql: string, replacements: unknown[]) => db().query<T>(sql, { replacements, type: QueryTypes.SELECT });

/** Exams by type and status, with the no-show and cancellation rates. */
export async function examsByTypeAndStatus(r: Range): Promise<DashboardTable<ExamsRow>> {
  const rows = await select<{ type_id: number; type: string; status: ExamStatus; n: number | bigint }>(
    `SELECT c.exam_type_id AS type_id, t.name AS type, c.status, c.n
       FROM (SELECT e.exam_type_id, e.status, COUNT(*) AS n FROM exams e
              WHERE e.scheduled_start >= ? AND e.scheduled_start < ? GROUP BY e.exam_type_id, e.status) c
       JOIN exam_types t ON t.id = c.exam_type_id
      ORDER BY t.name`,
    [r.start, r.end],
  );
  const byType = new Map<number, { name: string; counts: Record<ExamStatus, number> }>();
  const all = emptyCounts();
  for (const row of rows) {
    const entry = byType.get(row.type_id) ?? { name: row.type, counts: emptyCounts() };
    entry.counts[row.status] += Number(row.n);
    all[row.status] += Number(row.n);
    byType.set(row.type_id, entry);
  }
  return { name: 'exams', title: 'Exams by type and status', columns: EXAMS_COLUMNS, rows: [...[...byType.values()].map((t) => examsRow(t.name, t.counts)), examsRow(ALL_EXAM_TYPES, all)] };
}

const emptyCounts = (): Record<ExamStatus, number> => ({ booked: 0, arrived: 0, 'in-progress': 0, completed: 0, cancelled: 0, noshow: 0 });

function examsRow(examType: string, c: Record<ExamStatus, number>): ExamsRow {
  const total = Object.values(c).reduce((a, b) => a + b, 0);
  // Expected and the outcome known: the patient came (arrived or later) or did not.
  const expected = c.arrived + c['in-progress'] + c.completed + c.noshow;
  return {
    examType,
    booked: c.booked,
    arrived: c.arrived,
    inProgress: c['in-progress'],
    completed: c.completed,
    cancelled: c.cancelled,
    noshow: c.noshow,
    total,
    noShowRatePercent: ratePercent(c.noshow, expected),
    cancellationRatePercent: ratePercent(c.cancelled, total),
  };
}

/** Seconds from a step's start to its end, by step number (the order of TURNAROUND_STEPS). */
const EXAM_STEPS: ReadonlyArray<readonly [number, string]> = [
  [1, 'TIMESTAMPDIFF(SECOND, e.created_at, e.arrived_at)'],
  [2, 'TIMESTAMPDIFF(SECOND, e.arrived_at, e.completed_at)'],
];
const REPORT_STEPS: ReadonlyArray<readonly [number, string]> = [
  [3, 'TIMESTAMPDIFF(SECOND, e.completed_at, r.submitted_at)'],
  [4, 'TIMESTAMPDIFF(SECOND, r.submitted_at, r.signed_at)'],
  [5, 'TIMESTAMPDIFF(SECOND, e.created_at, r.signed_at)'],
];

/** Rounded as roundedMinutes() in src/lib/dashboard/percentile.ts rounds (integer division: exact); null when negative. */
const rounded = (s: string) => `IF(${s} >= 0, CASE WHEN ${s} < 7200 THEN (${s} + 30) DIV 60 WHEN ${s} < 172800 THEN (${s} + 180) DIV 360 * 6 ELSE (${s} + 1800) DIV 3600 * 60 END, NULL)`;

/**
 * How many exams of the period took each rounded duration, per step, exam type and (for the
 * steps ending with the signature) signer. Measured on a year of 33,000 exams, what costs is
 * per-row work, so each exam's seconds and rounded minutes are worked out once, in derived tables
 * kept apart (derived_merge=off: merged, every mention of a duration recomputes it); the steps are
 * then unfolded by a small table joined last (STRAIGHT_JOIN: first, it makes the optimizer scan
 * the exams once per step). Exams and reports are read from their covering indexes only (FORCE
 * INDEX: the optimizer prefers the unique exam_id key of reports, which costs a row read per exam).
 */
function stepCountsSql(steps: ReadonlyArray<readonly [number, string]>, withReports: boolean): string {
  const pick = `CASE k.step ${steps.map(([n]) => `WHEN ${n} THEN m.b${n}`).join(' ')} END`;
  return `SET STATEMENT optimizer_switch = 'derived_merge=off' FOR
    SELECT k.step, m.type_id, ${withReports ? 'IF(k.step >= 4, m.reader_id, NULL)' : 'NULL'} AS reader_id, ${pick} AS minutes, COUNT(*) AS n
      FROM (SELECT type_id, reader_id, ${steps.map(([n]) => `${rounded(`s${n}`)} AS b${n}`).join(', ')}
              FROM (SELECT e.exam_type_id AS type_id, ${withReports ? 'r.signed_by' : 'NULL'} AS reader_id, ${steps.map(([n, secs]) => `${secs} AS s${n}`).join(', ')}
                      FROM exams e FORCE INDEX (exams_dashboard)
                      ${withReports ? 'JOIN reports r FORCE INDEX (reports_turnaround) ON r.exam_id = e.id' : ''}
                     WHERE e.scheduled_start >= ? AND e.scheduled_start < ? AND ${withReports ? 'r.submitted_at' : 'e.arrived_at'} IS NOT NULL) x) m
      STRAIGHT_JOIN (${steps.map(([n]) => `SELECT ${n} AS step`).join(' UNION ALL ')}) k
     WHERE ${pick} IS NOT NULL
     GROUP BY 1, 2, 3, 4 ORDER BY NULL`;
}
const EXAM_STEP_COUNTS = stepCountsSql(EXAM_STEPS, false);
const REPORT_STEP_COUNTS = stepCountsSql(REPORT_STEPS, true);

type Counts = Array<[minutes: number, count: number]>;

/**
 * Turnaround times, median and 90th percentile, per exam type (every step) and per radiologist
 * (the steps that end with the signature). The database counts exams per step, exam type,
 * signer and rounded duration; the percentiles are taken over those counts
 * (src/lib/dashboard/percentile.ts states the definition). A step recorded as ending before it
 * began (a clock put right) is left out.
 */
export async function turnaroundTimes(r: Range): Promise<{ byType: DashboardTable<TurnaroundTypeRow>; byRadiologist: DashboardTable<TurnaroundReaderRow> }> {
  type CountRow = { step: number; type_id: number; reader_id: number | null; minutes: number | bigint; n: number | bigint };
  // The two halves run side by side, on two connections.
  const [examSide, reportSide, types, readers] = await Promise.all([
    select<CountRow>(EXAM_STEP_COUNTS, [r.start, r.end]),
    select<CountRow>(REPORT_STEP_COUNTS, [r.start, r.end]),
    select<{ id: number; name: string }>('SELECT id, name FROM exam_types ORDER BY name', []),
    // Every account, not only today's radiologists: a signer may since have changed role.
    select<{ id: number; name: string }>('SELECT id, display_name AS name FROM users ORDER BY display_name', []),
  ]);
  // counts[step][group] with groups 'type:<id>', 'reader:<id>' and 'all'.
  const counts = TURNAROUND_STEPS.map(() => new Map<string, Counts>());
  const add = (step: number, group: string, minutes: number, n: number) => {
    const list = counts[step - 1]!.get(group) ?? [];
    list.push([minutes, n]);
    counts[step - 1]!.set(group, list);
  };
  for (const row of [...examSide, ...reportSide]) {
    const [minutes, n] = [Number(row.minutes), Number(row.n)];
    add(row.step, `type:${row.type_id}`, minutes, n);
    add(row.step, 'all', minutes, n);
    if (row.reader_id !== null) add(row.step, `reader:${row.reader_id}`, minutes, n);
  }
  const figures = (step: number, group: string) => {
    const list = counts[step - 1]!.get(group) ?? [];
    return { n: list.reduce((a, [, c]) => a + c, 0), median: minutes1(percentileOfCounts(list, 0.5)), p90: minutes1(percentileOfCounts(list, 0.9)) };
  };

  const typeRows: TurnaroundTypeRow[] = [];
  const groups = [...types.filter((t) => counts.some((m) => m.has(`type:${t.id}`))).map((t) => ({ name: t.name, key: `type:${t.id}` })), { name: ALL_EXAM_TYPES, key: 'all' }];
  for (const g of groups) {
    TURNAROUND_STEPS.forEach((s, i) => {
      const f = figures(i + 1, g.key);
      typeRows.push({ examType: g.name, step: s.label, exams: f.n, medianMinutes: f.median, p90Minutes: f.median === null ? null : f.p90 });
    });
  }
  const readerRow = (radiologist: string, key: string): TurnaroundReaderRow => {
    const [reading, whole] = [figures(4, key), figures(5, key)];
    return { radiologist, signed: reading.n, readingMedianMinutes: reading.median, readingP90Minutes: reading.p90, wholeMedianMinutes: whole.median, wholeP90Minutes: whole.p90 };
  };
  const readerRows = [...readers.filter((u) => counts[3]!.has(`reader:${u.id}`)).map((u) => readerRow(u.name, `reader:${u.id}`)), readerRow(ALL_RADIOLOGISTS, 'all')];
  return {
    byType: { name: 'turnaround-types', title: 'Turnaround by exam type', columns: TURNAROUND_TYPE_COLUMNS, rows: typeRows },
    byRadiologist: { name: 'turnaround-radiologists', title: 'Reading turnaround by radiologist', columns: TURNAROUND_READER_COLUMNS, rows: readerRows },
  };
}

const minutes1 = (m: number | null) => (m === null ? null : Math.round(m * 10) / 10);

/**
 * Room utilisation: minutes booked over minutes open, for each room in use. Booked minutes are
 * the scheduled minutes of every exam of the period except cancelled ones (a no-show held the
 * room). Open minutes come from the clinic hours (weekly spans, closed dates), the same for
 * every room in use today.
 */
export async function roomUtilisation(r: Range): Promise<DashboardTable<RoomRow>> {
  const [rooms, hours] = await Promise.all([
    select<{ name: string; minutes: number | string | null }>(
      `SELECT rm.name, b.minutes
         FROM rooms rm
         LEFT JOIN (SELECT e.room_id, SUM(e.duration_minutes) AS minutes FROM exams e
                     WHERE e.scheduled_start >= ? AND e.scheduled_start < ? AND e.status <> 'cancelled' GROUP BY e.room_id) b ON b.room_id = rm.id
        WHERE rm.active = 1
        ORDER BY rm.name`,
      [r.start, r.end],
    ),
    clinicHours(),
  ]);
  const open = openMinutesPerRoom(r, hours);
  const rows = rooms.map((room): RoomRow => {
    const booked = Number(room.minutes ?? 0);
    return { room: room.name, openMinutes: open, bookedMinutes: booked, utilisationPercent: ratePercent(booked, open) };
  });
  const booked = rows.reduce((a, row) => a + row.bookedMinutes, 0);
  rows.push({ room: ALL_ROOMS, openMinutes: open * rooms.length, bookedMinutes: booked, utilisationPercent: ratePercent(booked, open * rooms.length) });
  return { name: 'rooms', title: 'Room utilisation', columns: ROOM_COLUMNS, rows };
}

/**
 * Money taken by clinic day: deposits, balances and refunds that succeeded, on the day the
 * payment was recorded; net takings are deposits and balances less refunds. Every day of the
 * period has a row in the clinic's currency (zeros when nothing moved). Days are the clinic's:
 * the SQL adds the UTC offset of each daylight-saving segment of the period.
 */
export async function takingsByDay(r: Range, currency: string): Promise<DashboardTable<TakingsRow>> {
  const segments = offsetSegments(r.start, r.end, r.timeZone);
  const offset = segments.length === 1 ? '?' : `CASE ${segments.slice(0, -1).map(() => 'WHEN p.created_at < ? THEN ?').join(' ')} ELSE ? END`;
  const rows = await select<{ day: string; currency: string; kind: 'deposit' | 'balance' | 'refund'; cents: number | string }>(
    `SELECT DATE_FORMAT(DATE_ADD(p.created_at, INTERVAL ${offset} MINUTE), '%Y-%m-%d') AS day, p.currency, p.kind, SUM(p.amount_cents) AS cents
       FROM payments p
      WHERE p.created_at >= ? AND p.created_at < ? AND p.status = 'succeeded'
      GROUP BY 1, 2, 3 ORDER BY NULL`,
    [...segments.slice(0, -1).flatMap((s) => [s.until, s.offsetMinutes]), segments[segments.length - 1]!.offsetMinutes, r.start, r.end],
  );
  const byKey = new Map<string, TakingsRow>();
  const row = (day: string, cur: string) => {
    const key = `${day} ${cur}`;
    if (!byKey.has(key)) byKey.set(key, { day, currency: cur, depositsCents: 0, balancesCents: 0, refundsCents: 0, netCents: 0 });
    return byKey.get(key)!;
  };
  for (const day of eachDay(r)) row(day, currency);
  for (const m of rows) {
    const target = row(m.day, m.currency);
    const cents = Number(m.cents);
    if (m.kind === 'deposit') target.depositsCents += cents;
    else if (m.kind === 'balance') target.balancesCents += cents;
    else target.refundsCents += cents;
    target.netCents = target.depositsCents + target.balancesCents - target.refundsCents;
  }
  // By day, the clinic's currency first on each day.
  const rank = (t: TakingsRow) => (t.currency === currency ? '' : t.currency);
  const sorted = [...byKey.values()].sort((a, b) => a.day.localeCompare(b.day) || rank(a).localeCompare(rank(b)));
  return { name: 'takings', title: 'Takings by day', columns: TAKINGS_COLUMNS, rows: sorted };
}

/** The whole dashboard for a period; the blocks are read side by side. */
export async function clinicDashboard(period: Period): Promise<DashboardDto> {
  const { timeZone, currency } = await clinicProfile();
  const r = rangeOf(period, timeZone);
  const [exams, turnaround, rooms, takings] = await Promise.all([examsByTypeAndStatus(r), turnaroundTimes(r), roomUtilisation(r), takingsByDay(r, currency)]);
  const tables = { exams, turnaroundTypes: turnaround.byType, turnaroundRadiologists: turnaround.byRadiologist, rooms, takings };
  return { period: { from: period.from, to: period.to, days: periodDays(period.from, period.to), timeZone, currency }, cards: cardsOf(tables, currency), tables };
}

/** One table of the dashboard (for its CSV), reading only that block. */
export async function dashboardTable(name: TableName, period: Period): Promise<AnyTable> {
  const { timeZone, currency } = await clinicProfile();
  const r = rangeOf(period, timeZone);
  switch (name) {
    case 'exams':
      return examsByTypeAndStatus(r);
    case 'turnaround-types':
      return (await turnaroundTimes(r)).byType;
    case 'turnaround-radiologists':
      return (await turnaroundTimes(r)).byRadiologist;
    case 'rooms':
      return roomUtilisation(r);
    case 'takings':
      return takingsByDay(r, currency);
  }
}
