import { formatQuantity, formatRange } from '../formatting';
import { classifyValue, selectReference } from '../reference/classify';
import type { ReferenceRange } from '../reference/types';
import type { FieldDef, TemplateDef } from '../templates/types';
import type { SeverityGrade } from '../types';
import type { Unit } from '../units';
import type { DerivedValue, EvalContext, Flag } from './types';

const SEX_WORD = { male: 'men', female: 'women', any: '' } as const;
const GRADE_WORD: Readonly<Record<SeverityGrade, string>> = { mild: 'mildly', moderate: 'moderately', severe: 'severely' };

interface CheckedValue {
  label: string;
  value: number;
  unit: Unit;
  decimals: number;
}

function rangeOf(r: ReferenceRange): NonNullable<Flag['range']> {
  return { min: r.normalMin, max: r.normalMax, unit: r.unit, sex: r.sex, text: formatRange(r.normalMin, r.normalMax, r.unit, r.decimals) };
}

function verdict(status: Flag['status'], grade: SeverityGrade | null): string {
  if (status === 'normal') return 'normal';
  return grade === null ? status : `${GRADE_WORD[grade]} abnormal (${status})`;
}

/** Flag one value against the reference rows of the context (exported for tests and later rules). */
export function flagValue(valueCode: string, referenceCode: string, v: CheckedValue, ctx: EvalContext, adjust?: NonNullable<TemplateDef['referenceChecks'][number]['adjust']>): Flag {
  const display = formatQuantity(v.value, v.unit, v.decimals);
  const selection = selectReference(ctx.referenceRanges, referenceCode, ctx.sex, ctx.ageYears);
  if (selection.kind !== 'row') {
    return {
      valueCode, referenceCode, label: v.label, value: v.value, unit: v.unit, display,
      status: selection.kind, grade: null, range: null, referenceId: null, source: null, provenance: null,
      referenceSetVersion: null, message: `${v.label} ${display}: ${selection.reason}`, note: null, adjustment: null,
    };
  }
  const adjusted = adjust === undefined ? { row: selection.row, note: null } : adjust(selection.row, ctx);
  const r = adjusted.row;
  const c = classifyValue(r, v.value, v.unit);
  const range = rangeOf(r);
  return {
    valueCode, referenceCode, label: v.label, value: v.value, unit: v.unit, display,
    status: c.status,
    grade: c.grade,
    range,
    referenceId: r.id,
    source: r.source,
    provenance: r.provenance,
    referenceSetVersion: r.referenceSet,
    message: flagMessage({ label: v.label, display, status: c.status, grade: c.grade, range, source: r.source }),
    note: r.note,
    adjustment: adjusted.note,
  };
}

/**
 * The sentence of a flag judged against a reference row, made from the flag's own parts, e.g.
 * "LVEF 60 %: normal (reference 52–72 %, men; Lang RM et al. …)". The server stores flags
 * without it and makes it again with this when a report is read.
 */
export function flagMessage(f: Pick<Flag, 'label' | 'display' | 'status' | 'grade'> & { range: NonNullable<Flag['range']>; source: string }): string {
  const who = SEX_WORD[f.range.sex] === '' ? '' : `, ${SEX_WORD[f.range.sex]}`;
  return `${f.label} ${f.display}: ${verdict(f.status, f.grade)} (reference ${f.range.text}${who}; ${f.source})`;
}

/** Run every reference check of a template over the entered and derived values. */
export function computeFlags(template: TemplateDef, fields: ReadonlyMap<string, FieldDef>, ctx: EvalContext, derived: readonly DerivedValue[]): Flag[] {
  const flags: Flag[] = [];
  for (const check of template.referenceChecks) {
    const field = fields.get(check.valueCode);
    let v: CheckedValue | null = null;
    if (field?.kind === 'number') {
      const value = ctx.read.number(field.code);
      if (value !== null) v = { label: field.label, value, unit: field.unit, decimals: field.decimals };
    } else {
      const d = derived.find((x) => x.code === check.valueCode);
      if (d !== undefined) v = { label: d.label, value: d.value, unit: d.unit, decimals: d.decimals };
    }
    if (v !== null) flags.push(flagValue(check.valueCode, check.referenceCode, v, ctx, check.adjust));
  }
  return flags;
}

/** Short phrase for an abnormal flag in the findings list, e.g. "LVMI 100 g/m² (mildly abnormal)". */
export function abnormalPhrase(f: Flag): string {
  const what = f.grade === null ? f.status : `${GRADE_WORD[f.grade]} abnormal`;
  return `${f.label} ${f.display} (${what})`;
}
