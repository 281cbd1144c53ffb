import { describe, expect, it } from 'vitest';
import { TEMPLATES } from '../../src/lib/clinical/templates/registry';
import { MEASUREMENT_MAP, REPEATED, UCUM_UNITS, mapMeasurements } from '../../src/lib/dicom/measurement-map';
import { readSrMeasurements, srMeasurements, type SrMeasurement } from '../../src/lib/dicom/sr-measurements';
import { makeUltrasoundDicom } from '../helpers/dicom';
import { makeEchoSr, type SrMeasurementSpec } from '../helpers/sr';

// Concept codes: DICOM PS3.16 CID 12201 (LV linear), 12207 (mitral), 12212 (aorta), 12300 (TID 5300).
const LVIDD = { scheme: 'LN', code: '29436-3', meaning: 'Left Ventricle Internal End Diastolic Dimension' };
const IVSD = { scheme: 'LN', code: '18154-5', meaning: 'Interventricular Septum Diastolic Thickness' };
const LVPWD = { scheme: 'LN', code: '18152-9', meaning: 'Left Ventricle Posterior Wall Diastolic Thickness' };
const LVIDS = { scheme: 'LN', code: '29438-9', meaning: 'Left Ventricle Internal Systolic Dimension' };
const AORTIC_ROOT = { scheme: 'LN', code: '18015-8', meaning: 'Aortic Root Diameter' };
const MV_E = { scheme: 'LN', code: '18037-2', meaning: 'Mitral Valve E-Wave Peak Velocity' };
const TR_VMAX = { scheme: 'LN', code: '79921-3', meaning: 'Tricuspid regurgitation Vmax' };
const LA_AREA_4C = { scheme: 'LN', code: '79974-2', meaning: 'Left atrial end systolic area 4C' };
const LVEF_US = { scheme: 'LN', code: '18043-0', meaning: 'Left Ventricular Ejection Fraction by US' };
const LVEF_BIPLANE = { scheme: 'LN', code: '79991-6', meaning: 'Left ventricular ejection fraction biplane (MOD)' };
// Measurement methods: DICOM PS3.16 CID 12228.
const DISKS_BIPLANE = { scheme: 'DCM', code: '125207', meaning: 'Method of Disks, Biplane' };
const TEICHHOLZ = { scheme: 'DCM', code: '125209', meaning: 'Teichholz' };
// A private coding scheme ("99" prefix, PS3.16): no table can know it.
const UNKNOWN = { scheme: '99CRESTLINE', code: 'T-1', meaning: 'Made-up measurement' };

const sr = (measurements: SrMeasurementSpec[]) =>
  readSrMeasurements(makeEchoSr({ patientId: 'P1', accessionNumber: 'A1', measurements }));
const byField = (mapped: { fieldCode: string; value: number }[]) => Object.fromEntries(mapped.map((m) => [m.fieldCode, m.value]));

