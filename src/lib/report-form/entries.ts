// From what was typed to what the clinical engine (and the server) take. The form never
// computes a clinical value itself: it hands the engine these entries and shows its answer.
import { evaluate, type EvaluationSuccess, type NoduleInput, type PatientInput, type PriorExamInput, type TemplateDef, type UrgentRuleId } from '../clinical';
import type { FormState, NoduleDraft } from './form-state';

export type Parsed = { kind: 'blank' } | { kind: 'number'; value: number } | { kind: 'invalid' };

const BLANK: Parsed = { kind: 'blank' };
const INVALID: Parsed = { kind: 'invalid' };

/**
 * A typed decimal, accepting a decimal comma (some keyboards offer only that), e.g.
 * `parseDecimal(' 4,8 ')` → 4.8, `parseDecimal('')` → blank, `parseDecimal('4.8.1')` → invalid.
 */
export function parseDecimal(text: string): Parsed {
  const t = text.trim().replace(',', '.');
  if (t === '') return BLANK;
  if (!/^[+-]?(\d+\.?\d*|\.\d+)$/.test(t)) return INVALID;
  const value = Number(t);
  return Number.isFinite(value) ? { kind: 'number', value } : INVALID;
}

// Error keys are the server's and the engine's, so a 400 from either lands on the same input.
/** `measurementKey('lviddCm') === 'measurements.lviddCm'` */
export const measurementKey = (code: string): string => `measurements.${code}`;
/** `noduleKey(0, 'lengthMm') === 'nodules[0].lengthMm'` (index in the form's order). */
export const noduleKey = (index: number, field: string): string => `nodules[${index}].${field}`;
export const HEIGHT_KEY = 'patient.heightCm';
export const WEIGHT_KEY = 'patient.weightKg';
export const PROBE_KEY = 'probeId';

export const NOT_A_NUMBER = 'Enter a number, e.g. 4.8 (or mark the value not measurable).';

/** Entries the engine accepts and the server stores: blank fields left out. */
export interface Entries {
  measurements: Record<string, number | string>;
  nodules: NoduleInput[];
  /** Key of the nodule draft behind each entry of `nodules` (drafts still incomplete are not sent). */
  noduleKeys: string[];
  heightCm: number | null;
  weightKg: number | null;
}

export interface BuiltEntries extends Entries {
  /** Text that is not a number, keyed like the server's errors. */
  errors: Record<string, string>;
  /** Keys of nodule drafts still missing a location, size or feature (not scored, not saved). */
  incompleteNodules: string[];
}

const DIMENSIONS = ['lengthMm', 'widthMm', 'depthMm'] as const;
const FEATURES = ['lobe', 'composition', 'echogenicity', 'shape', 'margin'] as const;

/** What a nodule draft still lacks before it can be scored, e.g. ['lengthMm', 'margin']. */
export function noduleGaps(n: NoduleDraft): string[] {
  return [...FEATURES.filter((f) => n[f] === ''), ...DIMENSIONS.filter((d) => parseDecimal(n[d]).kind !== 'number')];
}

function patientNumber(text: string, key: string, errors: Record<string, string>): number | null {
  const p = parseDecimal(text);
  if (p.kind === 'invalid') errors[key] = 'Enter a number.';
  return p.kind === 'number' ? p.value : null;
}

/** The form's entries in engine shape, with the typing errors found on the way. */
export function buildEntries(form: FormState, template: TemplateDef): BuiltEntries {
  const errors: Record<string, string> = {};
  const measurements: Record<string, number | string> = {};
  for (const section of template.sections) {
    for (const field of section.fields) {
      const code = field.code;
      const text = form.values[code] ?? '';
      if (field.kind === 'choice') {
        if (text !== '') measurements[code] = text;
        continue;
      }
      const mark = form.marks[code];
      if (mark !== undefined) {
        // "Not done" is the same as blank for the engine; stored explicitly so a reader sees it was considered.
        measurements[code] = mark;
        continue;
      }
      const p = parseDecimal(text);
      if (p.kind === 'number') measurements[code] = p.value;
      else if (p.kind === 'invalid') errors[measurementKey(code)] = NOT_A_NUMBER;
    }
  }
  const nodules: NoduleInput[] = [];
  const noduleKeys: string[] = [];
  const incompleteNodules: string[] = [];
  form.nodules.forEach((n, i) => {
    for (const d of DIMENSIONS) if (parseDecimal(n[d]).kind === 'invalid') errors[noduleKey(i, d)] = 'Enter a number in mm.';
    if (noduleGaps(n).length > 0) {
      incompleteNodules.push(n.key);
      return;
    }
    const mm = (d: (typeof DIMENSIONS)[number]) => (parseDecimal(n[d]) as { value: number }).value;
    nodules.push({
      id: n.id,
      lobe: n.lobe as NoduleInput['lobe'],
      zone: n.zone === '' ? null : (n.zone as NoduleInput['zone']),
      lengthMm: mm('lengthMm'),
      widthMm: mm('widthMm'),
      depthMm: mm('depthMm'),
      composition: n.composition as NoduleInput['composition'],
      echogenicity: n.echogenicity as NoduleInput['echogenicity'],
      shape: n.shape as NoduleInput['shape'],
      margin: n.margin as NoduleInput['margin'],
      foci: n.foci as NoduleInput['foci'],
    });
    noduleKeys.push(n.key);
  });
  return {
    measurements,
    nodules,
    noduleKeys,
    heightCm: patientNumber(form.heightCm, HEIGHT_KEY, errors),
    weightKg: patientNumber(form.weightKg, WEIGHT_KEY, errors),
    errors,
    incompleteNodules,
  };
}

