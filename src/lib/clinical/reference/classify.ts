import { roundHalfUp } from '../rounding';
import type { SeverityGrade, Sex } from '../types';
import { convert, type Unit } from '../units';
import type { ReferenceRange } from './types';

export const SEX_NOT_APPLIED = 'sex-specific reference not applied';

export type ReferenceSelection =
  | { kind: 'row'; row: ReferenceRange }
  | { kind: 'not-applied'; reason: string }
  | { kind: 'no-reference'; reason: string };

const inAgeBand = (r: ReferenceRange, ageYears: number): boolean =>
  (r.ageMinYears === null || ageYears >= r.ageMinYears) && (r.ageMaxYears === null || ageYears <= r.ageMaxYears);

const bandWidth = (r: ReferenceRange): number => (r.ageMaxYears ?? 200) - (r.ageMinYears ?? 0);

/**
 * The row that applies to a patient, e.g. `selectReference(rows, 'lvmi', 'female', 50)`.
 * Sex-specific rows are used only for 'male'/'female'; with any other sex and no 'any' row the
 * answer is "sex-specific reference not applied" rather than a silently chosen table.
 * Among several matches the most specific wins: own sex over 'any', then the narrower age band.
 */
export function selectReference(rows: readonly ReferenceRange[], code: string, sex: Sex | null, ageYears: number): ReferenceSelection {
  const forCode = rows.filter((r) => r.code === code);
  if (forCode.length === 0) return { kind: 'no-reference', reason: 'no reference range for this measurement' };
  const forAge = forCode.filter((r) => inAgeBand(r, ageYears));
  if (forAge.length === 0) return { kind: 'no-reference', reason: `no reference range for age ${ageYears} y` };
  const candidates = forAge.filter((r) => r.sex === 'any' || r.sex === sex);
  if (candidates.length === 0) return { kind: 'not-applied', reason: SEX_NOT_APPLIED };
  const ranked = [...candidates].sort((a, b) => Number(a.sex === 'any') - Number(b.sex === 'any') || bandWidth(a) - bandWidth(b));
  return { kind: 'row', row: ranked[0] as ReferenceRange };
}

export interface Classification {
  status: 'normal' | 'low' | 'high';
  grade: SeverityGrade | null;
  /** The value as compared: in the row's unit, rounded to the row's precision. */
  comparedValue: number;
}

function grade(r: ReferenceRange, v: number, status: 'low' | 'high'): SeverityGrade | null {
  if (r.severityDirection !== status || r.mildLimit === null || r.moderateLimit === null) return null;
  const within = (limit: number): boolean => (status === 'high' ? v <= limit : v >= limit);
  if (within(r.mildLimit)) return 'mild';
  if (within(r.moderateLimit)) return 'moderate';
  return 'severe';
}

/**
 * Classify a value against a row, converting its unit first, e.g. LVMI 100.09 g/m² against the
 * women's row → `{ status: 'high', grade: 'mild', comparedValue: 100 }`.
 */
export function classifyValue(r: ReferenceRange, value: number, unit: Unit): Classification {
  const v = roundHalfUp(convert(value, unit, r.unit), r.decimals);
  if (r.normalMin !== null && v < r.normalMin) return { status: 'low', grade: grade(r, v, 'low'), comparedValue: v };
  if (r.normalMax !== null && v > r.normalMax) return { status: 'high', grade: grade(r, v, 'high'), comparedValue: v };
  return { status: 'normal', grade: null, comparedValue: v };
}
