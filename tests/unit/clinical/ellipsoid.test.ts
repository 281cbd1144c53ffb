import { describe, expect, it } from 'vitest';
import { ELLIPSOID_PI_OVER_6, ellipsoidMethod, ellipsoidVolumeMl, roundHalfUp } from '@/lib/clinical';
import { between, seededRandom } from './helpers';

describe('ellipsoidVolumeMl', () => {
  it('defaults to π/6', () => {
    // CLINICAL.md §1.1: π/6 = 0.5236 (4 d.p.)
    expect(roundHalfUp(ELLIPSOID_PI_OVER_6, 4)).toBe(0.5236);
  });

  // CLINICAL.md §1.1 table, each check value at the precision the table prints it:
  // [name, L, W, H (cm), [π/6], [0.523], [0.52], [0.479]] as [expected, decimals].
  type Check = readonly [number, number] | null;
  const rows: Array<[string, number, number, number, Check, Check, Check, Check]> = [
    ['thyroid right lobe', 4.8, 1.6, 1.5, [6.032, 3], [6.025, 3], [5.99, 3], [5.518, 3]],
    ['thyroid left lobe', 4.5, 1.5, 1.4, [4.948, 3], [4.942, 3], [4.914, 3], [4.527, 3]],
    ['bladder pre-void', 10, 8, 7, [293.2, 1], [293, 0], [291, 0], null],
    ['post-void residual', 8, 6, 5, [125.7, 1], [125.5, 1], [124.8, 1], null],
    ['spleen', 12, 7, 4.5, [197.9, 1], [197.7, 1], [196.6, 1], null],
    ['prostate', 4.5, 3.5, 3.2, [26.39, 2], [26.36, 2], [26.21, 2], null],
  ];
  it.each(rows)('%s matches the worked example for each coefficient', (_name, l, w, h, ...checks) => {
    const coefficients = [undefined, 0.523, 0.52, 0.479];
    checks.forEach((check, i) => {
      if (check === null) return;
      expect(roundHalfUp(ellipsoidVolumeMl(l, w, h, coefficients[i]), check[1])).toBe(check[0]);
    });
  });

  it('sums the two lobes to the total thyroid volume', () => {
    // CLINICAL.md §1.1: total 11.0 mL (10.980) with π/6; 10.9 (10.904) with 0.52; 10.0 (10.045) with 0.479
    const total = (k?: number) => ellipsoidVolumeMl(4.8, 1.6, 1.5, k) + ellipsoidVolumeMl(4.5, 1.5, 1.4, k);
    expect(roundHalfUp(total(), 3)).toBe(10.98);
    expect(roundHalfUp(total(0.52), 3)).toBe(10.904);
    expect(roundHalfUp(total(0.479), 3)).toBe(10.045);
  });

  it('records the coefficient it used', () => {
    expect(ellipsoidMethod(Math.PI / 6)).toBe('ellipsoid, coefficient 0.5236');
    expect(ellipsoidMethod(0.479)).toBe('ellipsoid, coefficient 0.4790');
  });

  it('grows with each dimension and scales with the coefficient (seeded property)', () => {
    const rnd = seededRandom(20250301);
    for (let i = 0; i < 500; i += 1) {
      const dims: [number, number, number] = [between(rnd, 0.2, 20), between(rnd, 0.2, 20), between(rnd, 0.2, 20)];
      const base = ellipsoidVolumeMl(...dims);
      for (let axis = 0; axis < 3; axis += 1) {
        const bigger: [number, number, number] = [...dims];
        bigger[axis] = (bigger[axis] as number) + between(rnd, 0.01, 2);
        expect(ellipsoidVolumeMl(...bigger)).toBeGreaterThan(base);
      }
      expect(ellipsoidVolumeMl(...dims, 0.479)).toBeLessThan(base);
      expect(ellipsoidVolumeMl(2 * dims[0], dims[1], dims[2])).toBeCloseTo(2 * base, 9);
    }
  });
});
