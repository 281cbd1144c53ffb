// What the structured measurement form holds while the sonographer types: text exactly as
// typed (so "4." or "4,8" survive a re-render), explicit "not measurable"/"not done" marks,
// and nodules as editable drafts. Turning this into engine input lives in entries.ts.
import { NOT_DONE, NOT_MEASURABLE, type TemplateDef } from '../clinical';
import type { MeasurementSource, MeasurementSources } from '../schemas/reports';

export type EntryMark = typeof NOT_MEASURABLE | typeof NOT_DONE;

/** One thyroid nodule as typed; '' means not chosen yet. */
export interface NoduleDraft {
  /** Stable React key and error anchor; never sent. */
  key: string;
  /** Nodule id in the report ("N1"), kept through reordering so priors can match it. */
  id: string;
  lobe: string;
  zone: string;
  lengthMm: string;
  widthMm: string;
  depthMm: string;
  composition: string;
  echogenicity: string;
  shape: string;
  margin: string;
  foci: string[];
}

export interface FormState {
  /** Number fields as typed, choice fields as the option value; '' or absent = blank. */
  values: Readonly<Record<string, string>>;
  /** Explicit states of number fields; absent = use the typed value. */
  marks: Readonly<Record<string, EntryMark>>;
  /** Values no person typed: taken from the scanner or the calipers; typing over one drops it. */
  sources: Readonly<Record<string, MeasurementSource>>;
  nodules: readonly NoduleDraft[];
  heightCm: string;
  weightKg: string;
  probeId: number | null;
}

/** The stored entries of a report, as the server sends them. */
export interface StoredEntries {
  measurements: Readonly<Record<string, number | string>>;
  measurementSources?: MeasurementSources;
  nodules: ReadonlyArray<Record<string, unknown>>;
  heightCm: number | null;
  weightKg: number | null;
  probeId: number | null;
}

export const NODULE_TEXT_FIELDS = ['lobe', 'zone', 'lengthMm', 'widthMm', 'depthMm', 'composition', 'echogenicity', 'shape', 'margin'] as const;
export type NoduleTextField = (typeof NODULE_TEXT_FIELDS)[number];

/**
 * A stored number as text, padded (never rounded) to the field's printing precision, so a
 * saved 1 reads "1.0" in a one-decimal field while a typed 4.85 stays 4.85.
 */
export function numberText(v: unknown, decimals = 0): string {
  if (typeof v !== 'number' || !Number.isFinite(v)) return '';
  const text = String(v);
  if (text.includes('e')) return text;
  const have = text.includes('.') ? text.length - text.indexOf('.') - 1 : 0;
  return have >= decimals ? text : `${text}${have === 0 ? '.' : ''}${'0'.repeat(decimals - have)}`;
}
const text = (v: unknown): string => (typeof v === 'string' ? v : '');

let keySeq = 0;
/** A key unique within this page, e.g. "n3". */
export const nextNoduleKey = (): string => `n${(keySeq += 1)}`;

/** The first "N<k>" not used by any nodule, e.g. with N1 and N3 present → "N2". */
export function nextNoduleId(nodules: readonly Pick<NoduleDraft, 'id'>[]): string {
  const used = new Set(nodules.map((n) => n.id));
  let k = 1;
  while (used.has(`N${k}`)) k += 1;
  return `N${k}`;
}

/** A blank nodule to append to `existing`. */
export function emptyNodule(existing: readonly NoduleDraft[]): NoduleDraft {
  return { key: nextNoduleKey(), id: nextNoduleId(existing), lobe: '', zone: '', lengthMm: '', widthMm: '', depthMm: '', composition: '', echogenicity: '', shape: '', margin: '', foci: [] };
}

/**
 * The form as a stored report fills it, e.g. `{ lviddCm: 4.8, trVelocityMS: 'not-measurable' }`
 * → values.lviddCm "4.8", marks.trVelocityMS "not-measurable". Unknown codes are dropped.
 */
export function formFromStored(stored: StoredEntries, template: TemplateDef): FormState {
  const values: Record<string, string> = {};
  const marks: Record<string, EntryMark> = {};
  const sources: Record<string, MeasurementSource> = {};
  for (const section of template.sections) {
    for (const field of section.fields) {
      const entry = stored.measurements[field.code];
      if (entry === undefined) continue;
      if (field.kind === 'number') {
        if (entry === NOT_MEASURABLE || entry === NOT_DONE) marks[field.code] = entry;
        else {
          values[field.code] = numberText(entry, field.decimals);
          const source = stored.measurementSources?.[field.code];
          if (source) sources[field.code] = source;
        }
      } else if (typeof entry === 'string' && entry !== NOT_DONE && entry !== NOT_MEASURABLE) {
        values[field.code] = entry;
      }
    }
  }
  const nodules: NoduleDraft[] = [];
  const decimals = template.nodules?.decimals ?? 0;
  for (const n of stored.nodules) {
    const id = typeof n.id === 'string' && n.id !== '' && !nodules.some((x) => x.id === n.id) ? n.id : nextNoduleId(nodules);
    nodules.push({
      key: nextNoduleKey(),
      id,
      lobe: text(n.lobe),
      zone: text(n.zone),
      lengthMm: numberText(n.lengthMm, decimals),
      widthMm: numberText(n.widthMm, decimals),
      depthMm: numberText(n.depthMm, decimals),
      composition: text(n.composition),
      echogenicity: text(n.echogenicity),
      shape: text(n.shape),
      margin: text(n.margin),
      foci: Array.isArray(n.foci) ? n.foci.filter((f): f is string => typeof f === 'string') : [],
    });
  }
  return { values, marks, sources, nodules, heightCm: numberText(stored.heightCm), weightKg: numberText(stored.weightKg), probeId: stored.probeId };
}
