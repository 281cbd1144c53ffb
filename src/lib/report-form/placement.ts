// Where each calculated value is shown: under the section whose measurements complete it.
// Templates do not say which inputs a derived value uses, and the form must not restate the
// formulas, so the engine is asked once per template (see derivedPlacement).
import { evaluate, type EvaluateInput, type TemplateDef } from '../clinical';

/** Section id for values that need only height and weight (BSA). */
export const PATIENT_SECTION = 'patient';

// A plausible adult and the template's own example values: every formula can run.
const PROBE_PATIENT = { sex: 'female', birthDate: '1970-01-01', examDate: '2025-01-01', heightCm: 170, weightKg: 70 } as const;

function derivedCodes(input: EvaluateInput): Set<string> {
  const r = evaluate(input);
  return new Set(r.ok ? r.derived.map((d) => d.code) : []);
}

const cache = new Map<string, Readonly<Record<string, string>>>();

/**
 * Derived code → section id. Every number field gets its template example; leaving one field
 * out at a time, a derived value that appears or disappears depends on that field, and is placed
 * under the last such section in scan order (LVMI under the PLAX dimensions, RVSP under the
 * subcostal IVC). Values that depend only on height and weight go to PATIENT_SECTION; any the
 * probe never produced go under the last section. Runs about 30 evaluations once per template.
 *
 * @example derivedPlacement(getTemplate('thyroid')!).thyroidVolumeMl === 'left-lobe'
 */
export function derivedPlacement(template: TemplateDef): Readonly<Record<string, string>> {
  const cached = cache.get(template.id + template.version);
  if (cached !== undefined) return cached;
  const measurements: Record<string, number> = {};
  const sectionOf = new Map<string, number>();
  template.sections.forEach((s, i) => {
    for (const f of s.fields) {
      if (f.kind !== 'number') continue;
      measurements[f.code] = f.example;
      sectionOf.set(f.code, i);
    }
  });
  const input = (m: Record<string, number>, patient: EvaluateInput['patient'] = PROBE_PATIENT): EvaluateInput => ({ templateId: template.id, measurements: m, patient });
  const base = derivedCodes(input(measurements));
  const latest = new Map<string, number>();
  const touch = (changed: Set<string>, at: number) => {
    for (const code of changed) latest.set(code, Math.max(latest.get(code) ?? -1, at));
  };
  const diff = (other: Set<string>) => new Set([...base, ...other].filter((c) => base.has(c) !== other.has(c)));
  for (const [code, at] of sectionOf) {
    const { [code]: _left, ...rest } = measurements;
    touch(diff(derivedCodes(input(rest))), at);
  }
  const withoutBody = diff(derivedCodes(input(measurements, { ...PROBE_PATIENT, heightCm: null, weightKg: null })));
  const last = template.sections.length - 1;
  const placement: Record<string, string> = {};
  for (const d of template.derived) {
    const at = latest.get(d.code);
    placement[d.code] = at !== undefined ? template.sections[at]!.id : withoutBody.has(d.code) ? PATIENT_SECTION : template.sections[last]!.id;
  }
  cache.set(template.id + template.version, placement);
  return placement;
}
