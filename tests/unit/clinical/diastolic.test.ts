import { describe, expect, it } from 'vitest';
import { DIASTOLIC_ALGORITHM, diastolicFunction2016, diastolicNormalEf2016, diastolicReducedEf2016, type DiastolicInputs } from '@/lib/clinical';

const none: DiastolicInputs = { eVelocityCmS: null, aVelocityCmS: null, septalEPrimeCmS: null, lateralEPrimeCmS: null, trVelocityMS: null, laviMlM2: null };
const inputs = (x: Partial<DiastolicInputs>): DiastolicInputs => ({ ...none, ...x });

// Worked cases: CLINICAL.md §1.9; Nagueh et al. JASE 2016. The table in CLINICAL.md has no D6.
describe('diastolicNormalEf2016', () => {
  it('D1: 2 of 4 abnormal → indeterminate', () => {
    // avg E/e′ 11.4 (E 80, e′ 6/8 as in §1.8) −, e′ +, TR 3.0 +, LAVI 29 −
    const r = diastolicNormalEf2016(inputs({ eVelocityCmS: 80, septalEPrimeCmS: 6, lateralEPrimeCmS: 8, trVelocityMS: 3.0, laviMlM2: 29 }));
    expect(r.conclusion).toBe('indeterminate');
    expect([r.abnormalCount, r.availableCount]).toEqual([2, 4]);
    expect(r.algorithm).toBe(DIASTOLIC_ALGORITHM);
  });

  it('D2: 3 of 4 abnormal → diastolic dysfunction', () => {
    // E/e′ 15 (E 90 over mean e′ 6) +, septal e′ 5 +, TR 2.5 −, LAVI 40 +
    const r = diastolicNormalEf2016(inputs({ eVelocityCmS: 90, septalEPrimeCmS: 5, lateralEPrimeCmS: 7, trVelocityMS: 2.5, laviMlM2: 40 }));
    expect(r.conclusion).toBe('dysfunction');
    expect([r.abnormalCount, r.availableCount]).toEqual([3, 4]);
  });

  it('D3: TR not measurable, 1 of 3 abnormal → normal', () => {
    // E/e′ 9 (E 85.5 over mean e′ 9.5) −, e′ 8/11 −, LAVI 36 +
    const r = diastolicNormalEf2016(inputs({ eVelocityCmS: 85.5, septalEPrimeCmS: 8, lateralEPrimeCmS: 11, laviMlM2: 36 }));
    expect(r.conclusion).toBe('normal');
    expect([r.abnormalCount, r.availableCount]).toEqual([1, 3]);
    expect(r.criteria.find((c) => c.id === 'tr-velocity')?.abnormal).toBeNull();
  });

  it('counts the two e′ sites once', () => {
    // CLINICAL.md §1.9: "septal e′ < 7 or lateral e′ < 10 (counts once)"
    const r = diastolicNormalEf2016(inputs({ septalEPrimeCmS: 5, lateralEPrimeCmS: 7 }));
    expect([r.abnormalCount, r.availableCount]).toEqual([1, 1]);
  });

  it('places each cut-off at the printed precision (exactly at → normal, just above → abnormal)', () => {
    // Nagueh 2016: E/e′ > 14, TR > 2.8 m/s, LAVI > 34 mL/m², septal e′ < 7, lateral e′ < 10
    const one = (x: Partial<DiastolicInputs>) => diastolicNormalEf2016(inputs(x)).abnormalCount;
    expect(one({ eVelocityCmS: 98, septalEPrimeCmS: 7, lateralEPrimeCmS: 7 })).toBe(1); // e′ lateral 7 < 10
    expect(one({ eVelocityCmS: 140, septalEPrimeCmS: 10, lateralEPrimeCmS: 10 })).toBe(0); // E/e′ 14.0
    expect(one({ eVelocityCmS: 140.5, septalEPrimeCmS: 10, lateralEPrimeCmS: 10 })).toBe(1); // 14.05 → 14.1
    expect(one({ trVelocityMS: 2.8 })).toBe(0);
    expect(one({ trVelocityMS: 2.84 })).toBe(0);
    expect(one({ trVelocityMS: 2.85 })).toBe(1);
    expect(one({ laviMlM2: 34 })).toBe(0);
    expect(one({ laviMlM2: 34.49 })).toBe(0);
    expect(one({ laviMlM2: 34.5 })).toBe(1);
    expect(one({ septalEPrimeCmS: 7.0, lateralEPrimeCmS: 10.0 })).toBe(0);
    expect(one({ septalEPrimeCmS: 6.94, lateralEPrimeCmS: 10.0 })).toBe(1);
    expect(one({ septalEPrimeCmS: 7.0, lateralEPrimeCmS: 9.9 })).toBe(1);
  });

  it('falls back to single-site E/e′ cut-offs (septal > 15, lateral > 13)', () => {
    // CLINICAL.md §1.8 (Nagueh 2016, SRC~)
    const septalOnly = (e: number) => diastolicNormalEf2016(inputs({ eVelocityCmS: e, septalEPrimeCmS: 8 })).criteria[0];
    expect(septalOnly(120)?.abnormal).toBe(false); // 15.0
    expect(septalOnly(121)?.abnormal).toBe(true); // 15.1
    const lateralOnly = (e: number) => diastolicNormalEf2016(inputs({ eVelocityCmS: e, lateralEPrimeCmS: 10 })).criteria[0];
    expect(lateralOnly(130)?.abnormal).toBe(false); // 13.0
    expect(lateralOnly(131)?.abnormal).toBe(true); // 13.1
  });

  it('cannot determine anything with no criterion', () => {
    expect(diastolicNormalEf2016(none).conclusion).toBe('cannot-determine');
  });
});

