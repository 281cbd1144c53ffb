import { describe, expect, it } from 'vitest';
import {
  noduleGrowth,
  selectBiopsyNodules,
  selectReportedNodules,
  tiradsFollowUpYears,
  tiradsLevel,
  tiradsPoints,
  tiradsRecommendation,
  type RankableNodule,
  type TiradsFeatures,
} from '@/lib/clinical';

const f = (x: Partial<TiradsFeatures>): TiradsFeatures => ({
  composition: 'solid',
  echogenicity: 'hypoechoic',
  shape: 'wider-than-tall',
  margin: 'smooth',
  foci: [],
  ...x,
});

// All values: CLINICAL.md §3; Tessler et al. JACR 2017 (ACR TI-RADS), SRC+ unless noted.
describe('tiradsPoints', () => {
  it('scores the worked nodules', () => {
    expect(tiradsPoints(f({}))).toBe(4); // T1 / V16
    expect(tiradsPoints(f({ composition: 'mixed', echogenicity: 'hyperechoic-or-isoechoic', foci: ['none-or-comet-tail'] }))).toBe(2); // T2
    expect(tiradsPoints(f({ echogenicity: 'hyperechoic-or-isoechoic' }))).toBe(3); // T4
  });

  it('gives spongiform nodules 0 whatever else is ticked', () => {
    // T5: spongiform — do not add points from other categories
    expect(tiradsPoints(f({ composition: 'spongiform', echogenicity: 'very-hypoechoic', shape: 'taller-than-wide', margin: 'extrathyroidal-extension', foci: ['punctate'] }))).toBe(0);
  });

  it('adds every echogenic focus once', () => {
    expect(tiradsPoints(f({ foci: ['macrocalcifications', 'peripheral-rim', 'punctate'] }))).toBe(4 + 1 + 2 + 3);
    expect(tiradsPoints(f({ foci: ['punctate', 'punctate'] }))).toBe(4 + 3);
  });

  it('scores each feature group as charted', () => {
    expect(tiradsPoints(f({ shape: 'taller-than-wide' }))).toBe(7);
    expect(tiradsPoints(f({ margin: 'lobulated-or-irregular' }))).toBe(6);
    expect(tiradsPoints(f({ margin: 'extrathyroidal-extension' }))).toBe(7);
    expect(tiradsPoints(f({ margin: 'ill-defined' }))).toBe(4);
    expect(tiradsPoints(f({ echogenicity: 'very-hypoechoic' }))).toBe(5);
    // "cannot be determined" rows (SRC~ via secondary calculators)
    expect(tiradsPoints(f({ composition: 'indeterminate-calcified', echogenicity: 'indeterminate', margin: 'indeterminate' }))).toBe(3);
    expect(tiradsPoints(f({ composition: 'cystic', echogenicity: 'anechoic' }))).toBe(0);
  });
});

describe('tiradsLevel', () => {
  it('maps totals to levels', () => {
    expect([0, 2, 3, 4, 5, 6, 7, 8, 14].map(tiradsLevel)).toEqual([1, 2, 3, 4, 4, 4, 5, 5, 5]);
  });

  it('maps a 1-point total to TR1 (section 9 item 11)', () => {
    // Our decision (CLINICAL.md §3.2 gap; 0–1 → TR1 is common practice): cystic + anechoic + macrocalcification = 1
    const points = tiradsPoints(f({ composition: 'cystic', echogenicity: 'anechoic', foci: ['macrocalcifications'] }));
    expect(points).toBe(1);
    expect(tiradsLevel(points)).toBe(1);
    expect(tiradsRecommendation(tiradsLevel(points), 4).action).toBe('none');
  });
});

