import type { DeriveOutput, DerivedValue, EvalContext, Flag, UrgentPrompt } from '../../evaluate/types';
import { formatQuantity, inlineLabel, sentenceCase } from '../../formatting';
import { DIASTOLIC_CONCLUSION_LABELS } from '../../formulas/diastolic';
import { LV_GEOMETRY_LABELS } from '../../formulas/lv';
import { urgentPrompt } from '../../urgent';
import { ECHO_SECTIONS } from './fields';
import type { NumberField } from '../types';

const FIELDS = new Map(ECHO_SECTIONS.flatMap((s) => s.fields).filter((f): f is NumberField => f.kind === 'number').map((f) => [f.code, f]));

function entered(ctx: EvalContext, code: string): string | null {
  const field = FIELDS.get(code);
  const value = ctx.read.number(code);
  return field === undefined || value === null ? null : `${inlineLabel(field.label)} ${formatQuantity(value, field.unit, field.decimals)}`;
}

const list = (ctx: EvalContext, codes: readonly string[]): string[] =>
  codes.map((c) => entered(ctx, c)).filter((x): x is string => x !== null);

const shown = (out: DeriveOutput, code: string): DerivedValue | undefined => out.derived.find((d) => d.code === code);

const phrase = (d: DerivedValue | undefined): string | null => (d === undefined ? null : `${inlineLabel(d.label)} ${d.display}`);

function sentence(parts: ReadonlyArray<string | null>, joiner = ', '): string | null {
  const kept = parts.filter((p): p is string => p !== null);
  return kept.length === 0 ? null : `${sentenceCase(kept.join(joiner))}.`;
}

/** Findings sentences in scan order: LV, LA, mitral inflow, diastolic function, right heart, root. */
export function echoFindings(ctx: EvalContext, out: DeriveOutput): string[] {
  const a = out.assessments;
  const bsa = shown(out, 'bsaM2');
  const lvmi = shown(out, 'lvmiGM2');
  const mass = lvmi === undefined
    ? phrase(shown(out, 'lvMassG'))
    : `${phrase(shown(out, 'lvMassG'))}, LV mass index ${lvmi.display} (BSA ${bsa?.display ?? ''}, ${bsa?.method ?? ''})`;
  const rwt = phrase(shown(out, 'rwt'));
  const geometry = a.lvGeometry ? `${rwt}: ${LV_GEOMETRY_LABELS[a.lvGeometry]}` : a.notes?.lvGeometry ? `${rwt}; LV geometry not classified: ${a.notes.lvGeometry}` : rwt;
  const teichholz = shown(out, 'teichholzEfPercent');
  const lavi = shown(out, 'laviMlM2');
  const diastolic = a.diastolic
    ? `Diastolic function (${a.diastolic.branch === 'normal-ef' ? 'normal-LVEF' : 'reduced-LVEF or myocardial disease'} algorithm, ${a.diastolic.algorithm}): ${DIASTOLIC_CONCLUSION_LABELS[a.diastolic.conclusion]} (${a.diastolic.reason}).`
    : a.notes?.diastolic ? `Diastolic function not graded: ${a.notes.diastolic}.` : null;
  const rap = a.rap ? `estimated RA pressure ${a.rap.rapMmHg} mmHg (range ${a.rap.rangeMmHg.join('–')})` : null;
  const root = shown(out, 'aorticRootZ');
  const rootText = entered(ctx, 'aorticRootCm');
  return [
    sentence(list(ctx, ['ivsdCm', 'lviddCm', 'pwdCm', 'lvidsCm'])),
    sentence([mass, geometry], '; '),
    sentence([phrase(shown(out, 'fsPercent')), entered(ctx, 'lvefPercent')]),
    teichholz === undefined ? null : `${teichholz.label} ${teichholz.display}: shown for reference, not used to grade LVEF.`,
    sentence([phrase(shown(out, 'laVolumeMl')), lavi === undefined ? null : `LA volume index ${lavi.display}`, a.notes?.la ?? null]),
    sentence([...list(ctx, ['eVelocityCmS', 'aVelocityCmS', 'septalEPrimeCmS', 'lateralEPrimeCmS']), phrase(shown(out, 'eOverA')), phrase(shown(out, 'eOverEPrimeAverage')), phrase(shown(out, 'eOverEPrimeSeptal')), phrase(shown(out, 'eOverEPrimeLateral'))]),
    diastolic,
    sentence([...list(ctx, ['rvBasalMm', 'rvMidMm', 'tapseMm', 'rvSPrimeCmS', 'rvFacPercent', 'raAreaCm2', 'rvWallMm'])]),
    sentence([entered(ctx, 'trVelocityMS'), phrase(shown(out, 'trGradientMmHg')), ...list(ctx, ['ivcDiameterCm', 'ivcCollapsePercent']), rap, phrase(shown(out, 'rvspMmHg'))]),
    rootText === null
      ? null
      : root === undefined
        ? sentenceCase(`${rootText}${a.notes?.aorticRoot ? ` (z-score not calculated: ${a.notes.aorticRoot})` : ''}.`)
        : sentenceCase(`${rootText}; expected ${shown(out, 'aorticRootExpectedCm')?.display ?? ''}, z-score ${root.display} (${root.method}).`),
  ].filter((s): s is string => s !== null);
}

/** LVEF in the ASE severe band. */
export function echoUrgent(_ctx: EvalContext, _out: DeriveOutput, flags: readonly Flag[]): UrgentPrompt[] {
  const ef = flags.find((f) => f.valueCode === 'lvefPercent');
  return ef?.grade === 'severe' ? [urgentPrompt('lvef-severe', `LVEF ${ef.display}.`)] : [];
}
