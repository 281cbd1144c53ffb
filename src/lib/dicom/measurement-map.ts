import { roundHalfUp } from '../clinical/rounding';
import { getTemplate } from '../clinical/templates/registry';
import type { NumberField } from '../clinical/templates/types';
import { canConvert, convert, type Unit } from '../clinical/units';
import type { SrConcept, SrMeasurement } from './sr-measurements';

/**
 * Which structured-report measurement fills which template field. A concept is matched on
 * (scheme, code) alone, so only pre-coordinated codes are listed: a generic "Peak Velocity",
 * "Length" or "Diameter" that needs its Finding Site to mean anything stays unmapped.
 *
 * Sources: PS3.16 = DICOM PS3.16 context groups as published in the DICOM terminology FHIR
 * rendering (bvdh/dicom-terminology-in-fhir); every LN code also passes LOINC's mod-10 check
 * digit (tested). CID 12300 is TID 5300's "Core Echo Measurement"; PS3.16 warns that its
 * colloquial meanings stand for fuller LOINC definitions, which were not re-read here.
 */
export interface MappingRow {
  scheme: string;
  code: string;
  meaning: string;
  fieldCode: string;
  /** Only a measurement stating this Measurement Method (TID 300 modifier) is taken. */
  method?: SrConcept;
  source: string;
}

const DISKS_BIPLANE: SrConcept = { scheme: 'DCM', code: '125207', meaning: 'Method of Disks, Biplane' }; // PS3.16 CID 12228

const row = (code: string, meaning: string, fieldCode: string, source: string, method?: SrConcept): MappingRow => ({
  scheme: 'LN',
  code,
  meaning,
  fieldCode,
  source,
  ...(method ? { method } : {}),
});