describe('tiradsRecommendation', () => {
  it('T1: TR4 at 1.2 cm → follow-up at 1, 2, 3, 5 years; 1.6 → FNA; 0.9 → none', () => {
    expect(tiradsRecommendation(4, 1.2)).toMatchObject({ action: 'follow-up', followUpYears: [1, 2, 3, 5] });
    expect(tiradsRecommendation(4, 1.6).action).toBe('fna');
    expect(tiradsRecommendation(4, 0.9).action).toBe('none');
  });

  it('T2: TR2 at 3.0 cm → nothing', () => {
    expect(tiradsRecommendation(2, 3.0).action).toBe('none');
    expect(tiradsRecommendation(1, 6.0).action).toBe('none');
  });

  it('T4: TR3 at 2.6 → FNA; 1.5 → follow-up at 1, 3, 5 years; 1.4 → none', () => {
    expect(tiradsRecommendation(3, 2.6).action).toBe('fna');
    expect(tiradsRecommendation(3, 1.5)).toMatchObject({ action: 'follow-up', followUpYears: [1, 3, 5] });
    expect(tiradsRecommendation(3, 1.4).action).toBe('none');
  });

  it('uses "≥" exactly at each size limit, compared at 0.1 mm', () => {
    // CLINICAL.md §3.2: follow the ACR chart (≥), not "> 2.5 cm"
    const cases: Array<[1 | 2 | 3 | 4 | 5, number, string]> = [
      [3, 2.5, 'fna'], [3, 2.49, 'follow-up'], [3, 1.5, 'follow-up'], [3, 1.49, 'none'],
      [4, 1.5, 'fna'], [4, 1.49, 'follow-up'], [4, 1.0, 'follow-up'], [4, 0.99, 'none'],
      [5, 1.0, 'fna'], [5, 0.99, 'follow-up'], [5, 0.5, 'follow-up'], [5, 0.49, 'none'],
    ];
    for (const [level, cm, action] of cases) expect(tiradsRecommendation(level, cm).action, `TR${level} ${cm} cm`).toBe(action);
    // 14.95 mm prints as 15.0 mm (1.50 cm) and therefore meets TR4 FNA size
    expect(tiradsRecommendation(4, 1.495).action).toBe('fna');
    expect(tiradsRecommendation(4, 1.494).action).toBe('follow-up');
  });

  it('follows the TR5 footnote for 5–9 mm nodules and the yearly schedule', () => {
    expect(tiradsRecommendation(5, 0.7)).toMatchObject({ action: 'follow-up', followUpYears: [1, 2, 3, 4, 5] });
    expect(tiradsFollowUpYears(5)).toEqual([1, 2, 3, 4, 5]);
    expect(tiradsFollowUpYears(2)).toEqual([]);
  });
});

const rank = (index: number, points: number, cm: number): RankableNodule => ({
  index,
  points,
  level: tiradsLevel(points),
  maxDiameterCm: cm,
  meetsFnaSize: tiradsRecommendation(tiradsLevel(points), cm).action === 'fna',
});

describe('selectReportedNodules', () => {
  it('keeps the four highest-points nodules, larger first on ties', () => {
    const nodules = [rank(0, 2, 1), rank(1, 5, 1), rank(2, 4, 1), rank(3, 3, 1), rank(4, 6, 1), rank(5, 4, 2)];
    expect(selectReportedNodules(nodules)).toEqual([4, 1, 5, 2]);
  });

  it('always includes the nodules chosen for FNA', () => {
    const nodules = [rank(0, 6, 1.0), rank(1, 6, 1.1), rank(2, 5, 1.2), rank(3, 5, 1.3), rank(4, 3, 3.0)];
    expect(selectReportedNodules(nodules, 4, [4])).toEqual([4, 1, 0, 3]);
  });
});

describe('selectBiopsyNodules', () => {
  it('chooses at most two by highest level, then size', () => {
    // CLINICAL.md §3.3: biopsy at most 2, highest level first, size as tie-breaker
    const nodules = [rank(0, 4, 1.6), rank(1, 7, 1.1), rank(2, 6, 2.0), rank(3, 5, 3.0), rank(4, 3, 1.0)];
    expect(selectBiopsyNodules(nodules)).toEqual([1, 3]);
  });

  it('ignores nodules below FNA size', () => {
    expect(selectBiopsyNodules([rank(0, 9, 0.8), rank(1, 4, 1.2)])).toEqual([]);
  });
});

describe('noduleGrowth', () => {
  const prior = { lengthMm: 10, widthMm: 10, depthMm: 10 };
  it('needs > 20 % and > 2 mm in two dimensions', () => {
    // CLINICAL.md §3.3 (numbers SRC+; strict ">" is our decision where the wording is MEM)
    expect(noduleGrowth(prior, { lengthMm: 12.1, widthMm: 12.1, depthMm: 10 }).significant).toBe(true);
    expect(noduleGrowth(prior, { lengthMm: 12, widthMm: 12, depthMm: 10 }).grownDimensions).toEqual([]);
    expect(noduleGrowth(prior, { lengthMm: 12.1, widthMm: 10, depthMm: 10 }).significant).toBe(false);
  });

  it('needs both the percentage and the millimetres', () => {
    // 20 mm → 22.5 mm is +2.5 mm but only +12.5 %
    expect(noduleGrowth({ lengthMm: 20, widthMm: 20, depthMm: 20 }, { lengthMm: 22.5, widthMm: 22.5, depthMm: 20 }).grownDimensions).toEqual([]);
    // 5 mm → 6.5 mm is +30 % but only +1.5 mm
    expect(noduleGrowth({ lengthMm: 5, widthMm: 5, depthMm: 5 }, { lengthMm: 6.5, widthMm: 6.5, depthMm: 5 }).grownDimensions).toEqual([]);
  });

  it('counts > 50 % volume growth on its own', () => {
    expect(noduleGrowth(prior, { lengthMm: 15, widthMm: 10, depthMm: 10 }).volumeChangePercent).toBeCloseTo(50, 9);
    expect(noduleGrowth(prior, { lengthMm: 15, widthMm: 10, depthMm: 10 }).significant).toBe(false);
    expect(noduleGrowth(prior, { lengthMm: 15.1, widthMm: 10, depthMm: 10 }).significant).toBe(true);
  });
});
