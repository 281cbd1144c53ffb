// Comparison of one report with the same patient's earlier exams of the same template: which
// values changed, by how much, and whether a thyroid nodule grew. Pure: the caller loads the
// exams; every clinical rule (nodule growth, unit symbols, rounding) comes from the engine.
import {
  convert,
  canConvert,
  daysBetween,
  formatNumber,
  formatQuantity,
  noduleGrowth,
  parseIsoDate,
  roundHalfUp,
  type CalendarDate,
  type NoduleGrowth,
  type NoduleInput,
  type TemplateDef,
  type TiradsLevel,
  type Unit,
} from '../clinical';
import type { StoredEvaluation } from '../schemas/reports';

/** One exam as the comparison sees it: its entries and the evaluation stored with its report. */
export interface ComparedExam {
  reportId: number;
  examId: number;
  /** ISO date "YYYY-MM-DD". */
  examDate: string;
  measurements: Readonly<Record<string, number | string>>;
  nodules: readonly NoduleInput[];
  evaluation: StoredEvaluation | null;
}

export interface CompareInput {
  template: TemplateDef;
  current: ComparedExam;
  /** Any order; only exams strictly before `current.examDate` are compared. */
  priors: readonly ComparedExam[];
}

export interface TrendPoint {
  date: string;
  value: number;
}

export interface ComparisonRow {
  code: string;
  label: string;
  /** Section title of a measured field (e.g. "Right lobe"); null for derived values. */
  section: string | null;
  unit: Unit;
  decimals: number;
  kind: 'measured' | 'derived';
  /** As stored (derived values at full precision). */
  current: number;
  prior: number;
  priorDate: string;
  /** Difference of the values rounded to `decimals`, so it matches the printed numbers. */
  change: number;
  /** `change` relative to the rounded prior, in %; null when the prior is 0. */
  changePercent: number | null;
  /** Oldest → current, every exam that has the value. */
  series: TrendPoint[];
}

export interface NoduleSize {
  lengthMm: number;
  widthMm: number;
  depthMm: number;
  maxDiameterMm: number;
  /** From the exam's stored evaluation; null when it has none for this nodule. */
  level: TiradsLevel | null;
}

export interface NoduleComparison {
  id: string;
  priorDate: string;
  intervalDays: number;
  current: NoduleSize;
  prior: NoduleSize;
  growth: NoduleGrowth;
  /** null when either level is unknown. */
  levelRose: boolean | null;
  /** Maximum diameter in mm, oldest → current. */
  series: TrendPoint[];
}

export interface PriorComparison {
  /** Newest first. */
  priors: Array<{ reportId: number; examId: number; examDate: string }>;
  rows: ComparisonRow[];
  nodules: NoduleComparison[];
}

function requireDate(text: string): CalendarDate {
  const date = parseIsoDate(text);
  // Dates come from the exam table; the message names the value's shape only, never the patient.
  if (date === null) throw new Error('compareWithPriors: exam date is not a YYYY-MM-DD calendar date');
  return date;
}

/** The value of one row in one exam, in `unit`; null when the exam has none. */
type ValueOf = (exam: ComparedExam) => number | null;

function buildRow(base: Pick<ComparisonRow, 'code' | 'label' | 'section' | 'unit' | 'decimals' | 'kind'>, current: ComparedExam, newestFirst: readonly ComparedExam[], valueOf: ValueOf): ComparisonRow | null {
  const now = valueOf(current);
  if (now === null) return null;
  const earlier = newestFirst.flatMap((exam) => {
    const value = valueOf(exam);
    return value === null ? [] : [{ date: exam.examDate, value }];
  });
  const latest = earlier[0];
  if (latest === undefined) return null;
  const shownNow = roundHalfUp(now, base.decimals);
  const shownBefore = roundHalfUp(latest.value, base.decimals);
  // Re-rounded so that 3.1 − 2.9 is 0.2, not 0.20000000000000018.
  const change = roundHalfUp(shownNow - shownBefore, base.decimals);
  return {
    ...base,
    current: now,
    prior: latest.value,
    priorDate: latest.date,
    change,
    changePercent: shownBefore === 0 ? null : (change / shownBefore) * 100,
    series: [...earlier.reverse(), { date: current.examDate, value: now }],
  };
}

function measuredRows(template: TemplateDef, current: ComparedExam, newestFirst: readonly ComparedExam[]): ComparisonRow[] {
  return template.sections.flatMap((section) =>
    section.fields.flatMap((field) => {
      if (field.kind !== 'number') return [];
      // Entries are stored in the field's own unit; a state such as "not-measurable" is no value.
      const valueOf: ValueOf = (exam) => {
        const v = exam.measurements[field.code];
        return typeof v === 'number' && Number.isFinite(v) ? v : null;
      };
      const row = buildRow({ code: field.code, label: field.label, section: section.title, unit: field.unit, decimals: field.decimals, kind: 'measured' }, current, newestFirst, valueOf);
      return row === null ? [] : [row];
    }),
  );
}

