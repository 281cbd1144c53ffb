import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REFERENCE_RANGES, REFERENCE_SET_VERSION, roundHalfUp } from '../../src/lib/clinical';
import { ReferenceRangeRow } from '../../src/db/models';
import { fromStoredRow } from '../../src/server/services/reference-ranges';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';
import { fullEchoInput } from '../unit/clinical/helpers';

beforeAll(() => {
  testDb();
});
afterAll(closeTestDb);

type Flag = { valueCode: string; status: string; grade: string | null; referenceSetVersion: string; source: string };
type Derived = { code: string; value: number };

describe('reference ranges in the database', () => {
  it('hold the built-in set row for row, with source and version', async () => {
    const rows = await ReferenceRangeRow.findAll({ where: { referenceSet: REFERENCE_SET_VERSION }, order: [['id', 'ASC']] });
    expect(rows.map(fromStoredRow)).toEqual(REFERENCE_RANGES);
    for (const r of rows) expect(r.source.length).toBeGreaterThan(3);
  });

  it('are stored once per version (a second run adds nothing)', async () => {
    const { ensureBuiltInReferenceSet } = await import('../../src/server/services/reference-ranges');
    expect(await ensureBuiltInReferenceSet()).toEqual({ version: REFERENCE_SET_VERSION, inserted: 0 });
  });
});

describe('POST /api/clinical/evaluate', () => {
  it('returns the LV mass index and flags of a full echo set', async () => {
    const res = await call('POST', '/api/clinical/evaluate', { cookie: await sessionFor('sonographer'), json: fullEchoInput('male') });
    expect(res.status).toBe(200);
    const r = res.body.result;
    // CLINICAL.md §1.3 M1 and V6; Lang et al. JASE 2015: LVMI 100.09 g/m² (man, 170 cm / 70 kg, Mosteller)
    expect(roundHalfUp(r.derived.find((d: Derived) => d.code === 'lvmiGM2').value, 2)).toBe(100.09);
    const lvmi = r.flags.find((f: Flag) => f.valueCode === 'lvmiGM2');
    expect(lvmi).toMatchObject({ status: 'normal', referenceSetVersion: REFERENCE_SET_VERSION });
    expect(lvmi.source).toMatch(/Lang RM et al\. J Am Soc Echocardiogr 2015/);
    // CLINICAL.md §1.9 D1: avg E/e′ 11.4, e′ 6/8 abnormal, TR 3.0 abnormal, LAVI 29 → 2 of 4 → indeterminate
    expect(r.assessments.diastolic).toMatchObject({ conclusion: 'indeterminate', abnormalCount: 2, availableCount: 4 });
    expect(r.cautions).toMatch(/decision support/);
  });

  it('flags the same numbers differently for a woman (CLINICAL.md §1.3 M1-F)', async () => {
    const res = await call('POST', '/api/clinical/evaluate', { cookie: await sessionFor('radiologist'), json: fullEchoInput('female') });
    expect(res.body.result.flags.find((f: Flag) => f.valueCode === 'lvmiGM2')).toMatchObject({ status: 'high', grade: 'mild' });
  });

  it('refuses a value outside plausible bounds with a field error, not a flag', async () => {
    const input = fullEchoInput('male');
    // LVIDd typed in mm into a cm field (50 instead of 5.0)
    const res = await call('POST', '/api/clinical/evaluate', {
      cookie: await sessionFor('sonographer'),
      json: { ...input, measurements: { ...input.measurements, lviddCm: 50 } },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['measurements.lviddCm']).toMatch(/plausible/);
  });

  it('refuses a malformed body with 400 and a field per problem', async () => {
    const res = await call('POST', '/api/clinical/evaluate', {
      cookie: await sessionFor('sonographer'),
      json: { templateId: 'kidney', measurements: {}, patient: { birthDate: '12/03/1970', examDate: '2026-12-02' }, referenceRanges: [] },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['templateId', 'patient.birthDate']));
  });
});
