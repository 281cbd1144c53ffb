import { describe, expect, it } from 'vitest';
import { AAA_SCHEMES, aaaAtRepairThreshold, aaaRapidGrowth, aaaSizeBand, aaaSurveillance, DEFAULT_AAA_SCHEME, isAneurysm } from '@/lib/clinical';

describe('aaaSizeBand', () => {
  it('bands at 0.5 cm steps, compared at 0.1 cm', () => {
    // CLINICAL.md §2.3 surveillance table bands
    expect(aaaSizeBand(2.4)).toBe('below-2.5');
    expect(aaaSizeBand(2.5)).toBe('2.5-2.9');
    expect(aaaSizeBand(2.94)).toBe('2.5-2.9');
    expect(aaaSizeBand(2.95)).toBe('3.0-3.4');
    expect(aaaSizeBand(4.4)).toBe('4.0-4.4');
    expect(aaaSizeBand(4.5)).toBe('4.5-4.9');
    expect(aaaSizeBand(5.4)).toBe('5.0-5.4');
    expect(aaaSizeBand(5.5)).toBe('5.5-plus');
  });
});

describe('isAneurysm', () => {
  it('starts at 3.0 cm', () => {
    // CLINICAL.md §2.3; NHS AAA Screening Programme and ACR 2019 (SRC+): AAA ≥ 3.0 cm
    expect(isAneurysm(3.0)).toBe(true);
    expect(isAneurysm(2.9)).toBe(false);
    expect(isAneurysm(2.94)).toBe(false);
  });
});

describe('aaaSurveillance', () => {
  it('defaults to SVS 2018', () => {
    expect(DEFAULT_AAA_SCHEME).toBe('svs-2018');
  });

  // CLINICAL.md §2.3 table: [diameter, SVS 2018, ACR 2013, NHS] interval in months (null = none/refer)
  const rows: Array<[number, number | null, number | null, number | null]> = [
    [2.7, 120, 60, null],
    [3.2, 36, 36, 12],
    [3.7, 36, 24, 12],
    [4.2, 12, 12, 12],
    [4.7, 12, 6, 3],
    [5.2, 6, 3, 3],
    [5.6, null, null, null],
  ];
  it.each(rows)('%s cm → SVS %s, ACR %s, NHS %s months', (d, svs, acr, nhs) => {
    // Chaikof et al. J Vasc Surg 2018; Khosa et al. JACR 2013; NHS AAA Screening care pathway
    expect(aaaSurveillance(d, { scheme: 'svs-2018', convention: 'outer-to-outer' }).advice.intervalMonths).toBe(svs);
    expect(aaaSurveillance(d, { scheme: 'acr-2013', convention: 'outer-to-outer' }).advice.intervalMonths).toBe(acr);
    expect(aaaSurveillance(d, { scheme: 'nhs-aaa', convention: 'inner-to-inner' }).advice.intervalMonths).toBe(nhs);
  });

  it('names the action at both ends', () => {
    expect(aaaSurveillance(2.8, { scheme: 'nhs-aaa' }).advice.action).toBe('discharge');
    expect(aaaSurveillance(5.5, { scheme: 'nhs-aaa' }).advice.action).toBe('refer');
    expect(aaaSurveillance(5.5, { scheme: 'svs-2018' }).advice.action).toBe('refer');
  });

  it('applies the sex-specific ESC 2024 bands and shows the cautious one when sex is unknown', () => {
    // CLINICAL.md §2.3; ESC 2024 as quoted secondarily (SRC~): 4.5–4.9 cm men 12, women 6 months
    expect(aaaSurveillance(4.7, { scheme: 'esc-2024', sex: 'male' }).advice.intervalMonths).toBe(12);
    expect(aaaSurveillance(4.7, { scheme: 'esc-2024', sex: 'female' }).advice.intervalMonths).toBe(6);
    const unknown = aaaSurveillance(4.7, { scheme: 'esc-2024', sex: null });
    expect(unknown.advice.intervalMonths).toBe(6);
    expect(unknown.notes.join(' ')).toMatch(/sex-specific interval not applied/);
    // 5.0–5.4 cm: men 6 months, women at repair threshold → unknown sex gets the referral
    expect(aaaSurveillance(5.2, { scheme: 'esc-2024', sex: null }).advice.action).toBe('refer');
  });

  it('marks the ESVS 2019 scheme as from memory', () => {
    // CLINICAL.md §2.3: ESVS 2019 intervals MEM
    expect(aaaSurveillance(3.5, { scheme: 'esvs-2019' }).advice.provenance).toBe('MEM');
    expect(AAA_SCHEMES['esvs-2019'].name).toMatch(/memory/);
  });

  it('notes a missing or mismatched measurement convention', () => {
    // CLINICAL.md §2.3: NHS measures inner to inner; store the convention with the value
    expect(aaaSurveillance(4.0, { scheme: 'nhs-aaa' }).notes).toContain('measurement convention not recorded');
    expect(aaaSurveillance(4.0, { scheme: 'nhs-aaa', convention: 'leading-edge' }).notes.join(' ')).toMatch(/inner-to-inner/);
    expect(aaaSurveillance(4.0, { scheme: 'nhs-aaa', convention: 'inner-to-inner' }).notes).toEqual([]);
  });
});

describe('aaaAtRepairThreshold', () => {
  it('uses 5.5 cm for men and 5.0 cm for women', () => {
    // CLINICAL.md §4; SVS/ESVS repair thresholds (SRC~)
    expect(aaaAtRepairThreshold(5.4, 'male')).toBe(false);
    expect(aaaAtRepairThreshold(5.5, 'male')).toBe(true);
    expect(aaaAtRepairThreshold(4.9, 'female')).toBe(false);
    expect(aaaAtRepairThreshold(5.0, 'female')).toBe(true);
  });

  it('uses the lower threshold when sex is unknown', () => {
    expect(aaaAtRepairThreshold(5.0, null)).toBe(true);
    expect(aaaAtRepairThreshold(4.9, null)).toBe(false);
  });
});

describe('aaaRapidGrowth', () => {
  it('flags ≥ 0.5 cm within 6 months and ≥ 1.0 cm per year', () => {
    // CLINICAL.md §2.3 and §4; SVS/ESVS summaries (SRC~)
    expect(aaaRapidGrowth(4.5, 4.0, 180)).toBe(true);
    expect(aaaRapidGrowth(4.4, 4.0, 180)).toBe(false);
    expect(aaaRapidGrowth(5.0, 4.0, 365)).toBe(true);
    expect(aaaRapidGrowth(4.8, 4.0, 365)).toBe(false);
    expect(aaaRapidGrowth(4.8, 4.0, 730)).toBe(false);
    expect(aaaRapidGrowth(4.0, 4.0, 0)).toBe(false);
  });
});
