import type { ProvenanceTag } from '../types';
import type { Unit } from '../units';
import type { ReferenceRange } from './types';

/** Version of the built-in reference set; bump on any row change (a test guards it). */
export const REFERENCE_SET_VERSION = 'crestline-ref-1.0.0';

/** Adults only: none of the tables in CLINICAL.md applies to children (§0.2 item 6). */
export const ADULT_MIN_AGE_YEARS = 18;

export interface RowSpec {
  code: string;
  label: string;
  sex: ReferenceRange['sex'];
  unit: Unit;
  decimals: number;
  normal: readonly [number | null, number | null];
  /** [direction, mildLimit, moderateLimit] where the source grades severity. */
  severity?: readonly ['low' | 'high', number, number];
  source: string;
  provenance: ProvenanceTag;
  note?: string;
}

/** Build a flat adult row from a compact spec, e.g. `row('ase2015', { code: 'lavi', … })`. */
export function row(idPrefix: string, spec: RowSpec): ReferenceRange {
  return {
    id: `${idPrefix}-${spec.code}-${spec.sex}`,
    code: spec.code,
    label: spec.label,
    sex: spec.sex,
    ageMinYears: ADULT_MIN_AGE_YEARS,
    ageMaxYears: null,
    unit: spec.unit,
    decimals: spec.decimals,
    normalMin: spec.normal[0],
    normalMax: spec.normal[1],
    severityDirection: spec.severity?.[0] ?? null,
    mildLimit: spec.severity?.[1] ?? null,
    moderateLimit: spec.severity?.[2] ?? null,
    source: spec.source,
    provenance: spec.provenance,
    referenceSet: REFERENCE_SET_VERSION,
    note: spec.note ?? null,
  };
}
