/**
 * The clinic dashboard's tables: one shape for the screen (table and chart), the JSON answer
 * and the CSV export, so what is exported is exactly what is shown.
 */

export const TABLE_NAMES = ['exams', 'turnaround-types', 'turnaround-radiologists', 'rooms', 'takings'] as const;
export type TableName = (typeof TABLE_NAMES)[number];

/**
 * How a column's numbers read: counts, minutes (one decimal), percent (one decimal), money in
 * integer cents (the row's `currency` names the currency), or text.
 */
export type ColumnKind = 'text' | 'count' | 'minutes' | 'percent' | 'money';

export type Cell = string | number | null;

export interface Column<Row> {
  key: Extract<keyof Row, string>;
  label: string;
  kind: ColumnKind;
}

export interface DashboardTable<Row> {
  name: TableName;
  title: string;
  columns: ReadonlyArray<Column<Row>>;
  rows: Row[];
}

/** Any of the tables, as the CSV writer and the generic table view read them. */
export interface AnyTable {
  name: TableName;
  title: string;
  columns: ReadonlyArray<{ key: string; label: string; kind: ColumnKind }>;
  rows: readonly object[];
}

/** The label of the row that adds up every other row of a table. */
export const ALL_EXAM_TYPES = 'All exam types';
export const ALL_RADIOLOGISTS = 'All radiologists';
export const ALL_ROOMS = 'All rooms';

export interface ExamsRow {
  examType: string;
  booked: number;
  arrived: number;
  inProgress: number;
  completed: number;
  cancelled: number;
  noshow: number;
  total: number;
  /** No-shows over the exams whose patient was expected and the outcome is known (came or did not). */
  noShowRatePercent: number | null;
  /** Cancellations over every exam of the period. */
  cancellationRatePercent: number | null;
}

/** Turnaround steps, from the times the exam and its report keep. */
export const TURNAROUND_STEPS = [
  { key: 'booked-arrived', label: 'Booking to arrival' },
  { key: 'arrived-completed', label: 'Arrival to end of scan' },
  { key: 'completed-preliminary', label: 'End of scan to preliminary report' },
  { key: 'preliminary-final', label: 'Preliminary to signed report' },
  { key: 'booked-final', label: 'Booking to signed report' },
] as const;
export type TurnaroundStep = (typeof TURNAROUND_STEPS)[number]['key'];

export interface TurnaroundTypeRow {
  examType: string;
  step: string;
  exams: number;
  medianMinutes: number | null;
  p90Minutes: number | null;
}

export interface TurnaroundReaderRow {
  radiologist: string;
  signed: number;
  readingMedianMinutes: number | null;
  readingP90Minutes: number | null;
  wholeMedianMinutes: number | null;
  wholeP90Minutes: number | null;
}

export interface RoomRow {
  room: string;
  openMinutes: number;
  bookedMinutes: number;
  utilisationPercent: number | null;
}

export interface TakingsRow {
  day: string;
  currency: string;
  depositsCents: number;
  balancesCents: number;
  refundsCents: number;
  /** Deposits and balances taken, less refunds paid back. */
  netCents: number;
}

export const EXAMS_COLUMNS: ReadonlyArray<Column<ExamsRow>> = [
  { key: 'examType', label: 'Exam type', kind: 'text' },
  { key: 'booked', label: 'Booked', kind: 'count' },
  { key: 'arrived', label: 'Arrived', kind: 'count' },
  { key: 'inProgress', label: 'Scanning', kind: 'count' },
  { key: 'completed', label: 'Scanned', kind: 'count' },
  { key: 'cancelled', label: 'Cancelled', kind: 'count' },
  { key: 'noshow', label: 'Did not attend', kind: 'count' },
  { key: 'total', label: 'All', kind: 'count' },
  { key: 'noShowRatePercent', label: 'No-show rate (%)', kind: 'percent' },
  { key: 'cancellationRatePercent', label: 'Cancellation rate (%)', kind: 'percent' },
];

