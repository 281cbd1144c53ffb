import { derivedSink } from '../../evaluate/derived';
import type { DeriveOutput, EvalContext } from '../../evaluate/types';
import { ellipsoidMethod, ellipsoidVolumeMl } from '../../formulas/ellipsoid';
import { THYROID_DERIVED, THYROID_NODULES } from './fields';
import { assessNodules } from './nodules';

export type LobeSide = 'right' | 'left';

/** Lobe diameters in cm, or 'absent', or null when incomplete. */
export function lobeDimensionsCm(ctx: EvalContext, side: LobeSide): readonly [number, number, number] | 'absent' | null {
  if (ctx.read.choice(`${side}LobeState`) === 'absent') return 'absent';
  const l = ctx.read.number(`${side}LobeLengthCm`, 'cm');
  const w = ctx.read.number(`${side}LobeWidthCm`, 'cm');
  const d = ctx.read.number(`${side}LobeDepthCm`, 'cm');
  return l === null || w === null || d === null ? null : [l, w, d];
}

/** Lobe volumes, total volume and nodule assessments of a thyroid exam. */
export function deriveThyroid(ctx: EvalContext): DeriveOutput {
  const sink = derivedSink(THYROID_DERIVED);
  const k = ctx.options.ellipsoidCoefficient;
  const method = ellipsoidMethod(k);
  const volumes: Array<number | 'absent' | null> = (['right', 'left'] as const).map((side) => {
    const dims = lobeDimensionsCm(ctx, side);
    if (dims === null || dims === 'absent') return dims;
    return sink.add(`${side}LobeVolumeMl`, ellipsoidVolumeMl(dims[0], dims[1], dims[2], k), { method }).value;
  });
  // Total = sum of the lobes present; the isthmus is left out (CLINICAL.md §1.1), because only
  // its thickness is measured here.
  const present = volumes.filter((v): v is number => typeof v === 'number');
  if (!volumes.includes(null) && present.length > 0) {
    sink.add('thyroidVolumeMl', present.reduce((a, b) => a + b, 0), { method: `${method}; sum of lobes, isthmus excluded` });
  }
  const prior = ctx.prior === null ? null : { examDate: ctx.prior.examDate, nodules: ctx.prior.nodules };
  return {
    derived: sink.list,
    assessments: { nodules: assessNodules(ctx.nodules, THYROID_NODULES, prior, ctx.examDate, k) },
  };
}
