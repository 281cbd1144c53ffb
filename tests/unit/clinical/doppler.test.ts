import { describe, expect, it } from 'vitest';
import { averageEOverEPrime, bernoulliGradientMmHg, eOverA, eOverEPrime, estimateRapFromIvc, ivcCollapsePercent, roundHalfUp, rvspMmHg } from '@/lib/clinical';

describe('bernoulliGradientMmHg', () => {
  it('is 4v²', () => {
    // CLINICAL.md §1.7 (common practice): 3.0 → 36, 2.6 → 27.04, 4.0 → 64 mmHg
    expect(bernoulliGradientMmHg(3.0)).toBeCloseTo(36, 12);
    expect(bernoulliGradientMmHg(2.6)).toBeCloseTo(27.04, 12);
    expect(bernoulliGradientMmHg(4.0)).toBe(64);
  });
});

describe('estimateRapFromIvc', () => {
  it('follows the three rows of the table', () => {
    // CLINICAL.md §1.7; Rudski et al. JASE 2010, reproduced in Lang 2015
    expect(estimateRapFromIvc(1.8, 60)).toEqual({ rapMmHg: 3, rangeMmHg: [0, 5], category: 'normal' });
    expect(estimateRapFromIvc(2.4, 30)).toEqual({ rapMmHg: 15, rangeMmHg: [10, 20], category: 'high' });
    expect(estimateRapFromIvc(2.4, 60).rapMmHg).toBe(8);
    expect(estimateRapFromIvc(1.8, 30).rapMmHg).toBe(8);
  });

  it('counts 2.1 cm as small and 2.2 cm as dilated', () => {
    // CLINICAL.md §1.7 gap: table says "≤ 2.1 cm"; compared at 0.1 cm
    expect(estimateRapFromIvc(2.1, 60).rapMmHg).toBe(3);
    expect(estimateRapFromIvc(2.14, 60).rapMmHg).toBe(3);
    expect(estimateRapFromIvc(2.15, 60).rapMmHg).toBe(8);
    expect(estimateRapFromIvc(2.2, 30).rapMmHg).toBe(15);
    expect(estimateRapFromIvc(2.1, 30).rapMmHg).toBe(8);
  });

  it('treats exactly 50 % collapse as intermediate', () => {
    // CLINICAL.md §1.7 gap: 50 % is neither "> 50 %" nor "< 50 %" → intermediate (suggested there)
    expect(estimateRapFromIvc(1.8, 50).rapMmHg).toBe(8);
    expect(estimateRapFromIvc(2.4, 50).rapMmHg).toBe(8);
    expect(estimateRapFromIvc(1.8, 51).rapMmHg).toBe(3);
    expect(estimateRapFromIvc(2.4, 49).rapMmHg).toBe(15);
  });

  it('computes collapse from diameters', () => {
    expect(ivcCollapsePercent(2.0, 0.8)).toBeCloseTo(60, 12);
  });
});

describe('rvspMmHg', () => {
  it('matches the worked rows', () => {
    // CLINICAL.md §1.7 and V13: TRV 3.0 + RAP 3 → 39; TRV 2.6 + RAP 15 → 42.04 mmHg
    expect(rvspMmHg(3.0, estimateRapFromIvc(1.8, 60).rapMmHg)).toBeCloseTo(39, 12);
    expect(roundHalfUp(rvspMmHg(2.6, estimateRapFromIvc(2.4, 30).rapMmHg), 2)).toBe(42.04);
  });
});

describe('eOverA', () => {
  it('matches the example', () => {
    // CLINICAL.md §1.8: E 80, A 60 cm/s → 1.33
    expect(roundHalfUp(eOverA(80, 60), 2)).toBe(1.33);
  });
});

describe('averageEOverEPrime', () => {
  it('divides E by the mean e′, not the mean of two ratios', () => {
    // CLINICAL.md §1.8 and V14: 80 / 7.0 = 11.43 (not 11.7)
    expect(roundHalfUp(averageEOverEPrime(80, 6, 8), 2)).toBe(11.43);
    expect(roundHalfUp((eOverEPrime(80, 6) + eOverEPrime(80, 8)) / 2, 1)).toBe(11.7);
  });

  it('gives the single-site ratios', () => {
    // CLINICAL.md §1.8: septal 13.3, lateral 10.0
    expect(roundHalfUp(eOverEPrime(80, 6), 1)).toBe(13.3);
    expect(roundHalfUp(eOverEPrime(80, 8), 1)).toBe(10);
  });

  it('is unit-free when E and e′ share a unit', () => {
    // CLINICAL.md §1.8: both cm/s or both m/s
    expect(averageEOverEPrime(0.8, 0.06, 0.08)).toBeCloseTo(averageEOverEPrime(80, 6, 8), 12);
  });
});