describe('readSrMeasurements', () => {
  const list = sr([
    { ...LVIDD, value: 48, unit: 'mm' },
    { ...IVSD, value: 9, unit: 'mm' },
    { ...LVPWD, value: 9, unit: 'mm' },
    { ...LVIDS, value: 31, unit: 'mm' },
    { ...UNKNOWN, value: 12, unit: 'mm' },
    { ...AORTIC_ROOT, value: 30, unit: 'ml' },
    { ...MV_E, value: null, unit: 'cm/s' },
  ]);

  it('reads every NUM with a value, in document order, through nested containers', () => {
    // The values written by makeEchoSr above, read back from real Part 10 bytes.
    expect(list.map((m) => [m.concept.code, m.value, m.unit])).toEqual([
      ['29436-3', 48, 'mm'],
      ['18154-5', 9, 'mm'],
      ['18152-9', 9, 'mm'],
      ['29438-9', 31, 'mm'],
      ['T-1', 12, 'mm'],
      ['18015-8', 30, 'ml'],
    ]);
    expect(list[0]!.concept).toEqual(LVIDD);
  });

  it('gives the meanings of the enclosing containers as the path', () => {
    // makeEchoSr nests root › Findings › Measurement Group (TID 5200 concept names).
    expect(list[0]!.path).toEqual(['Adult Echocardiography Procedure Report', 'Findings', 'Measurement Group']);
  });

  it('skips a NUM without a numeric value', () => {
    expect(list.some((m) => m.concept.code === MV_E.code)).toBe(false);
  });

  it('reads the Measurement Method modifier', () => {
    const [ef] = sr([{ ...LVEF_US, value: 60, unit: '%', method: TEICHHOLZ }]);
    expect(ef!.method).toEqual(TEICHHOLZ);
  });

  it('refuses an ultrasound image with a clear error', () => {
    const image = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1' });
    // SOP Class 1.2.840.10008.5.1.4.1.1.6.1 is Ultrasound Image Storage (src/lib/dicom/dictionary.ts).
    expect(() => readSrMeasurements(image)).toThrow(/^Not a structured report: the object is Ultrasound Image \(1\.2\.840\.10008\.5\.1\.4\.1\.1\.6\.1\)/);
  });

  it('reads a Simplified Adult Echo SR and refuses an SR kind without measurements', () => {
    const lvidd = [{ ...LVIDD, value: 48, unit: 'mm' }];
    // SOP Class UIDs: PS3.4 B.5 (…88.72 Simplified Adult Echo SR, …88.11 Basic Text SR).
    const echo = makeEchoSr({ patientId: 'P1', accessionNumber: 'A1', sopClassUid: '1.2.840.10008.5.1.4.1.1.88.72', measurements: lvidd });
    expect(readSrMeasurements(echo).map((x) => x.value)).toEqual([48]);
    const basic = makeEchoSr({ patientId: 'P1', accessionNumber: 'A1', sopClassUid: '1.2.840.10008.5.1.4.1.1.88.11', measurements: lvidd });
    expect(() => readSrMeasurements(basic)).toThrow(/^Not a structured report that carries measurements: SOP Class 1\.2\.840\.10008\.5\.1\.4\.1\.1\.88\.11/);
  });

  it('refuses bytes that are not DICOM', () => {
    expect(() => readSrMeasurements(new TextEncoder().encode('not a dicom file'))).toThrow(/^Not a readable DICOM file/);
  });

  it('reads a view into a larger buffer', () => {
    const bytes = makeEchoSr({ patientId: 'P1', accessionNumber: 'A1', measurements: [{ ...LVIDD, value: 48, unit: 'mm' }] });
    const padded = new Uint8Array(bytes.length + 16);
    padded.set(bytes, 8);
    expect(readSrMeasurements(padded.subarray(8, 8 + bytes.length)).map((m) => m.value)).toEqual([48]);
  });
});

describe('srMeasurements', () => {
  it('takes a single-item sequence given as a bare object, at any depth', () => {
    const code = (c: { scheme: string; code: string; meaning: string }) => ({ CodeValue: c.code, CodingSchemeDesignator: c.scheme, CodeMeaning: c.meaning });
    const dataset = {
      ValueType: 'CONTAINER',
      ConceptNameCodeSequence: code({ scheme: 'DCM', code: '125200', meaning: 'Adult Echocardiography Procedure Report' }),
      ContentSequence: {
        ValueType: 'CONTAINER',
        ConceptNameCodeSequence: [code({ scheme: 'DCM', code: '121070', meaning: 'Findings' })],
        ContentSequence: {
          ValueType: 'NUM',
          ConceptNameCodeSequence: code(LVIDD),
          // DS as the string it is on the wire.
          MeasuredValueSequence: { NumericValue: '48', MeasurementUnitsCodeSequence: { CodeValue: 'mm', CodingSchemeDesignator: 'UCUM', CodeMeaning: 'mm' } },
          // A NUM's own children (here a value it was inferred from) are not listed on their own.
          ContentSequence: {
            RelationshipType: 'INFERRED FROM',
            ValueType: 'NUM',
            ConceptNameCodeSequence: code(LVIDD),
            MeasuredValueSequence: { NumericValue: 47, MeasurementUnitsCodeSequence: { CodeValue: 'mm', CodingSchemeDesignator: 'UCUM', CodeMeaning: 'mm' } },
          },
        },
      },
    };
    expect(srMeasurements(dataset)).toEqual([{ concept: LVIDD, value: 48, unit: 'mm', path: ['Adult Echocardiography Procedure Report', 'Findings'] }]);
  });
});