export const TURNAROUND_TYPE_COLUMNS: ReadonlyArray<Column<TurnaroundTypeRow>> = [
  { key: 'examType', label: 'Exam type', kind: 'text' },
  { key: 'step', label: 'Step', kind: 'text' },
  { key: 'exams', label: 'Exams', kind: 'count' },
  { key: 'medianMinutes', label: 'Median (minutes)', kind: 'minutes' },
  { key: 'p90Minutes', label: '90th percentile (minutes)', kind: 'minutes' },
];

export const TURNAROUND_READER_COLUMNS: ReadonlyArray<Column<TurnaroundReaderRow>> = [
  { key: 'radiologist', label: 'Radiologist', kind: 'text' },
  { key: 'signed', label: 'Reports signed', kind: 'count' },
  { key: 'readingMedianMinutes', label: 'Preliminary to signed, median (minutes)', kind: 'minutes' },
  { key: 'readingP90Minutes', label: 'Preliminary to signed, 90th percentile (minutes)', kind: 'minutes' },
  { key: 'wholeMedianMinutes', label: 'Booking to signed, median (minutes)', kind: 'minutes' },
  { key: 'wholeP90Minutes', label: 'Booking to signed, 90th percentile (minutes)', kind: 'minutes' },
];

export const ROOM_COLUMNS: ReadonlyArray<Column<RoomRow>> = [
  { key: 'room', label: 'Room', kind: 'text' },
  { key: 'openMinutes', label: 'Open (minutes)', kind: 'count' },
  { key: 'bookedMinutes', label: 'Booked (minutes)', kind: 'count' },
  { key: 'utilisationPercent', label: 'Utilisation (%)', kind: 'percent' },
];

export const TAKINGS_COLUMNS: ReadonlyArray<Column<TakingsRow>> = [
  { key: 'day', label: 'Day', kind: 'text' },
  { key: 'currency', label: 'Currency', kind: 'text' },
  { key: 'depositsCents', label: 'Deposits', kind: 'money' },
  { key: 'balancesCents', label: 'Balances', kind: 'money' },
  { key: 'refundsCents', label: 'Refunds', kind: 'money' },
  { key: 'netCents', label: 'Net takings', kind: 'money' },
];

export interface DashboardCards {
  exams: number;
  completed: number;
  noShowRatePercent: number | null;
  cancellationRatePercent: number | null;
  utilisationPercent: number | null;
  /** Median of preliminary to signed report, every exam type. */
  readingMedianMinutes: number | null;
  currency: string;
  netCents: number;
}

export interface DashboardDto {
  period: { from: string; to: string; days: number; timeZone: string; currency: string };
  cards: DashboardCards;
  tables: {
    exams: DashboardTable<ExamsRow>;
    turnaroundTypes: DashboardTable<TurnaroundTypeRow>;
    turnaroundRadiologists: DashboardTable<TurnaroundReaderRow>;
    rooms: DashboardTable<RoomRow>;
    takings: DashboardTable<TakingsRow>;
  };
}

/** The headline figures, read from the tables' totals (so a card never disagrees with its table). */
export function cardsOf(tables: DashboardDto['tables'], currency: string): DashboardCards {
  const exams = tables.exams.rows.find((r) => r.examType === ALL_EXAM_TYPES);
  const reading = tables.turnaroundTypes.rows.find((r) => r.examType === ALL_EXAM_TYPES && r.step === stepLabel('preliminary-final'));
  const rooms = tables.rooms.rows.find((r) => r.room === ALL_ROOMS);
  return {
    exams: exams?.total ?? 0,
    completed: exams?.completed ?? 0,
    noShowRatePercent: exams?.noShowRatePercent ?? null,
    cancellationRatePercent: exams?.cancellationRatePercent ?? null,
    utilisationPercent: rooms?.utilisationPercent ?? null,
    readingMedianMinutes: reading?.medianMinutes ?? null,
    currency,
    netCents: tables.takings.rows.filter((r) => r.currency === currency).reduce((sum, r) => sum + r.netCents, 0),
  };
}

/** The words of a turnaround step, e.g. stepLabel('preliminary-final') → 'Preliminary to signed report'. */
export function stepLabel(step: TurnaroundStep): string {
  return TURNAROUND_STEPS.find((s) => s.key === step)!.label;
}
