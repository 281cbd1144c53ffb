import { describe, expect, it } from 'vitest';
import { CBD_ELDERLY_CAP_MM, cbdUpperLimitMm } from '@/lib/clinical';

describe('cbdUpperLimitMm', () => {
  it('is 6 mm in adults up to 69 years', () => {
    // CLINICAL.md §2.3: ≤ 6 mm commonly used (common practice)
    expect(cbdUpperLimitMm(30)).toBe(6);
    expect(cbdUpperLimitMm(65)).toBe(6);
    expect(cbdUpperLimitMm(69)).toBe(6);
  });

  it('adds 1 mm per completed decade over 60', () => {
    // CLINICAL.md §2.3 rule of thumb (common practice), section 9 item 8
    expect(cbdUpperLimitMm(70)).toBe(7);
    expect(cbdUpperLimitMm(79)).toBe(7);
    expect(cbdUpperLimitMm(80)).toBe(8);
  });

  it('caps the allowance at 8.5 mm', () => {
    // CLINICAL.md §2.3; Bachar et al. J Ultrasound Med 2003: upper limit 8.5 mm in the elderly
    expect(CBD_ELDERLY_CAP_MM).toBe(8.5);
    expect(cbdUpperLimitMm(90)).toBe(8.5);
    expect(cbdUpperLimitMm(104)).toBe(8.5);
  });

  it('allows 10 mm after cholecystectomy and can switch the allowance off', () => {
    // CLINICAL.md §2.3: after cholecystectomy up to about 10 mm (common practice)
    expect(cbdUpperLimitMm(40, { cholecystectomy: true })).toBe(10);
    expect(cbdUpperLimitMm(85, { allowance: 'none' })).toBe(6);
    expect(cbdUpperLimitMm(75, { baseLimitMm: 7 })).toBe(8);
  });

  it('never falls with age (every age 18–120)', () => {
    let last = 0;
    for (let age = 18; age <= 120; age += 1) {
      const limit = cbdUpperLimitMm(age);
      expect(limit).toBeGreaterThanOrEqual(last);
      last = limit;
    }
  });
});