describe('mapMeasurements', () => {
  const m = (concept: SrMeasurement['concept'], value: number, unit: string, method?: SrMeasurement['concept']): SrMeasurement => ({
    concept,
    value,
    unit,
    path: [],
    ...(method ? { method } : {}),
  });

  it('fills the echo fields in cm from an SR in mm', () => {
    const list = sr([
      { ...LVIDD, value: 48, unit: 'mm' },
      { ...IVSD, value: 9, unit: 'mm' },
      { ...LVPWD, value: 9, unit: 'mm' },
      { ...LVIDS, value: 31, unit: 'mm' },
      { ...UNKNOWN, value: 12, unit: 'mm' },
      { ...AORTIC_ROOT, value: 30, unit: 'ml' },
    ]);
    const { mapped, unmapped } = mapMeasurements(list, 'echo');
    // Unit arithmetic: 48 mm ÷ 10 = 4.8 cm, 9 mm = 0.9 cm, 31 mm = 3.1 cm.
    expect(byField(mapped)).toEqual({ lviddCm: 4.8, ivsdCm: 0.9, pwdCm: 0.9, lvidsCm: 3.1 });
    expect(mapped.find((x) => x.fieldCode === 'lviddCm')).toEqual({ fieldCode: 'lviddCm', value: 4.8, concept: LVIDD, sourceValue: 48, sourceUnit: 'mm' });
    expect(unmapped).toEqual([
      { concept: UNKNOWN, reason: expect.stringMatching(/^unknown concept 99CRESTLINE T-1/) },
      // A volume unit (ml) for a diameter field in cm.
      { concept: AORTIC_ROOT, reason: expect.stringMatching(/^unit ml cannot be converted to cm/) },
    ]);
  });

  it('converts velocities both ways', () => {
    const { mapped } = mapMeasurements([m(MV_E, 0.8, 'm/s'), m(TR_VMAX, 280, 'cm/s')], 'echo');
    // Unit arithmetic: 0.8 m/s × 100 = 80 cm/s; 280 cm/s ÷ 100 = 2.8 m/s.
    expect(byField(mapped)).toEqual({ eVelocityCmS: 80, trVelocityMS: 2.8 });
  });

  it('converts areas and reads UCUM spellings of the same unit', () => {
    const { mapped } = mapMeasurements([m(LA_AREA_4C, 1800, 'mm2'), m(LVEF_BIPLANE, 55, '%')], 'echo');
    // Unit arithmetic: 1800 mm² ÷ 100 = 18 cm².
    expect(byField(mapped)).toEqual({ laAreaA4cCm2: 18, lvefPercent: 55 });
  });

  it('rounds half-up to one decimal more than the field prints', () => {
    // LVIDd prints at 0.1 cm (PRECISION.lvDimensionCm), so 2 decimals: 48.35 mm = 4.835 cm → 4.84.
    expect(mapMeasurements([m(LVIDD, 48.35, 'mm')], 'echo').mapped[0]!.value).toBe(4.84);
  });

  it('takes the last of repeated measurements and lists the others', () => {
    const first = m(LVIDD, 47, 'mm');
    const { mapped, unmapped } = mapMeasurements([first, m(LVIDD, 50, 'mm'), m({ ...LVIDD, code: '80007-8' }, 49, 'mm')], 'echo');
    // 49 mm is last (a TID 5300 code for the same field); 49 mm ÷ 10 = 4.9 cm.
    expect(byField(mapped)).toEqual({ lviddCm: 4.9 });
    expect(unmapped.map((u) => u.reason)).toEqual([REPEATED, REPEATED]);
    expect(REPEATED).toBe('repeated; the last value was used');
  });

  it('fills the biplane LVEF field only from a biplane method of disks', () => {
    expect(byField(mapMeasurements([m(LVEF_US, 60, '%', DISKS_BIPLANE)], 'echo').mapped)).toEqual({ lvefPercent: 60 });
    const refused = mapMeasurements([m(LVEF_US, 70, '%', TEICHHOLZ), m(LVEF_US, 65, '%')], 'echo');
    expect(refused.mapped).toEqual([]);
    expect(refused.unmapped.map((u) => u.reason)).toEqual([
      expect.stringMatching(/^measured by Teichholz; /),
      expect.stringMatching(/^measured with no method stated; /),
    ]);
  });

  it('fills only fields of the given template', () => {
    const { mapped, unmapped } = mapMeasurements([m(LVIDD, 48, 'mm')], 'abdomen');
    expect(mapped).toEqual([]);
    expect(unmapped).toEqual([{ concept: LVIDD, reason: 'lviddCm is not a field of the abdomen template' }]);
  });

  it('throws for an unknown template', () => {
    expect(() => mapMeasurements([m(LVIDD, 48, 'mm')], 'knee')).toThrow('Unknown template "knee"');
  });

  it('leaves a unit that is not UCUM unmapped', () => {
    expect(mapMeasurements([m(LVIDD, 48, 'millimetre')], 'echo').unmapped[0]!.reason).toMatch(/^unit "millimetre" is not a UCUM unit/);
  });
});

