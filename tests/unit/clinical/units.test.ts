import { describe, expect, it } from 'vitest';
import { canConvert, cmSToMS, cmToMm, convert, mmToCm, mSToCmS, unitSymbol } from '@/lib/clinical';

describe('convert', () => {
  it('converts lengths, areas and velocities', () => {
    expect(mmToCm(48)).toBeCloseTo(4.8, 12);
    expect(cmToMm(1.7)).toBeCloseTo(17, 12);
    expect(convert(250, 'mm2', 'cm2')).toBeCloseTo(2.5, 12);
    expect(mSToCmS(0.8)).toBeCloseTo(80, 12);
    expect(cmSToMS(280)).toBeCloseTo(2.8, 12);
    expect(convert(5, 'mL', 'mL')).toBe(5);
  });

  it('refuses incompatible units', () => {
    expect(canConvert('mm', 'cm/s')).toBe(false);
    expect(() => convert(1, 'mm', 'cm/s')).toThrow(/Cannot convert/);
    expect(() => convert(1, 'g', 'mL')).toThrow();
  });

  it('round-trips every convertible pair (seeded values)', () => {
    const pairs = [['mm', 'cm'], ['mm2', 'cm2'], ['cm/s', 'm/s']] as const;
    for (const [a, b] of pairs) {
      for (const v of [0.3, 4.8, 17, 123.456]) expect(convert(convert(v, a, b), b, a)).toBeCloseTo(v, 10);
    }
  });

  it('prints unit symbols', () => {
    expect(unitSymbol('cm2')).toBe('cm²');
    expect(unitSymbol('mL/m2')).toBe('mL/m²');
    expect(unitSymbol('ratio')).toBe('');
  });
});
