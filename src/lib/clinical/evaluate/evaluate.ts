import { AAA_SCHEMES, DEFAULT_AAA_SCHEME } from '../aaa/schemes';
import { CAUTIONS } from '../cautions';
import { ageInYears, daysBetween, parseIsoDate, type CalendarDate } from '../dates';
import { AORTIC_ROOT_METHOD } from '../formulas/aortic-root';
import { bsaM2 } from '../formulas/bsa';
import { DIASTOLIC_ALGORITHM } from '../formulas/diastolic';
import { LA_AREA_LENGTH_CONSTANT } from '../formulas/atrium';
import { ELLIPSOID_PI_OVER_6 } from '../formulas/ellipsoid';
import { joinList } from '../formatting';
import { REFERENCE_RANGES } from '../reference-ranges';
import { TIRADS_VERSION } from '../tirads/score';
import { getTemplate } from '../templates/registry';
import { NOT_MEASURABLE, type Sex } from '../types';
import { abnormalPhrase, computeFlags } from './flags';
import { createReader, indexFields } from './reader';
import type { EvalContext, EvaluateInput, EvaluationResult, ResolvedOptions } from './types';
import { validateInput } from './validate';

function resolveOptions(input: EvaluateInput): ResolvedOptions {
  const o = input.options ?? {};
  return {
    bsaMethod: o.bsaMethod ?? 'mosteller',
    ellipsoidCoefficient: o.ellipsoidCoefficient ?? ELLIPSOID_PI_OVER_6,
    aaaScheme: o.aaaScheme ?? DEFAULT_AAA_SCHEME,
    cbdAllowance: o.cbdAllowance ?? 'per-decade-over-60',
    laAreaLengthConstant: o.laAreaLengthConstant ?? LA_AREA_LENGTH_CONSTANT,
    disabledUrgentRules: o.disabledUrgentRules ?? [],
  };
}

const knownSex = (sex: unknown): Sex | null => (sex === 'male' || sex === 'female' ? sex : null);

/** Distinct versions of the rows in use, e.g. "crestline-ref-1.0.0". */
const setVersion = (rows: EvalContext['referenceRanges']): string => [...new Set(rows.map((r) => r.referenceSet))].sort().join(' + ');

/**
 * The engine's one entry point: validate, derive, flag, and write findings, e.g.
 * `evaluate({ templateId: 'echo', measurements: { lviddCm: 5 }, patient: { sex: 'male', birthDate: '1970-01-01', examDate: '2025-01-01' } })`.
 * Implausible input is refused with `fieldErrors`, never flagged.
 */
export function evaluate(input: EvaluateInput): EvaluationResult {
  const template = getTemplate(input.templateId);
  if (template === undefined) return { ok: false, fieldErrors: { templateId: `unknown template ${String(input.templateId)}` } };
  const fields = indexFields(template.sections);
  const errors = validateInput(template, fields, input);
  if (Object.keys(errors).length > 0) return { ok: false, fieldErrors: errors };

  const options = resolveOptions(input);
  const examDate = parseIsoDate(input.patient.examDate) as CalendarDate;
  const ageYears = ageInYears(parseIsoDate(input.patient.birthDate) as CalendarDate, examDate);
  const { heightCm, weightKg } = input.patient;
  const bsa = typeof heightCm === 'number' && typeof weightKg === 'number' ? { valueM2: bsaM2(heightCm, weightKg, options.bsaMethod), method: options.bsaMethod } : null;
  const prior = input.prior ?? null;
  const priorDate = prior === null ? null : (parseIsoDate(prior.examDate) as CalendarDate);
  const referenceRanges = input.referenceRanges ?? REFERENCE_RANGES;
  const measurements = input.measurements ?? {};
  const ctx: EvalContext = {
    sex: knownSex(input.patient.sex),
    ageYears,
    examDate,
    bsa,
    options,
    referenceRanges,
    read: createReader(fields, measurements),
    nodules: input.nodules ?? [],
    prior:
      prior === null || priorDate === null
        ? null
        : { examDate: priorDate, intervalDays: daysBetween(priorDate, examDate), read: createReader(fields, prior.measurements ?? {}), nodules: prior.nodules ?? [] },
  };

  const out = template.derive(ctx);
  const flags = computeFlags(template, fields, ctx, out.derived);
  const findings = template.findings(ctx, out, flags);
  const notMeasurable = Object.entries(measurements).filter(([, v]) => v === NOT_MEASURABLE).map(([code]) => fields.get(code)?.label ?? code);
  if (notMeasurable.length > 0) findings.push(`Not measurable: ${joinList(notMeasurable)}.`);
  const abnormal = flags.filter((f) => f.status === 'low' || f.status === 'high');
  findings.push(abnormal.length === 0 ? 'No values outside the reference ranges applied.' : `Values outside the reference range: ${abnormal.map(abnormalPhrase).join('; ')}.`);
  const notApplied = flags.filter((f) => f.status === 'not-applied' || f.status === 'no-reference');
  if (notApplied.length > 0) findings.push(`Not graded: ${notApplied.map((f) => f.message).join('; ')}.`);

  const urgentPrompts = template.urgent(ctx, out, flags).filter((p) => !options.disabledUrgentRules.includes(p.ruleId));
  return {
    ok: true,
    templateId: template.id,
    templateVersion: template.version,
    referenceSetVersion: setVersion(referenceRanges),
    algorithms: {
      diastolic: template.id === 'echo' ? DIASTOLIC_ALGORITHM : null,
      tirads: template.nodules === null ? null : TIRADS_VERSION,
      aorticRoot: template.id === 'echo' ? AORTIC_ROOT_METHOD : null,
      aaaScheme: template.id === 'abdomen' ? AAA_SCHEMES[options.aaaScheme].name : null,
    },
    patient: { ageYears, sex: ctx.sex, bsa },
    options,
    derived: out.derived,
    flags,
    findings,
    assessments: out.assessments,
    urgentPrompts,
    cautions: CAUTIONS,
  };
}
