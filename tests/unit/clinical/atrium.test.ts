import { describe, expect, it } from 'vitest';
import { bsaMostellerM2, indexToBsa, LA_AREA_LENGTH_EXACT, laLengthsDisagree, laVolumeBiplaneAreaLengthMl, roundHalfUp } from '@/lib/clinical';

describe('laVolumeBiplaneAreaLengthMl', () => {
  it('matches the worked rows with 0.85', () => {
    // CLINICAL.md §1.6 and V11 (Lang 2015 formula, SRC~ summaries): 52.02 and 86.31 mL
    expect(roundHalfUp(laVolumeBiplaneAreaLengthMl(18, 17, 5.0, 5.0), 2)).toBe(52.02);
    expect(roundHalfUp(laVolumeBiplaneAreaLengthMl(24, 22, 5.2, 5.2), 2)).toBe(86.31);
  });

  it('matches the worked rows with 8/(3π)', () => {
    // CLINICAL.md §1.6: 51.95 and 86.19 mL; 8/(3π) = 0.8488
    expect(roundHalfUp(LA_AREA_LENGTH_EXACT, 4)).toBe(0.8488);
    expect(roundHalfUp(laVolumeBiplaneAreaLengthMl(18, 17, 5.0, 5.0, LA_AREA_LENGTH_EXACT), 2)).toBe(51.95);
    expect(roundHalfUp(laVolumeBiplaneAreaLengthMl(24, 22, 5.2, 5.2, LA_AREA_LENGTH_EXACT), 2)).toBe(86.19);
  });

  it('uses the shorter of the two lengths', () => {
    // CLINICAL.md §1.6: L is the shorter long-axis length
    expect(laVolumeBiplaneAreaLengthMl(24, 22, 5.2, 5.5)).toBeCloseTo(laVolumeBiplaneAreaLengthMl(24, 22, 5.2, 5.2), 12);
    expect(laVolumeBiplaneAreaLengthMl(24, 22, 5.6, 5.2)).toBeCloseTo(laVolumeBiplaneAreaLengthMl(24, 22, 5.2, 5.2), 12);
  });
});

describe('LA volume index', () => {
  it('matches the worked LAVIs', () => {
    // CLINICAL.md §1.6 and V12: 28.61 and 47.47 mL/m² with BSA 1.8181 m²
    const bsa = bsaMostellerM2(170, 70);
    expect(roundHalfUp(indexToBsa(laVolumeBiplaneAreaLengthMl(18, 17, 5.0, 5.0), bsa), 2)).toBe(28.61);
    expect(roundHalfUp(indexToBsa(laVolumeBiplaneAreaLengthMl(24, 22, 5.2, 5.2), bsa), 2)).toBe(47.47);
  });
});

describe('laLengthsDisagree', () => {
  it('allows up to 5 mm difference', () => {
    // CLINICAL.md §1.6 (SRC~): lengths should differ by no more than about 5 mm
    expect(laLengthsDisagree(5.0, 5.5)).toBe(false);
    expect(laLengthsDisagree(5.0, 5.6)).toBe(true);
  });
});
