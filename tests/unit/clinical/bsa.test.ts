import { describe, expect, it } from 'vitest';
import { bsaDuBoisM2, bsaM2, bsaMostellerM2, indexToBsa, roundHalfUp } from '@/lib/clinical';
import { between, seededRandom } from './helpers';

// CLINICAL.md §1.2 table: Mosteller (NEJM 1987) and DuBois & DuBois (Arch Intern Med 1916)
const rows: Array<[number, number, number, number]> = [
  [170, 70, 1.8181, 1.8097],
  [160, 60, 1.633, 1.6221],
  [180, 80, 2.0, 1.9964],
  [175, 95, 2.149, 2.1043],
];

describe('bsaMostellerM2', () => {
  it.each(rows)('%s cm, %s kg → %s m²', (h, w, mosteller) => {
    expect(roundHalfUp(bsaMostellerM2(h, w), 4)).toBe(mosteller);
  });
});

describe('bsaDuBoisM2', () => {
  it.each(rows)('%s cm, %s kg → DuBois %s m²', (h, w, _m, dubois) => {
    expect(roundHalfUp(bsaDuBoisM2(h, w), 4)).toBe(dubois);
  });

  it('diverges most from Mosteller in the heavier patient', () => {
    // CLINICAL.md §1.2: 175 cm / 95 kg gives 2.15 vs 2.10 m²
    const gaps = rows.map(([h, w]) => bsaMostellerM2(h, w) - bsaDuBoisM2(h, w));
    expect(Math.max(...gaps)).toBe(gaps[3]);
  });
});

describe('bsaM2', () => {
  it('dispatches on the method and defaults to Mosteller', () => {
    // CLINICAL.md §1.2 V3/V4: 1.82 (Mosteller) and 1.81 (DuBois) at 170 cm / 70 kg
    expect(roundHalfUp(bsaM2(170, 70), 2)).toBe(1.82);
    expect(roundHalfUp(bsaM2(170, 70, 'dubois'), 2)).toBe(1.81);
  });

  it('grows with height and with weight (seeded property)', () => {
    const rnd = seededRandom(1987);
    for (let i = 0; i < 500; i += 1) {
      const h = between(rnd, 100, 210);
      const w = between(rnd, 30, 180);
      for (const method of ['mosteller', 'dubois'] as const) {
        const base = bsaM2(h, w, method);
        expect(bsaM2(h + between(rnd, 0.5, 20), w, method)).toBeGreaterThan(base);
        expect(bsaM2(h, w + between(rnd, 0.5, 20), method)).toBeGreaterThan(base);
      }
    }
  });
});

describe('indexToBsa', () => {
  it('divides by the unrounded BSA', () => {
    // CLINICAL.md §0.2 item 2: 181.976 g / 1.8181 m² = 100.09; / 1.82 = 99.99
    expect(roundHalfUp(indexToBsa(181.976, bsaMostellerM2(170, 70)), 2)).toBe(100.09);
    expect(roundHalfUp(indexToBsa(181.976, 1.82), 2)).toBe(99.99);
  });
});
