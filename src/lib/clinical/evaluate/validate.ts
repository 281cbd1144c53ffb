import { AAA_SCHEMES } from '../aaa/schemes';
import { ageInYears, parseIsoDate } from '../dates';
import { BSA_METHOD_LABELS } from '../formulas/bsa';
import { formatRange } from '../formatting';
import { unitSymbol } from '../units';
import { validateNodules } from '../templates/thyroid/nodules';
import type { FieldDef, TemplateDef } from '../templates/types';
import { NOT_DONE, NOT_MEASURABLE, type Measurements } from '../types';
import { URGENT_RULES } from '../urgent';
import type { EvaluateInput } from './types';

export type FieldErrors = Record<string, string>;

// Plausibility bounds for the patient; they catch unit slips (1.70 m typed as height in cm).
export const HEIGHT_BOUNDS_CM = [50, 250] as const;
export const WEIGHT_BOUNDS_KG = [2, 350] as const;
export const MAX_AGE_YEARS = 130;
export const ELLIPSOID_COEFFICIENT_BOUNDS = [0.4, 0.6] as const;
export const LA_CONSTANT_BOUNDS = [0.8, 0.9] as const;

function checkField(field: FieldDef, entry: unknown): string | null {
  if (entry === undefined || entry === NOT_DONE) return null;
  if (field.kind === 'choice') {
    return typeof entry === 'string' && field.options.some((o) => o.value === entry)
      ? null
      : `must be one of: ${field.options.map((o) => o.value).join(', ')}`;
  }
  if (entry === NOT_MEASURABLE) return null;
  const bounds = formatRange(field.min, field.max, field.unit, field.decimals);
  if (typeof entry !== 'number' || !Number.isFinite(entry)) {
    return `must be a number in ${field.unit}, "${NOT_MEASURABLE}" or "${NOT_DONE}"`;
  }
  if (entry < field.min || entry > field.max) {
    return `${entry} ${unitSymbol(field.unit)} is outside the plausible range ${bounds} (check the unit)`;
  }
  return null;
}

/** Field errors of one measurement set, keyed "measurements.<code>" (or with a prefix). */
export function validateMeasurements(fields: ReadonlyMap<string, FieldDef>, measurements: Measurements, prefix: string): FieldErrors {
  const errors: FieldErrors = {};
  for (const [code, entry] of Object.entries(measurements)) {
    const field = fields.get(code);
    const message = field === undefined ? 'unknown field for this template' : checkField(field, entry);
    if (message !== null) errors[`${prefix}.${code}`] = message;
  }
  return errors;
}

function inRange(value: unknown, [min, max]: readonly [number, number]): boolean {
  return typeof value === 'number' && Number.isFinite(value) && value >= min && value <= max;
}

function validatePatientAndOptions(input: EvaluateInput): FieldErrors {
  const errors: FieldErrors = {};
  const p = input.patient;
  const birth = parseIsoDate(p?.birthDate ?? '');
  const exam = parseIsoDate(p?.examDate ?? '');
  if (birth === null) errors['patient.birthDate'] = 'must be a calendar date YYYY-MM-DD';
  if (exam === null) errors['patient.examDate'] = 'must be a calendar date YYYY-MM-DD';
  if (birth !== null && exam !== null) {
    const age = ageInYears(birth, exam);
    if (age < 0) errors['patient.examDate'] = 'is before the birth date';
    else if (age > MAX_AGE_YEARS) errors['patient.birthDate'] = `gives an age above ${MAX_AGE_YEARS} years`;
  }
  if (p?.heightCm !== undefined && p.heightCm !== null && !inRange(p.heightCm, HEIGHT_BOUNDS_CM)) {
    errors['patient.heightCm'] = `must be between ${HEIGHT_BOUNDS_CM[0]} and ${HEIGHT_BOUNDS_CM[1]} cm`;
  }
  if (p?.weightKg !== undefined && p.weightKg !== null && !inRange(p.weightKg, WEIGHT_BOUNDS_KG)) {
    errors['patient.weightKg'] = `must be between ${WEIGHT_BOUNDS_KG[0]} and ${WEIGHT_BOUNDS_KG[1]} kg`;
  }
  const o = input.options ?? {};
  if (o.bsaMethod !== undefined && !Object.hasOwn(BSA_METHOD_LABELS, o.bsaMethod)) errors['options.bsaMethod'] = 'must be mosteller or dubois';
  if (o.aaaScheme !== undefined && !Object.hasOwn(AAA_SCHEMES, o.aaaScheme)) errors['options.aaaScheme'] = `must be one of: ${Object.keys(AAA_SCHEMES).join(', ')}`;
  if (o.ellipsoidCoefficient !== undefined && !inRange(o.ellipsoidCoefficient, ELLIPSOID_COEFFICIENT_BOUNDS)) errors['options.ellipsoidCoefficient'] = 'must be between 0.4 and 0.6';
  if (o.laAreaLengthConstant !== undefined && !inRange(o.laAreaLengthConstant, LA_CONSTANT_BOUNDS)) errors['options.laAreaLengthConstant'] = 'must be between 0.8 and 0.9';
  if (o.cbdAllowance !== undefined && o.cbdAllowance !== 'none' && o.cbdAllowance !== 'per-decade-over-60') errors['options.cbdAllowance'] = 'must be per-decade-over-60 or none';
  for (const id of o.disabledUrgentRules ?? []) {
    if (!Object.hasOwn(URGENT_RULES, id)) errors['options.disabledUrgentRules'] = `unknown rule ${id}`;
  }
  return errors;
}

/** All field errors of an evaluation request; empty when it may be evaluated. */
export function validateInput(template: TemplateDef, fields: ReadonlyMap<string, FieldDef>, input: EvaluateInput): FieldErrors {
  const errors: FieldErrors = {
    ...validatePatientAndOptions(input),
    ...validateMeasurements(fields, input.measurements ?? {}, 'measurements'),
    ...validateNodules(template.nodules, input.nodules, 'nodules'),
  };
  const prior = input.prior;
  if (prior !== undefined && prior !== null) {
    const priorDate = parseIsoDate(prior.examDate ?? '');
    const exam = parseIsoDate(input.patient?.examDate ?? '');
    if (priorDate === null) errors['prior.examDate'] = 'must be a calendar date YYYY-MM-DD';
    else if (exam !== null && (priorDate.year * 10000 + priorDate.month * 100 + priorDate.day) >= (exam.year * 10000 + exam.month * 100 + exam.day)) {
      errors['prior.examDate'] = 'must be before the exam date';
    }
    Object.assign(errors, validateMeasurements(fields, prior.measurements ?? {}, 'prior.measurements'));
    Object.assign(errors, validateNodules(template.nodules, prior.nodules, 'prior.nodules'));
  }
  return errors;
}
