import type { EvalContext, DeriveOutput, Flag, UrgentPrompt } from '../evaluate/types';
import type { ReferenceRange } from '../reference/types';
import type { ImagingMode, ProbeKind, TemplateId } from '../types';
import type { Unit } from '../units';

/**
 * A numeric measurement. `min`/`max` are plausibility bounds: a value outside them is refused
 * (a typo or the wrong unit), never flagged. `decimals` is the printing precision, which equals
 * the precision of any reference table the value is checked against.
 */
export interface NumberField {
  kind: 'number';
  code: string;
  label: string;
  unit: Unit;
  decimals: number;
  min: number;
  max: number;
  mode: ImagingMode;
  /** A typical adult value, for placeholders and for the unit-slip tests. */
  example: number;
}

export interface ChoiceOption {
  value: string;
  label: string;
}

/** A single-choice field (clinical context, convention, texture). */
export interface ChoiceField {
  kind: 'choice';
  code: string;
  label: string;
  options: readonly ChoiceOption[];
  mode: ImagingMode | null;
}

export type FieldDef = NumberField | ChoiceField;

/** A group of fields, listed in scan order. */
export interface SectionDef {
  id: string;
  title: string;
  fields: readonly FieldDef[];
}

/** A value the template calculates; `decimals` as for NumberField. */
export interface DerivedDef {
  code: string;
  label: string;
  unit: Unit;
  decimals: number;
}

/** Check a field or derived value (`valueCode`) against reference rows of `referenceCode`. */
export interface ReferenceCheck {
  valueCode: string;
  referenceCode: string;
  /** Adjust the selected row for this patient (e.g. the CBD age allowance); returns a note. */
  adjust?: (row: ReferenceRange, ctx: EvalContext) => { row: ReferenceRange; note: string | null };
}

/** Limits for the nodule list of the thyroid template. */
export interface NoduleSpec {
  maxEntered: number;
  maxReported: number;
  maxBiopsied: number;
  dimensionMinMm: number;
  dimensionMaxMm: number;
  decimals: number;
}

/**
 * A measurement the preliminary report cannot go without. It counts as given when it holds a
 * value or is marked "not measurable"; `unless` waives it (e.g. lobe dimensions when the lobe
 * is absent).
 */
export interface RequiredRule {
  code: string;
  unless?: { code: string; value: string };
}

export interface TemplateDef {
  id: TemplateId;
  /** Semantic version; any change to the data below bumps it (a fingerprint test enforces this). */
  version: string;
  title: string;
  defaultProbe: ProbeKind;
  /** Whether the evaluation reads the latest prior exam (growth since then); callers skip looking it up otherwise. */
  readsPrior: boolean;
  sections: readonly SectionDef[];
  derived: readonly DerivedDef[];
  referenceChecks: readonly ReferenceCheck[];
  nodules: NoduleSpec | null;
  /** What "Submit preliminary" insists on. */
  required: readonly RequiredRule[];
  derive: (ctx: EvalContext) => DeriveOutput;
  findings: (ctx: EvalContext, out: DeriveOutput, flags: readonly Flag[]) => string[];
  urgent: (ctx: EvalContext, out: DeriveOutput, flags: readonly Flag[]) => UrgentPrompt[];
}
