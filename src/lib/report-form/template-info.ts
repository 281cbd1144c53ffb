// Facts the form reads off a template's data: which fields are required, which are waived
// by another answer, and how to name a field where its label alone is ambiguous.
import type { TemplateDef } from '../clinical';

/**
 * Required fields waived by the current answers, with the reason, e.g. with the right lobe
 * marked absent → `{ rightLobeLengthCm: 'Lobe: Absent (resected or agenesis)', … }`.
 */
export function waivedFields(template: TemplateDef, values: Readonly<Record<string, string>>): Record<string, string> {
  const fields = template.sections.flatMap((s) => s.fields);
  const out: Record<string, string> = {};
  for (const rule of template.required) {
    if (!rule.unless || values[rule.unless.code] !== rule.unless.value) continue;
    const by = fields.find((f) => f.code === rule.unless!.code);
    const option = by?.kind === 'choice' ? (by.options.find((o) => o.value === rule.unless!.value)?.label ?? rule.unless.value) : rule.unless.value;
    out[rule.code] = `${by?.label ?? rule.unless.code}: ${option}`;
  }
  return out;
}

/**
 * Field code → name for messages: the label, with its section where the label repeats, e.g.
 * thyroid `rightLobeLengthCm` → "Right lobe: length (craniocaudal)", `isthmusThicknessMm` → "Isthmus thickness (AP)".
 */
export function fieldNames(template: TemplateDef): Map<string, string> {
  const fields = template.sections.flatMap((s) => s.fields.map((f) => ({ s, f })));
  const count = (label: string) => fields.filter((x) => x.f.label === label).length;
  return new Map(fields.map(({ s, f }) => [f.code, count(f.label) > 1 ? `${s.title}: ${f.label.charAt(0).toLowerCase()}${f.label.slice(1)}` : f.label] as const));
}