function derivedRows(template: TemplateDef, current: ComparedExam, newestFirst: readonly ComparedExam[]): ComparisonRow[] {
  return template.derived.flatMap((def) => {
    // An evaluation stored under an older template version could carry another unit; convert
    // where the dimension allows and leave the value out where it does not.
    const valueOf: ValueOf = (exam) => {
      const d = exam.evaluation?.derived.find((x) => x.code === def.code);
      if (d === undefined || !Number.isFinite(d.value) || !canConvert(d.unit, def.unit)) return null;
      return convert(d.value, d.unit, def.unit);
    };
    const row = buildRow({ code: def.code, label: def.label, section: null, unit: def.unit, decimals: def.decimals, kind: 'derived' }, current, newestFirst, valueOf);
    return row === null ? [] : [row];
  });
}

// The largest of the three diameters, as the engine's assessment defines it.
const largestMm = (n: NoduleInput): number => Math.max(n.lengthMm, n.widthMm, n.depthMm);

function noduleSize(exam: ComparedExam, n: NoduleInput, id: string): NoduleSize {
  const level = exam.evaluation?.assessments.nodules?.find((a) => a.id === id)?.level ?? null;
  return { lengthMm: n.lengthMm, widthMm: n.widthMm, depthMm: n.depthMm, maxDiameterMm: largestMm(n), level };
}

function noduleRows(current: ComparedExam, newestFirst: readonly ComparedExam[]): NoduleComparison[] {
  const currentDate = requireDate(current.examDate);
  // Like the engine's own prior comparison, only nodules given an explicit id are linked: a
  // position-based "N2" may be a different nodule in another exam.
  return current.nodules.flatMap((n) => {
    const id = n.id;
    if (id === undefined || id === '') return [];
    const matches = newestFirst.flatMap((exam) => {
      const p = exam.nodules.find((x) => x.id === id);
      return p === undefined ? [] : [{ exam, nodule: p }];
    });
    const latest = matches[0];
    if (latest === undefined) return [];
    const now = noduleSize(current, n, id);
    const before = noduleSize(latest.exam, latest.nodule, id);
    return [
      {
        id,
        priorDate: latest.exam.examDate,
        intervalDays: daysBetween(requireDate(latest.exam.examDate), currentDate),
        current: now,
        prior: before,
        growth: noduleGrowth(latest.nodule, n),
        levelRose: now.level === null || before.level === null ? null : now.level > before.level,
        series: [
          ...matches.reverse().map((m) => ({ date: m.exam.examDate, value: largestMm(m.nodule) })),
          { date: current.examDate, value: now.maxDiameterMm },
        ],
      },
    ];
  });
}

/**
 * Compare a report with earlier exams of the same template, e.g. an aorta of 2.9 cm a year ago
 * and 3.1 cm now gives the row { prior: 2.9, current: 3.1, change: 0.2, changePercent: ≈6.9 }.
 */
export function compareWithPriors(input: CompareInput): PriorComparison {
  const { template, current } = input;
  requireDate(current.examDate);
  input.priors.forEach((p) => requireDate(p.examDate));
  // Valid ISO dates order as text; an exam on the same day is not a prior (it may be a repeat).
  const newestFirst = input.priors
    .filter((p) => p.examDate < current.examDate)
    .sort((a, b) => (a.examDate === b.examDate ? b.reportId - a.reportId : a.examDate < b.examDate ? 1 : -1));
  return {
    priors: newestFirst.map((p) => ({ reportId: p.reportId, examId: p.examId, examDate: p.examDate })),
    rows: [...measuredRows(template, current, newestFirst), ...derivedRows(template, current, newestFirst)],
    nodules: noduleRows(current, newestFirst),
  };
}

const MINUS = '\u2212';

/** A row's change as printed, e.g. "+2.1 mm (+18 %)", "−0.3 cm (−5 %)" or "no change". */
export function formatChange(row: Pick<ComparisonRow, 'change' | 'changePercent' | 'unit' | 'decimals'>): string {
  const size = formatNumber(Math.abs(row.change), row.decimals);
  if (Number(size) === 0) return 'no change';
  const sign = row.change > 0 ? '+' : MINUS;
  // A change of a value that is itself a percentage is in percentage points.
  const amount = row.unit === '%' ? `${sign}${size} percentage points` : `${sign}${formatQuantity(Math.abs(row.change), row.unit, row.decimals)}`;
  if (row.changePercent === null) return amount;
  const percent = formatNumber(Math.abs(row.changePercent), 0);
  return `${amount} (${Number(percent) === 0 ? '< 1' : `${sign}${percent}`} %)`;
}
