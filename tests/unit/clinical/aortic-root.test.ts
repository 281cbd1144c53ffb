import { describe, expect, it } from 'vitest';
import { aorticRootZDevereux, expectedAorticRootDevereuxCm, expectedAorticRootRomanCm, roundHalfUp } from '@/lib/clinical';

describe('expectedAorticRootDevereuxCm', () => {
  it('matches the worked example', () => {
    // CLINICAL.md §2.1 and V17; Devereux et al. Am J Cardiol 2012 (equation SRC+): 3.573 cm
    expect(roundHalfUp(expectedAorticRootDevereuxCm(55, 2.0, 'male'), 3)).toBe(3.573);
  });

  it('is 0.267 cm smaller for a woman with the same age and BSA', () => {
    // Devereux 2012 sex term −0.267 × sex (1 man, 2 woman)
    expect(expectedAorticRootDevereuxCm(55, 2.0, 'male') - expectedAorticRootDevereuxCm(55, 2.0, 'female')).toBeCloseTo(0.267, 12);
  });
});

describe('aorticRootZDevereux', () => {
  it('matches the worked z-score', () => {
    // CLINICAL.md §2.1 and V17: measured 4.0 cm → z 1.64
    expect(roundHalfUp(aorticRootZDevereux(4.0, 55, 2.0, 'male'), 2)).toBe(1.64);
  });

  it('gives the same root a higher z in a woman', () => {
    expect(aorticRootZDevereux(4.0, 55, 2.0, 'female')).toBeGreaterThan(aorticRootZDevereux(4.0, 55, 2.0, 'male'));
  });
});

describe('expectedAorticRootRomanCm', () => {
  it('matches the worked example and the age split', () => {
    // CLINICAL.md §2.1; Roman et al. 1989 via secondary summaries (SRC~): 50 y, BSA 2.0 → 3.40 cm
    expect(roundHalfUp(expectedAorticRootRomanCm(50, 2.0) ?? 0, 2)).toBe(3.4);
    expect(roundHalfUp(expectedAorticRootRomanCm(30, 2.0) ?? 0, 2)).toBe(3.21);
    expect(roundHalfUp(expectedAorticRootRomanCm(40, 2.0) ?? 0, 2)).toBe(3.4);
    expect(expectedAorticRootRomanCm(19, 2.0)).toBeNull();
  });
});
