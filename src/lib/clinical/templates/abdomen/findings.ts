import type { DeriveOutput, DerivedValue, EvalContext, Flag, UrgentPrompt } from '../../evaluate/types';
import { formatNumber, formatQuantity, inlineLabel, sentenceCase } from '../../formatting';
import { urgentPrompt } from '../../urgent';
import type { NumberField } from '../types';
import { ABDOMEN_SECTIONS } from './fields';

const FIELDS = new Map(ABDOMEN_SECTIONS.flatMap((s) => s.fields).filter((f): f is NumberField => f.kind === 'number').map((f) => [f.code, f]));

function entered(ctx: EvalContext, code: string): string | null {
  const f = FIELDS.get(code);
  const v = ctx.read.number(code);
  return f === undefined || v === null ? null : `${inlineLabel(f.label)} ${formatQuantity(v, f.unit, f.decimals)}`;
}

const shown = (out: DeriveOutput, code: string): DerivedValue | undefined => out.derived.find((d) => d.code === code);

function sentence(parts: ReadonlyArray<string | null | undefined>): string | null {
  const kept = parts.filter((p): p is string => typeof p === 'string');
  return kept.length === 0 ? null : `${sentenceCase(kept.join(', '))}.`;
}

function aaaSentence(out: DeriveOutput): string | null {
  const a = out.assessments.aaa;
  if (a === null || a === undefined) return null;
  const size = `${formatNumber(a.diameterCm, 1)} cm`;
  const s = a.surveillance;
  const kind = a.isAneurysm ? `abdominal aortic aneurysm, maximum diameter ${size}` : `abdominal aorta maximum diameter ${size}, below the AAA threshold of 3.0 cm`;
  const convention = a.convention === null ? '' : ` (${a.convention})`;
  const advice = `${s.schemeName}: ${s.advice.text}`;
  const notes = s.notes.length === 0 ? '' : ` Note: ${s.notes.join('; ')}.`;
  const growth = a.rapidGrowth === true ? ' Rapid growth since the prior exam.' : '';
  return `${sentenceCase(kind)}${convention}; ${advice}.${growth}${notes}`;
}

/** Findings sentences in scan order, ending with the aorta and the bladder. */
export function abdomenFindings(ctx: EvalContext, out: DeriveOutput, flags: readonly Flag[]): string[] {
  const spleenVolume = shown(out, 'spleenVolumeMl');
  const cbdNote = flags.find((f) => f.valueCode === 'cbdMm')?.adjustment ?? null;
  const difference = shown(out, 'kidneyLengthDifferenceCm');
  return [
    sentence([entered(ctx, 'liverLengthCm')]),
    ctx.read.choice('cholecystectomy') === 'yes' ? 'Status after cholecystectomy.' : sentence([entered(ctx, 'gbWallMm')]),
    sentence([entered(ctx, 'cbdMm'), cbdNote === null ? null : inlineLabel(cbdNote.replace(/\.$/, ''))]),
    sentence([entered(ctx, 'portalVeinMm')]),
    sentence([entered(ctx, 'pancreaticDuctMm')]),
    sentence([entered(ctx, 'spleenLengthCm'), spleenVolume && `volume ${spleenVolume.display} (${spleenVolume.method})`]),
    sentence([entered(ctx, 'rightKidneyLengthCm'), entered(ctx, 'rightKidneyParenchymaCm')]),
    sentence([entered(ctx, 'leftKidneyLengthCm'), entered(ctx, 'leftKidneyParenchymaCm')]),
    sentence([difference && `${inlineLabel(difference.label)} ${difference.display}`]),
    aaaSentence(out),
    sentence([
      shown(out, 'bladderVolumeMl') && `bladder volume ${shown(out, 'bladderVolumeMl')?.display} pre-void`,
      shown(out, 'postVoidResidualMl') && `post-void residual ${shown(out, 'postVoidResidualMl')?.display}`,
    ]),
  ].filter((s): s is string => s !== null);
}

/** AAA at the repair threshold, or growing rapidly since the prior exam. */
export function abdomenUrgent(ctx: EvalContext, out: DeriveOutput, _flags: readonly Flag[]): UrgentPrompt[] {
  const a = out.assessments.aaa;
  if (a === null || a === undefined) return [];
  const prompts: UrgentPrompt[] = [];
  const size = `Maximum diameter ${formatNumber(a.diameterCm, 1)} cm`;
  if (a.atRepairThreshold) prompts.push(urgentPrompt('aaa-repair-threshold', `${size}${ctx.sex === null ? ' (sex not recorded: the 5.0 cm threshold was used)' : ''}.`));
  if (a.rapidGrowth === true) prompts.push(urgentPrompt('aaa-rapid-growth', `${size}.`));
  return prompts;
}
