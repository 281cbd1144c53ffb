import { describe, expect, it } from 'vitest';
import {
  bsaDuBoisM2,
  bsaMostellerM2,
  evaluate,
  lvMassAseLinearG,
  REFERENCE_RANGES,
  roundHalfUp,
  SEX_NOT_APPLIED,
  TEMPLATES,
  type EvaluationSuccess,
  type ReferenceRange,
} from '@/lib/clinical';
import { expectOk, fullEchoInput } from './helpers';

const flag = (r: EvaluationSuccess, code: string) => r.flags.find((f) => f.valueCode === code);
const derived = (r: EvaluationSuccess, code: string) => r.derived.find((d) => d.code === code);

describe('evaluate (echo)', () => {
  it('returns the expected LVMI and flags for a full echo set (man)', () => {
    const r = expectOk(evaluate(fullEchoInput('male')));
    // CLINICAL.md §1.3 M1 and V6; Lang et al. JASE 2015: LVMI 100.09 g/m² from the unrounded BSA 1.8181
    expect(roundHalfUp(derived(r, 'lvmiGM2')?.value ?? 0, 2)).toBe(100.09);
    expect(derived(r, 'lvmiGM2')?.display).toBe('100 g/m²');
    expect(derived(r, 'lvmiGM2')?.bsaMethod).toBe('mosteller');
    expect(flag(r, 'lvmiGM2')).toMatchObject({
      status: 'normal',
      grade: null,
      range: { min: 49, max: 115, unit: 'g/m2', sex: 'male', text: '49–115 g/m²' },
      provenance: 'SRC~',
      referenceSetVersion: 'crestline-ref-1.0.0',
    });
    expect(flag(r, 'lvmiGM2')?.source).toMatch(/Lang RM et al\. J Am Soc Echocardiogr 2015/);
    // M1: RWT 0.40, normal geometry for a man
    expect(r.assessments.lvGeometry).toBe('normal');
    expect(r.templateVersion).toBe(TEMPLATES.echo.version);
    expect(r.referenceSetVersion).toBe('crestline-ref-1.0.0');
  });

  it('flags the same set differently for a woman (M1-F)', () => {
    const r = expectOk(evaluate(fullEchoInput('female')));
    // CLINICAL.md §1.3 M1-F: LVMI 96–108 = mildly abnormal → eccentric hypertrophy
    expect(flag(r, 'lvmiGM2')).toMatchObject({ status: 'high', grade: 'mild', range: { max: 95, sex: 'female' } });
    expect(r.assessments.lvGeometry).toBe('eccentric-hypertrophy');
    expect(r.findings.join(' ')).toMatch(/LV mass index 100 g\/m² \(mildly abnormal\)/);
  });

  it('says "sex-specific reference not applied" instead of flagging when sex is unknown', () => {
    const r = expectOk(evaluate(fullEchoInput('unknown')));
    expect(flag(r, 'lvmiGM2')).toMatchObject({ status: 'not-applied', grade: null, range: null });
    expect(flag(r, 'lvmiGM2')?.message).toContain(SEX_NOT_APPLIED);
    expect(r.assessments.lvGeometry).toBeNull();
    expect(r.assessments.notes?.lvGeometry).toBe(SEX_NOT_APPLIED);
    // Sex-neutral rows still apply: LAVI 29 mL/m² (CLINICAL.md §1.6 row 1) is normal
    expect(flag(r, 'laviMlM2')?.status).toBe('normal');
    expect(r.findings.join(' ')).toContain(SEX_NOT_APPLIED);
    // Other sex values behave the same way
    expect(expectOk(evaluate({ ...fullEchoInput('unknown'), patient: { ...fullEchoInput('unknown').patient, sex: 'other' } })).flags.find((f) => f.valueCode === 'lvmiGM2')?.status).toBe('not-applied');
  });

  it('derives the worked values of the full set', () => {
    const r = expectOk(evaluate(fullEchoInput('male')));
    const v = (code: string, dp: number) => roundHalfUp(derived(r, code)?.value ?? NaN, dp);
    expect(v('laVolumeMl', 2)).toBe(52.02); // §1.6 row 1
    expect(v('laviMlM2', 2)).toBe(28.61); // §1.6 row 1
    expect(v('fsPercent', 0)).toBe(36); // §1.4
    expect(v('teichholzEfPercent', 2)).toBe(65.36); // §1.5, labelled, not graded
    expect(flag(r, 'teichholzEfPercent')).toBeUndefined();
    expect(v('eOverEPrimeAverage', 1)).toBe(11.4); // §1.8
    expect(v('eOverA', 2)).toBe(1.33); // §1.8
    expect(v('trGradientMmHg', 0)).toBe(36); // §1.7 row 1
    expect(v('rapMmHg', 0)).toBe(3); // §1.7 row 1
    expect(v('rvspMmHg', 0)).toBe(39); // §1.7 row 1
    // §1.9 D1: 2 of 4 criteria → indeterminate
    expect(r.assessments.diastolic).toMatchObject({ branch: 'normal-ef', conclusion: 'indeterminate', abnormalCount: 2, availableCount: 4 });
    expect(r.algorithms.diastolic).toMatch(/2016/);
  });

  it('records the BSA method with every indexed value and honours DuBois', () => {
    const input = fullEchoInput('male');
    const r = expectOk(evaluate({ ...input, options: { bsaMethod: 'dubois' } }));
    for (const code of ['lvmiGM2', 'laviMlM2', 'lviddIndexCmM2']) expect(derived(r, code)?.bsaMethod).toBe('dubois');
    // CLINICAL.md §1.2: DuBois 1.8097 m² at 170 cm / 70 kg
    expect(derived(r, 'lvmiGM2')?.value).toBeCloseTo(lvMassAseLinearG(1, 5, 1) / bsaDuBoisM2(170, 70), 9);
    expect(r.patient.bsa).toEqual({ valueM2: bsaDuBoisM2(170, 70), method: 'dubois' });
    expect(expectOk(evaluate(input)).patient.bsa?.valueM2).toBe(bsaMostellerM2(170, 70));
  });

  it('uses the reference rows passed in, not a hidden table', () => {
    const rows: ReferenceRange[] = REFERENCE_RANGES.map((row) =>
      row.code === 'lvmi' && row.sex === 'female' ? { ...row, normalMax: 110, mildLimit: 120, moderateLimit: 130, referenceSet: 'clinic-2026.1' } : row,
    );
    const r = expectOk(evaluate({ ...fullEchoInput('female'), referenceRanges: rows }));
    expect(flag(r, 'lvmiGM2')).toMatchObject({ status: 'normal', referenceSetVersion: 'clinic-2026.1' });
    expect(r.assessments.lvGeometry).toBe('normal');
    expect(r.referenceSetVersion).toBe('clinic-2026.1 + crestline-ref-1.0.0');
  });

  it('keeps "not measurable" apart from "not done"', () => {
    const input = fullEchoInput('male');
    const r = expectOk(evaluate({ ...input, measurements: { ...input.measurements, trVelocityMS: 'not-measurable', rvSPrimeCmS: 'not-done' } }));
    expect(r.findings).toContain('Not measurable: TR peak velocity.');
    expect(r.findings.join(' ')).not.toMatch(/RV S′/);
    // D1 without TR: 1 of 3 abnormal → normal (CLINICAL.md §1.9 rule "fewer than half")
    expect(r.assessments.diastolic).toMatchObject({ conclusion: 'normal', availableCount: 3 });
    expect(derived(r, 'rvspMmHg')).toBeUndefined();
  });

  it('chooses the diastolic branch from LVEF, myocardial disease and rhythm', () => {
    const input = fullEchoInput('female');
    const run = (m: Record<string, number | string>, sex: 'male' | 'female' | 'unknown' = 'female') =>
      expectOk(evaluate({ ...input, patient: { ...input.patient, sex }, measurements: { ...input.measurements, ...m } }));
    // LVEF 53 %: below the women's normal (54–74) but normal for men (52–72), Lang 2015
    expect(run({ lvefPercent: 53 }).assessments.diastolic?.branch).toBe('reduced-ef-or-myocardial-disease');
    expect(run({ lvefPercent: 53 }, 'male').assessments.diastolic?.branch).toBe('normal-ef');
    expect(run({ lvefPercent: 53 }, 'unknown').assessments.notes?.diastolic).toContain(SEX_NOT_APPLIED);
    expect(run({ lvefPercent: 40 }, 'unknown').assessments.diastolic?.branch).toBe('reduced-ef-or-myocardial-disease');
    expect(run({ myocardialDisease: 'yes' }).assessments.diastolic?.branch).toBe('reduced-ef-or-myocardial-disease');
    expect(run({ rhythm: 'atrial-fibrillation' }).assessments.diastolic).toBeNull();
    expect(run({ rhythm: 'atrial-fibrillation' }).assessments.notes?.diastolic).toMatch(/atrial fibrillation/);
  });

  it('prompts for severe LV dysfunction unless the rule is switched off', () => {
    const input = fullEchoInput('male');
    const severe = { ...input, measurements: { ...input.measurements, lvefPercent: 25 } };
    // Lang 2015: LVEF < 30 % is the severe band; CLINICAL.md §4 suggests category 2
    expect(expectOk(evaluate(severe)).urgentPrompts).toEqual([expect.objectContaining({ ruleId: 'lvef-severe', category: 2 })]);
    expect(expectOk(evaluate({ ...severe, options: { disabledUrgentRules: ['lvef-severe'] } })).urgentPrompts).toEqual([]);
    expect(expectOk(evaluate({ ...input, measurements: { ...input.measurements, lvefPercent: 30 } })).urgentPrompts).toEqual([]);
  });

  it('computes the aortic root z-score by Devereux 2012', () => {
    // CLINICAL.md §2.1 V17: man 55 y, BSA 2.0, root 4.0 cm → expected 3.57, z 1.64 (180 cm / 80 kg gives BSA 2.00)
    const input = fullEchoInput('male');
    const r = expectOk(evaluate({ ...input, patient: { ...input.patient, heightCm: 180, weightKg: 80 }, measurements: { ...input.measurements, aorticRootCm: 4.0 } }));
    expect(derived(r, 'aorticRootExpectedCm')?.display).toBe('3.57 cm');
    expect(derived(r, 'aorticRootZ')?.display).toBe('1.64');
    expect(r.findings.join(' ')).toMatch(/z-score 1\.64/);
  });

  it('leaves out indexed values without height and weight', () => {
    const input = fullEchoInput('male');
    const r = expectOk(evaluate({ ...input, patient: { ...input.patient, heightCm: null, weightKg: null } }));
    expect(derived(r, 'lvmiGM2')).toBeUndefined();
    expect(derived(r, 'lvMassG')?.display).toBe('182 g'); // CLINICAL.md §1.3 M1
    expect(r.assessments.notes?.bsa).toMatch(/height or weight missing/);
  });

  it('applies no adult reference under 18 years', () => {
    // CLINICAL.md §0.2 item 6
    const input = fullEchoInput('male');
    const r = expectOk(evaluate({ ...input, patient: { ...input.patient, birthDate: '2008-03-02' } }));
    expect(r.patient.ageYears).toBe(16);
    expect(new Set(r.flags.map((f) => f.status))).toEqual(new Set(['no-reference']));
  });

  it('is deterministic and does not touch its input', () => {
    const input = fullEchoInput('female');
    const frozen = JSON.parse(JSON.stringify(input));
    const a = evaluate(Object.freeze(input));
    expect(evaluate(input)).toEqual(a);
    expect(input).toEqual(frozen);
  });

  it('ships the cautions with every result', () => {
    const r = expectOk(evaluate(fullEchoInput('male')));
    expect(r.cautions).toMatch(/decision support/);
    expect(r.cautions).toMatch(/licensed physician/);
    expect(r.cautions).toMatch(/local protocols prevail/);
  });
});