describe('diastolicReducedEf2016', () => {
  it('D4: E/A 0.7 and E 45 → grade I, normal LA pressure', () => {
    const r = diastolicReducedEf2016(inputs({ eVelocityCmS: 45, aVelocityCmS: 45 / 0.7 }));
    expect([r.conclusion, r.laPressure]).toEqual(['grade-I', 'normal']);
  });

  it('D5: E/A 1.4 with 3 of 3 positive → grade II, raised LA pressure', () => {
    // E 70 / A 50; E/e′ 15.6 (e′ 4/5) +, TR 3.0 +, LAVI 38 +
    const r = diastolicReducedEf2016(inputs({ eVelocityCmS: 70, aVelocityCmS: 50, septalEPrimeCmS: 4, lateralEPrimeCmS: 5, trVelocityMS: 3.0, laviMlM2: 38 }));
    expect([r.conclusion, r.laPressure]).toEqual(['grade-II', 'raised']);
  });

  it('D7: E/A 2.3 → grade III', () => {
    const r = diastolicReducedEf2016(inputs({ eVelocityCmS: 92, aVelocityCmS: 40 }));
    expect([r.conclusion, r.laPressure]).toEqual(['grade-III', 'raised']);
  });

  it('needs both E/A ≤ 0.8 and E ≤ 50 cm/s for grade I without criteria', () => {
    // CLINICAL.md §1.9 B.1, at and just above each limit
    expect(diastolicReducedEf2016(inputs({ eVelocityCmS: 50, aVelocityCmS: 62.5 })).conclusion).toBe('grade-I'); // 0.80, 50
    expect(diastolicReducedEf2016(inputs({ eVelocityCmS: 51, aVelocityCmS: 63.75 })).conclusion).toBe('cannot-determine'); // 0.80, E 51
    expect(diastolicReducedEf2016(inputs({ eVelocityCmS: 45, aVelocityCmS: 55 })).conclusion).toBe('cannot-determine'); // 0.82
  });

  it('starts grade III at E/A 2.0', () => {
    expect(diastolicReducedEf2016(inputs({ eVelocityCmS: 100, aVelocityCmS: 50 })).conclusion).toBe('grade-III');
    expect(diastolicReducedEf2016(inputs({ eVelocityCmS: 99, aVelocityCmS: 50 })).conclusion).toBe('cannot-determine'); // 1.98
  });

  it('counts the three criteria in the middle zone', () => {
    const mid = { eVelocityCmS: 70, aVelocityCmS: 50 };
    // 2 of 3 negative → grade I
    expect(diastolicReducedEf2016(inputs({ ...mid, septalEPrimeCmS: 8, lateralEPrimeCmS: 10, trVelocityMS: 2.5, laviMlM2: 40 })).conclusion).toBe('grade-I');
    // 2 measurable and discordant → cannot determine
    const r = diastolicReducedEf2016(inputs({ ...mid, trVelocityMS: 3.2, laviMlM2: 30 }));
    expect([r.conclusion, r.laPressure]).toEqual(['cannot-determine', null]);
    // 2 measurable, both positive → grade II
    expect(diastolicReducedEf2016(inputs({ ...mid, trVelocityMS: 3.2, laviMlM2: 40 })).conclusion).toBe('grade-II');
    // E/A ≤ 0.8 with E > 50 also goes to the criteria
    expect(diastolicReducedEf2016(inputs({ eVelocityCmS: 60, aVelocityCmS: 80, trVelocityMS: 3.2, laviMlM2: 40 })).conclusion).toBe('grade-II');
  });

  it('cannot determine without E/A', () => {
    expect(diastolicReducedEf2016(inputs({ trVelocityMS: 3.2, laviMlM2: 40 })).conclusion).toBe('cannot-determine');
  });
});

describe('diastolicFunction2016', () => {
  it('dispatches on the branch', () => {
    const x = inputs({ eVelocityCmS: 92, aVelocityCmS: 40, laviMlM2: 29 });
    expect(diastolicFunction2016('normal-ef', x).branch).toBe('normal-ef');
    expect(diastolicFunction2016('reduced-ef-or-myocardial-disease', x).conclusion).toBe('grade-III');
  });
});
