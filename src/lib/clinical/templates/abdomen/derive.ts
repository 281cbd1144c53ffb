import { aaaAtRepairThreshold, aaaRapidGrowth, aaaSurveillance, isAneurysm } from '../../aaa/aaa';
import type { AaaConvention } from '../../aaa/schemes';
import { derivedSink } from '../../evaluate/derived';
import type { DeriveOutput, EvalContext, FieldReader } from '../../evaluate/types';
import { cbdUpperLimitMm } from '../../formulas/cbd';
import { ellipsoidMethod, ellipsoidVolumeMl } from '../../formulas/ellipsoid';
import type { ReferenceRange } from '../../reference/types';
import { ABDOMEN_DERIVED } from './fields';

const triple = (read: FieldReader, prefix: string): readonly [number, number, number] | null => {
  const l = read.number(`${prefix}LengthCm`, 'cm');
  const w = read.number(`${prefix}WidthCm`, 'cm');
  const d = read.number(`${prefix}DepthCm`, 'cm');
  return l === null || w === null || d === null ? null : [l, w, d];
};

/** Spleen, bladder and post-void volumes, kidney difference and the AAA assessment. */
export function deriveAbdomen(ctx: EvalContext): DeriveOutput {
  const sink = derivedSink(ABDOMEN_DERIVED);
  const { read } = ctx;
  const k = ctx.options.ellipsoidCoefficient;
  const method = ellipsoidMethod(k);
  const spleen = triple(read, 'spleen');
  if (spleen !== null) sink.add('spleenVolumeMl', ellipsoidVolumeMl(...spleen, k), { method });
  const right = read.number('rightKidneyLengthCm', 'cm');
  const left = read.number('leftKidneyLengthCm', 'cm');
  if (right !== null && left !== null) sink.add('kidneyLengthDifferenceCm', Math.abs(left - right));
  const pre = triple(read, 'bladderPre');
  if (pre !== null) sink.add('bladderVolumeMl', ellipsoidVolumeMl(...pre, k), { method });
  const post = triple(read, 'bladderPost');
  if (post !== null) sink.add('postVoidResidualMl', ellipsoidVolumeMl(...post, k), { method });

  const diameter = read.number('aortaDiameterCm', 'cm');
  let aaa: DeriveOutput['assessments']['aaa'] = null;
  if (diameter !== null) {
    const convention = read.choice('aortaConvention') as AaaConvention | null;
    const priorDiameter = ctx.prior?.read.number('aortaDiameterCm', 'cm') ?? null;
    aaa = {
      diameterCm: diameter,
      isAneurysm: isAneurysm(diameter),
      surveillance: aaaSurveillance(diameter, { scheme: ctx.options.aaaScheme, sex: ctx.sex, convention }),
      atRepairThreshold: aaaAtRepairThreshold(diameter, ctx.sex),
      convention,
      rapidGrowth: priorDiameter === null || ctx.prior === null ? null : aaaRapidGrowth(diameter, priorDiameter, ctx.prior.intervalDays),
    };
  }
  return { derived: sink.list, assessments: { aaa } };
}

/** CBD reference check: the row's limit raised by the age allowance or after cholecystectomy. */
export function adjustCbdLimit(row: ReferenceRange, ctx: EvalContext): { row: ReferenceRange; note: string | null } {
  const cholecystectomy = ctx.read.choice('cholecystectomy') === 'yes';
  const base = row.normalMax ?? 6;
  const limit = cbdUpperLimitMm(ctx.ageYears, { baseLimitMm: base, allowance: ctx.options.cbdAllowance, cholecystectomy });
  if (limit === base) return { row, note: null };
  const why = cholecystectomy ? 'after cholecystectomy, common practice' : `age ${ctx.ageYears} y: +1 mm per completed decade over 60, capped at 8.5 mm`;
  return { row: { ...row, normalMax: limit }, note: `Upper limit ${limit} mm (${why}).` };
}
