import type { ProvenanceTag } from '../types';
import type { Unit } from '../units';

/**
 * One reference-range row: flat, so it maps one-to-one onto a `reference_ranges` table row.
 *
 * Limits are inclusive at `decimals`, the precision of the published table, and a value is
 * rounded half-up to `decimals` (in `unit`) before comparison (see rounding.ts). Severity:
 * beyond the normal limit on the `severityDirection` side, a value up to `mildLimit` is
 * mildly abnormal, up to `moderateLimit` moderately, beyond that severely abnormal.
 * Example, LVMI women (Lang 2015 "43–95 | 96–108 | 109–121 | ≥ 122"):
 * normalMin 43, normalMax 95, severityDirection 'high', mildLimit 108, moderateLimit 121.
 */
export interface ReferenceRange {
  /** Stable id, e.g. 'ase2015-lvmi-female'. */
  id: string;
  /** Measurement code the row applies to, e.g. 'lvmi'. */
  code: string;
  label: string;
  sex: 'male' | 'female' | 'any';
  /** Completed years, inclusive; null = open. */
  ageMinYears: number | null;
  ageMaxYears: number | null;
  unit: Unit;
  decimals: number;
  normalMin: number | null;
  normalMax: number | null;
  severityDirection: 'low' | 'high' | null;
  mildLimit: number | null;
  moderateLimit: number | null;
  /** Published source (authors, journal, year) or "common practice". */
  source: string;
  /** CLINICAL.md provenance tag; MEM rows must be checked before release. */
  provenance: ProvenanceTag;
  /** Version of the reference set the row belongs to. */
  referenceSet: string;
  note: string | null;
}
