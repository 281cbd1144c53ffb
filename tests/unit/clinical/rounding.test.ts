import { describe, expect, it } from 'vitest';
import { formatNumber, formatQuantity, formatRange, isAbove, isAtLeast, isAtMost, isBelow, roundHalfUp } from '@/lib/clinical';

describe('roundHalfUp', () => {
  it('rounds halves up, not to even (the M3 RWT trap)', () => {
    // CLINICAL.md §1.3 M3: RWT 0.375 → 0.38 half-up (0.37 with banker's rounding)
    expect(roundHalfUp(0.375, 2)).toBe(0.38);
    expect(roundHalfUp(2.5, 0)).toBe(3);
    expect(roundHalfUp(0.125, 2)).toBe(0.13);
  });

  it('absorbs binary noise of computed values such as 2 × 0.9 / 4.8', () => {
    // CLINICAL.md §1.3 M3: RWT = 2 × 0.9 / 4.8 = 0.375
    expect(roundHalfUp((2 * 0.9) / 4.8, 2)).toBe(0.38);
    expect(roundHalfUp(1.005, 2)).toBe(1.01);
  });

  it('keeps values below the half down', () => {
    expect(roundHalfUp(0.37499, 2)).toBe(0.37);
    expect(roundHalfUp(95.4999, 0)).toBe(95);
  });

  it('rounds negative values away from zero symmetrically', () => {
    expect(roundHalfUp(-1.635, 2)).toBe(-1.64);
    expect(roundHalfUp(-2.5, 0)).toBe(-3);
  });
});

describe('boundary comparisons', () => {
  it('compare the printed value with the published limit', () => {
    // CLINICAL.md §0.2 item 3: 95.4 g/m² prints as 95 → not above 95; 95.5 prints as 96
    expect(isAbove(95.4, 95, 0)).toBe(false);
    expect(isAbove(95.5, 95, 0)).toBe(true);
    expect(isAtLeast(1.495, 1.5, 2)).toBe(true);
    expect(isAtLeast(1.494, 1.5, 2)).toBe(false);
    expect(isBelow(16.5, 17, 0)).toBe(false);
    expect(isBelow(16.49, 17, 0)).toBe(true);
    expect(isAtMost(2.14, 2.1, 1)).toBe(true);
    expect(isAtMost(2.15, 2.1, 1)).toBe(false);
  });
});

describe('formatNumber', () => {
  it('prints with the same rule', () => {
    expect(formatNumber(0.375, 2)).toBe('0.38');
    expect(formatNumber(100.09, 0)).toBe('100');
    expect(formatNumber(-0.001, 1)).toBe('0.0');
  });

  it('prints quantities and ranges with unit symbols', () => {
    expect(formatQuantity(100.09, 'g/m2', 0)).toBe('100 g/m²');
    expect(formatQuantity(36, '%', 0)).toBe('36 %');
    expect(formatQuantity(0.4, 'ratio', 2)).toBe('0.40');
    expect(formatRange(43, 95, 'g/m2', 0)).toBe('43–95 g/m²');
    expect(formatRange(null, 34, 'mL/m2', 0)).toBe('≤ 34 mL/m²');
    expect(formatRange(17, null, 'mm', 0)).toBe('≥ 17 mm');
  });
});