const NODULE_ERROR = /^nodules\[(\d+)\](.*)$/;

/**
 * Re-keys errors that name a nodule by its position in a sent list (`nodules[0].lengthMm`) to
 * its position in the form now, through the draft keys sent with it. Other keys pass through;
 * a bare "heightCm" (the request schema's name) becomes "patient.heightCm".
 */
export function toFormErrorKeys(fields: Readonly<Record<string, string>>, sentKeys: readonly string[], form: FormState): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, message] of Object.entries(fields)) {
    const m = NODULE_ERROR.exec(key);
    if (m !== null) {
      const draftKey = sentKeys[Number(m[1])];
      const index = form.nodules.findIndex((n) => n.key === draftKey);
      if (index >= 0) out[`nodules[${index}]${m[2]}`] = message;
      continue;
    }
    if (key === 'heightCm' || key === 'weightKg') out[`patient.${key}`] = message;
    else out[key] = message;
  }
  return out;
}

export interface LiveEvaluation {
  /** The engine's answer over every valid entry; null only if even that was refused. */
  result: EvaluationSuccess | null;
  /** Typing errors and the engine's field errors, keyed like the server's (form order for nodules). */
  errors: Record<string, string>;
  /** The valid entries: what an autosave sends. */
  entries: Entries;
  incompleteNodules: string[];
}

/** Drops every entry an error names, so the rest can still be evaluated and saved. */
function withoutRefused(entries: Entries, fieldErrors: Readonly<Record<string, string>>): Entries | null {
  const measurements = { ...entries.measurements };
  const dropNodules = new Set<number>();
  let { heightCm, weightKg } = entries;
  for (const key of Object.keys(fieldErrors)) {
    const m = NODULE_ERROR.exec(key);
    if (key.startsWith('measurements.')) delete measurements[key.slice('measurements.'.length)];
    else if (m !== null) dropNodules.add(Number(m[1]));
    else if (key === HEIGHT_KEY) heightCm = null;
    else if (key === WEIGHT_KEY) weightKg = null;
    else return null;
  }
  const keep = (_: unknown, i: number) => !dropNodules.has(i);
  return { measurements, nodules: entries.nodules.filter(keep), noduleKeys: entries.noduleKeys.filter(keep), heightCm, weightKg };
}

/**
 * Evaluate the form with the engine, synchronously (about 0.2 ms). An implausible value does
 * not blank every calculation: the engine is asked again without the refused entries, and
 * the refusal is shown on its field.
 *
 * @example evaluateLive(form, getTemplate('thyroid')!, { sex: 'female', birthDate: '1980-05-20', examDate: '2025-05-20' })
 */
export function evaluateLive(
  form: FormState,
  template: TemplateDef,
  patient: Pick<PatientInput, 'sex' | 'birthDate' | 'examDate'>,
  prior: PriorExamInput | null = null,
  /** Urgent-finding rules the clinic switched off: the form prompts for them no more than the server does. */
  disabledUrgentRules: readonly UrgentRuleId[] = [],
): LiveEvaluation {
  const built = buildEntries(form, template);
  const { errors: typing, incompleteNodules, ...entries } = built;
  const run = (e: Entries) =>
    evaluate({ templateId: template.id, measurements: e.measurements, nodules: e.nodules, patient: { ...patient, heightCm: e.heightCm, weightKg: e.weightKg }, prior, options: { disabledUrgentRules } });
  const first = run(entries);
  if (first.ok) return { result: first, errors: typing, entries, incompleteNodules };
  const errors = { ...typing, ...toFormErrorKeys(first.fieldErrors, entries.noduleKeys, form) };
  const rest = withoutRefused(entries, first.fieldErrors);
  // An error outside the entries (e.g. the exam's dates): send everything unchanged, so the
  // server refuses it too and stores nothing, rather than saving an emptied draft.
  if (rest === null) return { result: null, errors, entries, incompleteNodules };
  const second = run(rest);
  return { result: second.ok ? second : null, errors, entries: rest, incompleteNodules };
}

/** The body of PUT /api/reports/:id/draft without its version. */
export function draftBody(entries: Entries, probeId: number | null, sources: FormState['sources'] = {}) {
  // Provenance goes only with values that are being saved as numbers.
  const measurementSources = Object.fromEntries(Object.entries(sources).filter(([code]) => typeof entries.measurements[code] === 'number'));
  return { measurements: entries.measurements, measurementSources, nodules: entries.nodules, heightCm: entries.heightCm, weightKg: entries.weightKg, probeId };
}
