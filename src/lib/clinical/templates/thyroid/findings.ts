import type { DeriveOutput, EvalContext, UrgentPrompt } from '../../evaluate/types';
import { formatNumber, joinList, sentenceCase } from '../../formatting';
import { COMPOSITION, ECHOGENIC_FOCI, ECHOGENICITY, MARGIN, SHAPE } from '../../tirads/features';
import { TIRADS_LEVEL_LABELS } from '../../tirads/score';
import { mmToCm } from '../../units';
import { urgentPrompt } from '../../urgent';
import { lobeDimensionsCm } from './derive';
import { THYROID_NODULES } from './fields';
import type { NoduleAssessment, NoduleInput } from './nodules';

const cm = (v: number): string => formatNumber(v, 1);
const mm = (v: number): string => formatNumber(v, THYROID_NODULES.decimals);

function lobeSentence(ctx: EvalContext, out: DeriveOutput, side: 'right' | 'left'): string | null {
  const dims = lobeDimensionsCm(ctx, side);
  const name = side === 'right' ? 'Right lobe' : 'Left lobe';
  if (dims === 'absent') return `${name} absent.`;
  if (dims === null) return null;
  const volume = out.derived.find((d) => d.code === `${side}LobeVolumeMl`);
  return `${name} ${dims.map(cm).join(' × ')} cm, volume ${volume?.display ?? 'not calculated'}.`;
}

function features(n: NoduleInput): string {
  if (n.composition === 'spongiform') return 'spongiform (other features not scored)';
  const foci = n.foci.length === 0 ? [ECHOGENIC_FOCI['none-or-comet-tail'].label] : n.foci.map((f) => ECHOGENIC_FOCI[f].label);
  return [COMPOSITION[n.composition].label, ECHOGENICITY[n.echogenicity].label, SHAPE[n.shape].label, MARGIN[n.margin].label, joinList(foci)].join(', ');
}

function recommendationText(a: NoduleAssessment): string {
  const years = `follow-up ultrasound at ${joinList(a.recommendation.followUpYears.map(String))} years`;
  const fna = a.recommendation.fnaThresholdCm;
  switch (a.action) {
    case 'fna':
      return `FNA recommended (size ≥ ${formatNumber(fna ?? 0, 1)} cm).`;
    case 'fna-not-selected':
      return `Meets FNA size (≥ ${formatNumber(fna ?? 0, 1)} cm) but is not among the ${THYROID_NODULES.maxBiopsied} nodules selected for FNA; ${years} (TR${a.level} schedule).`;
    case 'follow-up':
      return `${sentenceCase(years)}.`;
    default:
      return fna === null ? 'No FNA or follow-up.' : 'No FNA or follow-up by size.';
  }
}

function priorText(a: NoduleAssessment): string | null {
  if (a.prior === null) return null;
  const parts: string[] = [];
  const months = formatNumber(a.prior.intervalDays / 30.44, 0);
  parts.push(a.prior.growth.significant ? `Significant growth since the prior exam (${months} months): consider FNA or continued follow-up.` : `No significant growth since the prior exam (${months} months).`);
  if (a.prior.levelRose) parts.push('The TR level has risen since the prior exam: repeat ultrasound in 1 year.');
  return parts.join(' ');
}

function noduleSentence(ctx: EvalContext, a: NoduleAssessment): string {
  const n = ctx.nodules[a.index] as NoduleInput;
  const where = [n.lobe === 'isthmus' ? 'isthmus' : `${n.lobe} lobe`, n.zone ?? null].filter((x) => x !== null).join(', ');
  const dims = [n.lengthMm, n.widthMm, n.depthMm].map(mm).join(' × ');
  const level = `ACR TI-RADS ${a.points} points, TR${a.level} (${TIRADS_LEVEL_LABELS[a.level]})`;
  return [`Nodule ${a.id} (${where}): ${dims} mm; ${features(n)}; ${level}. ${recommendationText(a)}`, priorText(a)].filter((x) => x !== null).join(' ');
}

/** Findings sentences: lobes, total volume, isthmus, reported nodules, lymph nodes. */
export function thyroidFindings(ctx: EvalContext, out: DeriveOutput): string[] {
  const sentences: string[] = [];
  for (const side of ['right', 'left'] as const) {
    const s = lobeSentence(ctx, out, side);
    if (s !== null) sentences.push(s);
  }
  const total = out.derived.find((d) => d.code === 'thyroidVolumeMl');
  if (total !== undefined) sentences.push(`Total thyroid volume ${total.display} (${total.method}).`);
  const isthmus = ctx.read.number('isthmusThicknessMm', 'mm');
  if (isthmus !== null) sentences.push(`Isthmus ${mm(isthmus)} mm.`);
  const texture = ctx.read.choice('echotexture');
  if (texture !== null) sentences.push(`Echotexture ${texture}.`);
  const nodules = out.assessments.nodules ?? [];
  if (nodules.length === 0) sentences.push('No nodules recorded.');
  for (const a of nodules.filter((x) => x.reported)) sentences.push(noduleSentence(ctx, a));
  const hidden = nodules.filter((x) => !x.reported).length;
  if (hidden > 0) {
    sentences.push(`${hidden} further nodule${hidden === 1 ? '' : 's'} with lower TI-RADS points not described individually (ACR: at most ${THYROID_NODULES.maxReported} reported).`);
  }
  const nodes = ctx.read.choice('cervicalNodes');
  if (nodes === 'suspicious') sentences.push('Suspicious cervical lymph nodes.');
  if (nodes === 'no-suspicious') sentences.push('No suspicious cervical lymph nodes.');
  return sentences;
}

/** TR5 nodules meeting FNA size, extrathyroidal extension, suspicious nodes. */
export function thyroidUrgent(ctx: EvalContext, out: DeriveOutput): UrgentPrompt[] {
  const prompts: UrgentPrompt[] = [];
  for (const a of out.assessments.nodules ?? []) {
    const n = ctx.nodules[a.index] as NoduleInput;
    const size = `${formatNumber(mmToCm(a.maxDiameterMm), 1)} cm`;
    if (a.level === 5 && (a.action === 'fna' || a.action === 'fna-not-selected')) prompts.push(urgentPrompt('tirads-tr5-fna', `Nodule ${a.id}: TR5, ${size}.`));
    if (n.margin === 'extrathyroidal-extension') prompts.push(urgentPrompt('thyroid-extrathyroidal-extension', `Nodule ${a.id}.`));
  }
  if (ctx.read.choice('cervicalNodes') === 'suspicious') prompts.push(urgentPrompt('thyroid-suspicious-nodes', 'Recorded in the lymph-node section.'));
  return prompts;
}