export const MEASUREMENT_MAP: readonly MappingRow[] = [
  // Echo, TID 5200 codes
  row('29436-3', 'Left Ventricle Internal End Diastolic Dimension', 'lviddCm', 'DICOM PS3.16 CID 12201'),
  row('29438-9', 'Left Ventricle Internal Systolic Dimension', 'lvidsCm', 'DICOM PS3.16 CID 12201'),
  row('18154-5', 'Interventricular Septum Diastolic Thickness', 'ivsdCm', 'DICOM PS3.16 CID 12201'),
  row('18152-9', 'Left Ventricle Posterior Wall Diastolic Thickness', 'pwdCm', 'DICOM PS3.16 CID 12201'),
  // The field is the biplane EF; TID 5200 says how EF was obtained only in a method modifier.
  row('18043-0', 'Left Ventricular Ejection Fraction by US', 'lvefPercent', 'DICOM PS3.16 CID 12202 (method: CID 12228)', DISKS_BIPLANE),
  row('18037-2', 'Mitral Valve E-Wave Peak Velocity', 'eVelocityCmS', 'DICOM PS3.16 CID 12207'),
  row('17978-8', 'Mitral Valve A-Wave Peak Velocity', 'aVelocityCmS', 'DICOM PS3.16 CID 12207'),
  row('18015-8', 'Aortic Root Diameter', 'aorticRootCm', 'DICOM PS3.16 CID 12212'),
  // Echo, TID 5300 codes (2D and M-mode variants fill the same field)
  row('79969-2', 'Interventricular septum diastolic dimension 2D', 'ivsdCm', 'DICOM PS3.16 CID 12300'),
  row('79968-4', 'Interventricular septum diastolic dimension MM', 'ivsdCm', 'DICOM PS3.16 CID 12300'),
  row('80007-8', 'Left ventricular internal diastolic dimension - 2D', 'lviddCm', 'DICOM PS3.16 CID 12300'),
  row('80008-6', 'Left ventricular internal diastolic dimension - MM', 'lviddCm', 'DICOM PS3.16 CID 12300'),
  row('80031-8', 'Left ventricular posterior wall diastolic thickness', 'pwdCm', 'DICOM PS3.16 CID 12300'),
  row('80032-6', 'Left ventricular posterior wall diastolic thickness', 'pwdCm', 'DICOM PS3.16 CID 12300'),
  row('80011-0', 'Left ventricular internal systolic dimension - 2D', 'lvidsCm', 'DICOM PS3.16 CID 12300'),
  row('80012-8', 'Left ventricular internal systolic dimension - MM', 'lvidsCm', 'DICOM PS3.16 CID 12300'),
  row('79953-6', 'Aortic root diameter', 'aorticRootCm', 'DICOM PS3.16 CID 12300'),
  row('79991-6', 'Left ventricular ejection fraction biplane (MOD)', 'lvefPercent', 'DICOM PS3.16 CID 12300'),
  row('79974-2', 'Left atrial end systolic area 4C', 'laAreaA4cCm2', 'DICOM PS3.16 CID 12300'),
  row('79973-4', 'Left atrial end systolic area 2C', 'laAreaA2cCm2', 'DICOM PS3.16 CID 12300'),
  row('79980-9', 'Left atrial end systolic length 4C', 'laLengthA4cCm', 'DICOM PS3.16 CID 12300'),
  row('79979-1', 'Left atrial end systolic length 2C', 'laLengthA2cCm', 'DICOM PS3.16 CID 12300'),
  row('80070-6', 'Mitral valve E-wave Vmax', 'eVelocityCmS', 'DICOM PS3.16 CID 12300'),
  row('80066-4', 'Mitral valve A-wave Vmax', 'aVelocityCmS', 'DICOM PS3.16 CID 12300'),
  row('79911-4', 'Mitral septal e-prime Vmax', 'septalEPrimeCmS', 'DICOM PS3.16 CID 12300'),
  row('80054-0', 'Mitral lateral e-prime Vmax', 'lateralEPrimeCmS', 'DICOM PS3.16 CID 12300'),
  row('80080-5', 'Right ventricular basal dimension 4C', 'rvBasalMm', 'DICOM PS3.16 CID 12300'),
  row('80085-4', 'Right ventricular mid-cavity dimension 4C', 'rvMidMm', 'DICOM PS3.16 CID 12300'),
  row('77903-3', 'Tricuspid Annular Plane Systolic Excursion (TAPSE)', 'tapseMm', 'DICOM PS3.16 CID 12300'),
  row('79926-2', 'Tricuspid valve s-prime Vmax', 'rvSPrimeCmS', 'DICOM PS3.16 CID 12300'),
  row('79936-1', 'Right ventricular fractional area change', 'rvFacPercent', 'DICOM PS3.16 CID 12300'),
  row('80075-5', 'Right atrial end systolic area 4C', 'raAreaCm2', 'DICOM PS3.16 CID 12300'),
  row('79921-3', 'Tricuspid regurgitation Vmax', 'trVelocityMS', 'DICOM PS3.16 CID 12300'),
  row('80083-9', 'Right ventricular free wall thickness 2D', 'rvWallMm', 'DICOM PS3.16 CID 12300'),
  row('80084-7', 'Right ventricular free wall thickness MM', 'rvWallMm', 'DICOM PS3.16 CID 12300'),
  // Abdomen and thyroid: none. PS3.16 codes organ lengths and vessel diameters as a generic
  // Length or Diameter plus a Finding Site, which this concept-only table cannot tell apart.
];

/**
 * UCUM unit codes (case-sensitive) to Crestline's units. Only spellings of the same unit
 * appear here; the arithmetic between units (mm → cm ÷ 10, m/s → cm/s × 100, …) is units.ts's.
 */
export const UCUM_UNITS: Readonly<Record<string, Unit>> = {
  mm: 'mm',
  cm: 'cm',
  mm2: 'mm2',
  cm2: 'cm2',
  'cm/s': 'cm/s',
  'm/s': 'm/s',
  ml: 'mL',
  mL: 'mL',
  cm3: 'mL',
  '%': '%',
  g: 'g',
  kg: 'kg',
  m2: 'm2',
  'g/m2': 'g/m2',
  'ml/m2': 'mL/m2',
  'mL/m2': 'mL/m2',
  'cm/m2': 'cm/m2',
  'mm[Hg]': 'mmHg',
  // Not UCUM, but what some carts write.
  mmHg: 'mmHg',
  '1': 'ratio',
  '{ratio}': 'ratio',
};

