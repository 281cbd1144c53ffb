import type { AaaSurveillance } from '../aaa/aaa';
import type { AaaConvention, AaaSchemeId } from '../aaa/schemes';
import type { CalendarDate } from '../dates';
import type { BsaMethod } from '../formulas/bsa';
import type { CbdAllowance } from '../formulas/cbd';
import type { DiastolicResult } from '../formulas/diastolic';
import type { RapEstimate } from '../formulas/doppler';
import type { LvGeometry } from '../formulas/lv';
import type { ReferenceRange } from '../reference/types';
import type { NoduleAssessment, NoduleInput } from '../templates/thyroid/nodules';
import type { Measurements, PatientSex, ProvenanceTag, SeverityGrade, Sex } from '../types';
import type { Unit } from '../units';
import type { UrgentRuleId } from '../urgent';

export interface PatientInput {
  sex?: PatientSex;
  /** ISO date "YYYY-MM-DD". */
  birthDate: string;
  /** ISO date "YYYY-MM-DD" of the exam. */
  examDate: string;
  heightCm?: number | null;
  weightKg?: number | null;
}

export interface EvaluateOptions {
  bsaMethod?: BsaMethod;
  /** Ellipsoid coefficient for thyroid lobes, spleen, bladder and PVR (default π/6). */
  ellipsoidCoefficient?: number;
  aaaScheme?: AaaSchemeId;
  cbdAllowance?: CbdAllowance;
  laAreaLengthConstant?: number;
  /** Urgent-prompt rules switched off for this clinic. */
  disabledUrgentRules?: readonly UrgentRuleId[];
}

export type ResolvedOptions = Required<Omit<EvaluateOptions, 'disabledUrgentRules'>> & {
  disabledUrgentRules: readonly UrgentRuleId[];
};

/** A previous exam of the same kind, for growth (AAA, nodules) and level changes. */
export interface PriorExamInput {
  examDate: string;
  measurements?: Measurements;
  nodules?: readonly NoduleInput[];
}

export interface EvaluateInput {
  templateId: string;
  measurements: Measurements;
  /** Thyroid only. */
  nodules?: readonly NoduleInput[];
  patient: PatientInput;
  prior?: PriorExamInput | null;
  options?: EvaluateOptions;
  /** Reference rows to use; defaults to the built-in REFERENCE_RANGES. */
  referenceRanges?: readonly ReferenceRange[];
}

export interface DerivedValue {
  code: string;
  label: string;
  /** Full precision; round only via `display`. */
  value: number;
  unit: Unit;
  decimals: number;
  display: string;
  /** Formula or method, e.g. "ASE linear method" or "ellipsoid, coefficient 0.5236". */
  method: string | null;
  /** Set on every BSA-indexed value. */
  bsaMethod: BsaMethod | null;
}

export type FlagStatus = 'normal' | 'low' | 'high' | 'not-applied' | 'no-reference';

export interface Flag {
  valueCode: string;
  referenceCode: string;
  label: string;
  value: number;
  unit: Unit;
  display: string;
  status: FlagStatus;
  grade: SeverityGrade | null;
  range: { min: number | null; max: number | null; unit: Unit; sex: 'male' | 'female' | 'any'; text: string } | null;
  referenceId: string | null;
  source: string | null;
  provenance: ProvenanceTag | null;
  referenceSetVersion: string | null;
  /** One line for the screen, e.g. "LV mass index 100 g/m²: mildly abnormal (high) (reference 43–95 g/m², women; Lang RM et al. …)". */
  message: string;
  /** Note of the reference row. */
  note: string | null;
  /** Why the row's limits were adjusted for this patient (e.g. the CBD age allowance). */
  adjustment: string | null;
}

export interface UrgentPrompt {
  ruleId: UrgentRuleId;
  /** ACR Actionable Reporting category: 1 minutes, 2 hours, 3 days. */
  category: 1 | 2 | 3;
  message: string;
}

export interface AaaAssessment {
  diameterCm: number;
  isAneurysm: boolean;
  surveillance: AaaSurveillance;
  atRepairThreshold: boolean;
  convention: AaaConvention | null;
  rapidGrowth: boolean | null;
}

/** Structured results beyond plain numbers; each key belongs to one template. */
export interface Assessments {
  lvGeometry?: LvGeometry | null;
  diastolic?: DiastolicResult | null;
  rap?: RapEstimate | null;
  aaa?: AaaAssessment | null;
  nodules?: NoduleAssessment[];
  /** Why an assessment could not be made, keyed like the assessment. */
  notes?: Partial<Record<'lvGeometry' | 'diastolic' | 'aorticRoot' | 'la' | 'bsa', string>>;
}

export interface DeriveOutput {
  derived: DerivedValue[];
  assessments: Assessments;
}

/** Reads validated measurements in any compatible unit. */
export interface FieldReader {
  number(code: string, unit?: Unit): number | null;
  state(code: string): 'value' | 'not-measurable' | 'not-done';
  choice(code: string): string | null;
}

export interface EvalContext {
  sex: Sex | null;
  ageYears: number;
  examDate: CalendarDate;
  bsa: { valueM2: number; method: BsaMethod } | null;
  options: ResolvedOptions;
  referenceRanges: readonly ReferenceRange[];
  read: FieldReader;
  nodules: readonly NoduleInput[];
  prior: { examDate: CalendarDate; intervalDays: number; read: FieldReader; nodules: readonly NoduleInput[] } | null;
}

export interface EvaluationSuccess {
  ok: true;
  templateId: string;
  templateVersion: string;
  referenceSetVersion: string;
  algorithms: { diastolic: string | null; tirads: string | null; aorticRoot: string | null; aaaScheme: string | null };
  patient: { ageYears: number; sex: Sex | null; bsa: { valueM2: number; method: BsaMethod } | null };
  options: ResolvedOptions;
  derived: DerivedValue[];
  flags: Flag[];
  findings: string[];
  assessments: Assessments;
  urgentPrompts: UrgentPrompt[];
  cautions: string;
}

export interface EvaluationFailure {
  ok: false;
  /** Keyed by field path, e.g. "measurements.lviddCm", "nodules[1].lengthMm", "patient.birthDate". */
  fieldErrors: Record<string, string>;
}

export type EvaluationResult = EvaluationSuccess | EvaluationFailure;

