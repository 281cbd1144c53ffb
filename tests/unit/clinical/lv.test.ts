import { describe, expect, it } from 'vitest';
import {
  bsaMostellerM2,
  ejectionFractionPercent,
  fractionalShorteningPercent,
  indexToBsa,
  lvGeometry,
  lvMassAseLinearG,
  relativeWallThickness,
  roundHalfUp,
  RWT_CUTOFF,
  teichholzEfPercent,
  teichholzVolumeMl,
} from '@/lib/clinical';
import { between, seededRandom } from './helpers';

describe('lvMassAseLinearG', () => {
  it('matches M1', () => {
    // CLINICAL.md §1.3 M1 and V5; Lang et al. JASE 2015: 0.832 × 218 + 0.6 = 181.976 g
    expect(lvMassAseLinearG(1.0, 5.0, 1.0)).toBeCloseTo(181.976, 9);
  });

  it('matches M3', () => {
    // CLINICAL.md §1.3 M3; Lang et al. JASE 2015: 147.784 g
    expect(roundHalfUp(lvMassAseLinearG(0.9, 4.8, 0.9), 3)).toBe(147.784);
  });

  it('is about 1000× too large when fed mm, which is why inputs are cm', () => {
    // CLINICAL.md §0.2 item 1
    const ratio = (lvMassAseLinearG(10, 50, 10) - 0.6) / (lvMassAseLinearG(1, 5, 1) - 0.6);
    expect(ratio).toBeCloseTo(1000, 9);
  });

  it('grows with each wall and the cavity (seeded property)', () => {
    const rnd = seededRandom(2015);
    for (let i = 0; i < 300; i += 1) {
      const [ivs, lvid, pw] = [between(rnd, 0.5, 2), between(rnd, 3, 7), between(rnd, 0.5, 2)];
      const m = lvMassAseLinearG(ivs, lvid, pw);
      expect(lvMassAseLinearG(ivs + 0.1, lvid, pw)).toBeGreaterThan(m);
      expect(lvMassAseLinearG(ivs, lvid + 0.1, pw)).toBeGreaterThan(m);
      expect(lvMassAseLinearG(ivs, lvid, pw + 0.1)).toBeGreaterThan(m);
    }
  });
});

describe('LV mass index', () => {
  it('uses the unrounded BSA (M1 and M3)', () => {
    // CLINICAL.md §1.3 M1 / V6: 100.09 g/m² → 100
    const m1 = indexToBsa(lvMassAseLinearG(1, 5, 1), bsaMostellerM2(170, 70));
    expect(roundHalfUp(m1, 2)).toBe(100.09);
    expect(roundHalfUp(m1, 0)).toBe(100);
    // CLINICAL.md §1.3 M3: 90.499 with unrounded BSA → 90 (91 only if BSA were first rounded to 1.63)
    const m3 = indexToBsa(lvMassAseLinearG(0.9, 4.8, 0.9), bsaMostellerM2(160, 60));
    expect(roundHalfUp(m3, 3)).toBe(90.499);
    expect(roundHalfUp(m3, 0)).toBe(90);
    expect(roundHalfUp(indexToBsa(lvMassAseLinearG(0.9, 4.8, 0.9), 1.63), 0)).toBe(91);
  });
});

describe('relativeWallThickness', () => {
  it('is 2·PWd/LVIDd', () => {
    // CLINICAL.md §1.3 M1: 0.40; M3: 0.375 → 0.38 half-up
    expect(relativeWallThickness(1.0, 5.0)).toBeCloseTo(0.4, 12);
    expect(roundHalfUp(relativeWallThickness(0.9, 4.8), 2)).toBe(0.38);
  });
});

describe('lvGeometry', () => {
  it('classifies M1 as normal for a man and eccentric hypertrophy for a woman', () => {
    // CLINICAL.md §1.3 M1 / M1-F; Lang et al. JASE 2015: LVMI limit 115 men, 95 women
    expect(lvGeometry(100.09, 0.4, 115)).toBe('normal');
    expect(lvGeometry(100.09, 0.4, 95)).toBe('eccentric-hypertrophy');
  });

  it('classifies M3 as normal geometry', () => {
    // CLINICAL.md §1.3 M3: woman, LVMI 90, RWT 0.38
    expect(lvGeometry(90.499, 0.375, 95)).toBe('normal');
  });

  it('uses "> 0.42" for RWT (section 9 item 3)', () => {
    // CLINICAL.md §1.3; Lang 2015 figure "> 0.42": 0.42 normal, 0.43 concentric
    expect(RWT_CUTOFF).toBe(0.42);
    expect(lvGeometry(90, 0.42, 95)).toBe('normal');
    expect(lvGeometry(90, 0.4249, 95)).toBe('normal');
    expect(lvGeometry(90, 0.425, 95)).toBe('concentric-remodeling');
    expect(lvGeometry(90, 0.43, 95)).toBe('concentric-remodeling');
    expect(lvGeometry(120, 0.43, 115)).toBe('concentric-hypertrophy');
    expect(lvGeometry(120, 0.42, 115)).toBe('eccentric-hypertrophy');
  });

  it('treats the LVMI limit as inclusive at whole g/m² (95 normal, 96 increased)', () => {
    // CLINICAL.md §2.1: LVMI women 43–95 | 96–108; men 49–115 | 116–131
    expect(lvGeometry(95, 0.4, 95)).toBe('normal');
    expect(lvGeometry(95.49, 0.4, 95)).toBe('normal');
    expect(lvGeometry(95.5, 0.4, 95)).toBe('eccentric-hypertrophy');
    expect(lvGeometry(115, 0.4, 115)).toBe('normal');
    expect(lvGeometry(116, 0.4, 115)).toBe('eccentric-hypertrophy');
  });
});

describe('fractionalShorteningPercent', () => {
  it('matches the worked examples', () => {
    // CLINICAL.md §1.4 and V9: 5.0/3.2 → 36 %; 6.0/5.0 → 16.67 %
    expect(fractionalShorteningPercent(5.0, 3.2)).toBeCloseTo(36, 9);
    expect(roundHalfUp(fractionalShorteningPercent(6.0, 5.0), 2)).toBe(16.67);
  });
});

describe('teichholzVolumeMl', () => {
  it('matches the worked volumes', () => {
    // CLINICAL.md §1.5; Teichholz et al. Am J Cardiol 1976 (formula SRC~)
    expect(roundHalfUp(teichholzVolumeMl(5.0), 2)).toBe(118.24);
    expect(roundHalfUp(teichholzVolumeMl(3.2), 2)).toBe(40.96);
    expect(roundHalfUp(teichholzVolumeMl(6.0), 2)).toBe(180);
  });
});

describe('teichholzEfPercent', () => {
  it('matches the worked EFs', () => {
    // CLINICAL.md §1.5 and V10: 65.36 % and 34.31 %
    expect(roundHalfUp(teichholzEfPercent(5.0, 3.2), 2)).toBe(65.36);
    expect(roundHalfUp(teichholzEfPercent(6.0, 5.0), 2)).toBe(34.31);
    expect(ejectionFractionPercent(100, 40)).toBe(60);
  });
});