/** LOINC's mod-10 check digit of the part before the hyphen (loinc.org, "LOINC check digit"). */
function loincCheckDigit(number: string): number {
  const digits = [...number].reverse();
  const odd = digits.filter((_, i) => i % 2 === 0).reverse().join('');
  const even = digits.filter((_, i) => i % 2 === 1).reverse().join('');
  const sum = [...(even + String(Number(odd) * 2))].reduce((s, d) => s + Number(d), 0);
  return (10 - (sum % 10)) % 10;
}

describe('MEASUREMENT_MAP', () => {
  const numberFields = Object.values(TEMPLATES).flatMap((t) => t.sections.flatMap((s) => s.fields)).filter((f) => f.kind === 'number');

  it('names a source for every row and lists each concept once', () => {
    for (const r of MEASUREMENT_MAP) expect(r.source, r.code).toMatch(/^(DICOM PS3\.16 CID \d+|LOINC|from memory)/);
    const keys = MEASUREMENT_MAP.map((r) => `${r.scheme}|${r.code}`);
    expect(new Set(keys).size).toBe(keys.length);
  });

  it('uses LOINC codes whose check digit is right', () => {
    // 18154-7 and 18152-1, often quoted for IVSd and LVPWd, fail this check; 18154-5 and 18152-9 pass.
    expect(loincCheckDigit('18154')).toBe(5);
    expect(loincCheckDigit('18152')).toBe(9);
    for (const r of MEASUREMENT_MAP.filter((x) => x.scheme === 'LN')) {
      const [number, check] = r.code.split('-');
      expect(loincCheckDigit(number!), r.code).toBe(Number(check));
    }
  });

  it('points every row at a number field whose unit a UCUM unit reaches', () => {
    const ours = new Set(Object.values(UCUM_UNITS));
    for (const r of MEASUREMENT_MAP) {
      const field = numberFields.find((f) => f.code === r.fieldCode);
      expect(field, r.fieldCode).toBeDefined();
      expect(field!.kind === 'number' && ours.has(field!.unit), r.fieldCode).toBe(true);
    }
  });
});
