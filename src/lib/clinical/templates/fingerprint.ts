import type { TemplateDef } from './types';

// FNV-1a, 32 bit: tiny and dependency-free; this is change detection, not security.
function fnv1a(text: string): string {
  let hash = 0x811c9dc5;
  for (let i = 0; i < text.length; i += 1) {
    hash ^= text.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193) >>> 0;
  }
  return hash.toString(16).padStart(8, '0');
}

/**
 * Fingerprint of a template's data (sections, fields, bounds, derived catalogue, reference
 * checks, nodule limits), e.g. `templateFingerprint(ECHO_TEMPLATE) === '1a2b3c4d'`. A test pins
 * it per version, so changing the data without bumping `version` fails the build.
 */
export function templateFingerprint(t: TemplateDef): string {
  const data = {
    id: t.id,
    title: t.title,
    defaultProbe: t.defaultProbe,
    sections: t.sections,
    derived: t.derived,
    referenceChecks: t.referenceChecks.map((c) => [c.valueCode, c.referenceCode, c.adjust !== undefined]),
    nodules: t.nodules,
    required: t.required,
  };
  return fnv1a(JSON.stringify(data));
}

/** Fingerprint of any JSON-able data, e.g. the reference rows: `dataFingerprint(REFERENCE_RANGES)`. */
export const dataFingerprint = (data: unknown): string => fnv1a(JSON.stringify(data));
