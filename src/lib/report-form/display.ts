// Wording shared by the live form and the server-rendered summary: how a flag, an entry or a
// nodule's management reads. Words only; every number comes from the engine.
import {
  BSA_METHOD_LABELS,
  formatNumber,
  formatQuantity,
  NOT_DONE,
  NOT_MEASURABLE,
  PROBE_KINDS,
  TIRADS_LEVEL_LABELS,
  type DerivedValue,
  type FieldDef,
  type Flag,
  type ImagingMode,
  type NoduleAssessment,
  type ProbeKind,
  type TemplateDef,
} from '../clinical';

/** First letter upper case, e.g. the engine's "must be between 50 and 250 cm" as a message. */
export const sentence = (text: string): string => text.charAt(0).toUpperCase() + text.slice(1);

/** Words as an English list, e.g. ['1', '2', '3'] → "1, 2 and 3". */
export function listWords(items: readonly string[]): string {
  return items.length <= 1 ? items.join('') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

export type FlagTone = 'normal' | 'high' | 'low' | 'muted';

const GRADE_TEXT = { mild: 'mildly abnormal', moderate: 'moderately abnormal', severe: 'severely abnormal' } as const;
const SEX_TEXT = { male: 'men', female: 'women', any: 'all adults' } as const;

/** The verdict as words, e.g. "High, mildly abnormal", "Normal", "Sex-specific reference not applied". */
export function flagStatusText(f: Pick<Flag, 'status' | 'grade' | 'message'>): string {
  switch (f.status) {
    case 'normal':
      return 'Normal';
    case 'low':
    case 'high': {
      const dir = f.status === 'high' ? 'High' : 'Low';
      return f.grade === null ? dir : `${dir}, ${GRADE_TEXT[f.grade]}`;
    }
    case 'not-applied':
      return 'Sex-specific reference not applied';
    case 'no-reference': {
      const reason = f.message.split(': ').slice(1).join(': ');
      return reason === '' ? 'No reference range' : sentence(reason);
    }
  }
}

export const flagTone = (f: Pick<Flag, 'status'>): FlagTone => (f.status === 'high' ? 'high' : f.status === 'low' ? 'low' : f.status === 'normal' ? 'normal' : 'muted');

/** e.g. "Reference 43–95 g/m² (women)"; null without a row. */
export function flagRangeText(f: Pick<Flag, 'range'>): string | null {
  return f.range === null ? null : `Reference ${f.range.text} (${SEX_TEXT[f.range.sex]})`;
}

/** e.g. "Lang RM et al. JASE 2015 [SRC+]"; null without a row. */
export function flagSourceText(f: Pick<Flag, 'source' | 'provenance'>): string | null {
  if (f.source === null) return null;
  return f.provenance === null ? f.source : `${f.source} [${f.provenance}]`;
}

/** Every line a reader needs to judge a flag: range, source, reference set, adjustments. */
export function flagDetailLines(f: Flag): string[] {
  // Without a row (sex unknown, no range for the age) the engine's message says why.
  if (f.range === null) return [f.message];
  return [
    flagRangeText(f),
    f.adjustment,
    flagSourceText(f) === null ? null : `Source: ${flagSourceText(f)}`,
    f.referenceSetVersion === null ? null : `Reference set ${f.referenceSetVersion}`,
    f.note,
  ].filter((x): x is string => x !== null && x !== '');
}

export const ENTRY_STATE_TEXT = { [NOT_MEASURABLE]: 'not measurable', [NOT_DONE]: 'not done' } as const;

/** An entry as printed, e.g. 4.8 in a cm field → "4.8 cm", "not-measurable" → "not measurable", a choice → its label. */
export function entryText(field: FieldDef, entry: number | string | undefined): string {
  if (entry === undefined || entry === '') return '';
  if (entry === NOT_MEASURABLE || entry === NOT_DONE) return ENTRY_STATE_TEXT[entry];
  if (field.kind === 'choice') return field.options.find((o) => o.value === entry)?.label ?? String(entry);
  return typeof entry === 'number' ? formatQuantity(entry, field.unit, field.decimals) : String(entry);
}

const MODE_ORDER: readonly ImagingMode[] = ['B-mode', 'M-mode', 'Doppler'];

/** The imaging modes behind the recorded values, in a fixed order, e.g. ['B-mode', 'Doppler']. */
export function modesUsed(template: TemplateDef, measurements: Readonly<Record<string, number | string>>): ImagingMode[] {
  const used = new Set<ImagingMode>();
  for (const section of template.sections) {
    for (const f of section.fields) {
      const v = measurements[f.code];
      const recorded = f.kind === 'number' ? typeof v === 'number' : typeof v === 'string' && v !== NOT_DONE && v !== '';
      if (recorded && f.mode !== null) used.add(f.mode);
    }
  }
  return MODE_ORDER.filter((m) => used.has(m));
}

/** e.g. "Linear array, Linear 4–15 (4–15 MHz)". */
export function probeText(kind: ProbeKind | null, probe: { label: string; frequencyMhz: string } | null): string {
  const kindLabel = kind === null ? 'Probe not recorded' : PROBE_KINDS[kind].label;
  return probe === null ? kindLabel : `${kindLabel}, ${probe.label} (${probe.frequencyMhz})`;
}

/** The TR level as words, e.g. "TR4, moderately suspicious". */
export const tiradsLevelText = (a: Pick<NoduleAssessment, 'level'>): string => `TR${a.level}, ${TIRADS_LEVEL_LABELS[a.level]}`;

/** What the size rule says for one nodule, e.g. "FNA (≥ 1.5 cm)" or "Follow-up at 1, 2, 3 and 5 years". */
export function noduleActionText(a: Pick<NoduleAssessment, 'action' | 'recommendation'>): string {
  const fna = a.recommendation.fnaThresholdCm;
  const years = `follow-up at ${listWords(a.recommendation.followUpYears.map(String))} years`;
  switch (a.action) {
    case 'fna':
      return `FNA (size ≥ ${formatNumber(fna ?? 0, 1)} cm)`;
    case 'fna-not-selected':
      return `Meets FNA size, not among the nodules selected for FNA: ${years}`;
    case 'follow-up':
      return sentence(years);
    case 'none':
      return fna === null ? 'No FNA or follow-up' : 'No FNA or follow-up by size';
  }
}

/** How a value was calculated, e.g. "ASE linear method; BSA Mosteller" (BSA named once). */
export function derivedMethodText(d: Pick<DerivedValue, 'method' | 'bsaMethod'>): string {
  const bsa = d.bsaMethod ? BSA_METHOD_LABELS[d.bsaMethod] : null;
  return [d.method, bsa && !d.method?.includes(bsa) ? `BSA ${bsa}` : null].filter(Boolean).join('; ');
}