export interface MappedMeasurement {
  fieldCode: string;
  /** In the field's unit, rounded half-up to one decimal more than the field prints. */
  value: number;
  concept: SrConcept;
  sourceValue: number;
  sourceUnit: string;
}

export interface UnmappedMeasurement {
  concept: SrConcept;
  reason: string;
}

export const REPEATED = 'repeated; the last value was used';

const key = (scheme: string, code: string) => `${scheme}|${code}`;
const BY_CONCEPT = new Map(MEASUREMENT_MAP.map((r) => [key(r.scheme, r.code), r]));

const label = (c: SrConcept) => `${c.scheme} ${c.code}${c.meaning ? ` "${c.meaning}"` : ''}`;

function numberFields(templateId: string): Map<string, NumberField> {
  const template = getTemplate(templateId);
  if (!template) throw new Error(`Unknown template "${templateId}"`);
  const fields = template.sections.flatMap((s) => s.fields).filter((f): f is NumberField => f.kind === 'number');
  return new Map(fields.map((f) => [f.code, f]));
}

/** The field one measurement fills, or why it fills none. */
function mapOne(m: SrMeasurement, fields: Map<string, NumberField>, templateId: string): MappedMeasurement | string {
  const r = BY_CONCEPT.get(key(m.concept.scheme, m.concept.code));
  if (!r) return `unknown concept ${label(m.concept)}`;
  const field = fields.get(r.fieldCode);
  if (!field) return `${r.fieldCode} is not a field of the ${templateId} template`;
  if (r.method && (m.method?.scheme !== r.method.scheme || m.method.code !== r.method.code)) {
    const how = m.method ? `by ${m.method.meaning || label(m.method)}` : 'with no method stated';
    return `measured ${how}; ${field.label} takes ${r.method.meaning} only`;
  }
  const unit = UCUM_UNITS[m.unit];
  if (!unit) return `unit "${m.unit}" is not a UCUM unit known here`;
  if (!canConvert(unit, field.unit)) return `unit ${m.unit} cannot be converted to ${field.unit} (${field.label})`;
  const value = roundHalfUp(convert(m.value, unit, field.unit), field.decimals + 1);
  return { fieldCode: field.code, value, concept: m.concept, sourceValue: m.value, sourceUnit: m.unit };
}

/**
 * Fills the template's number fields from SR measurements, e.g. LVIDd 48 mm → `{ fieldCode:
 * 'lviddCm', value: 4.8 }`. A field measured more than once takes the last value in document
 * order, and each earlier one is listed in `unmapped` as REPEATED so staff can see what was
 * set aside (whether a cart puts a mean before or after its single readings is not known here).
 * Values are not checked against the field's plausibility bounds: the form does that on entry.
 * `templateId` is a template id such as 'echo' (as stored on an exam type); an unknown one throws.
 */
export function mapMeasurements(
  list: readonly SrMeasurement[],
  templateId: string,
): { mapped: MappedMeasurement[]; unmapped: UnmappedMeasurement[] } {
  const fields = numberFields(templateId);
  const byField = new Map<string, MappedMeasurement>();
  const unmapped: UnmappedMeasurement[] = [];
  for (const m of list) {
    const result = mapOne(m, fields, templateId);
    if (typeof result === 'string') {
      unmapped.push({ concept: m.concept, reason: result });
      continue;
    }
    const earlier = byField.get(result.fieldCode);
    if (earlier) unmapped.push({ concept: earlier.concept, reason: REPEATED });
    byField.set(result.fieldCode, result);
  }
  return { mapped: [...byField.values()], unmapped };
}
