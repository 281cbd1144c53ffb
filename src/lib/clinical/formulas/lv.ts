import { isAbove, PRECISION } from '../rounding';

/** 0.8 × 1.04: Devereux correction × myocardial density (Lang et al. JASE 2015). */
export const LV_MASS_ASE_FACTOR = 0.8 * 1.04;

/**
 * LV mass by the ASE linear method, all inputs in cm at end-diastole, e.g.
 * `lvMassAseLinearG(1.0, 5.0, 1.0) ≈ 181.976`. mm inputs would be 1000× too large: convert first.
 */
export function lvMassAseLinearG(ivsdCm: number, lviddCm: number, pwdCm: number): number {
  return LV_MASS_ASE_FACTOR * ((ivsdCm + lviddCm + pwdCm) ** 3 - lviddCm ** 3) + 0.6;
}

/** Relative wall thickness 2·PWd/LVIDd (dimensionless), e.g. `relativeWallThickness(1.0, 5.0) === 0.4`. */
export function relativeWallThickness(pwdCm: number, lviddCm: number): number {
  return (2 * pwdCm) / lviddCm;
}

/**
 * RWT cut-off. Section 9 item 3 decision: "> 0.42" as in the Lang 2015 figure, not the
 * "≥ 0.42" of some summaries; RWT 0.42 is normal geometry, 0.43 (incl. 0.425) is not.
 */
export const RWT_CUTOFF = 0.42;

export type LvGeometry = 'normal' | 'concentric-remodeling' | 'eccentric-hypertrophy' | 'concentric-hypertrophy';

export const LV_GEOMETRY_LABELS: Readonly<Record<LvGeometry, string>> = {
  normal: 'normal geometry',
  'concentric-remodeling': 'concentric remodeling',
  'eccentric-hypertrophy': 'eccentric hypertrophy',
  'concentric-hypertrophy': 'concentric hypertrophy',
};

/**
 * The four geometry categories (Lang 2015). The LVMI limit is sex-specific (95 women,
 * 115 men) and comes from the reference rows, so it is a parameter here, e.g.
 * `lvGeometry(100.09, 0.4, 95) === 'eccentric-hypertrophy'`.
 */
export function lvGeometry(lvmiGM2: number, rwt: number, lvmiUpperNormalGM2: number, rwtCutoff = RWT_CUTOFF): LvGeometry {
  const increasedMass = isAbove(lvmiGM2, lvmiUpperNormalGM2, PRECISION.lvmiGM2);
  const thickWalls = isAbove(rwt, rwtCutoff, PRECISION.rwt);
  if (increasedMass) return thickWalls ? 'concentric-hypertrophy' : 'eccentric-hypertrophy';
  return thickWalls ? 'concentric-remodeling' : 'normal';
}

/** Fractional shortening (LVIDd − LVIDs)/LVIDd × 100, e.g. `fractionalShorteningPercent(5.0, 3.2) === 36`. */
export function fractionalShorteningPercent(lviddCm: number, lvidsCm: number): number {
  return ((lviddCm - lvidsCm) / lviddCm) * 100;
}

/** Teichholz volume [7/(2.4 + D)]·D³, D in cm, e.g. `teichholzVolumeMl(5.0) ≈ 118.24`. */
export function teichholzVolumeMl(diameterCm: number): number {
  return (7 / (2.4 + diameterCm)) * diameterCm ** 3;
}

/** Ejection fraction from volumes, e.g. `ejectionFractionPercent(118.24, 40.96) ≈ 65.36`. */
export function ejectionFractionPercent(edvMl: number, esvMl: number): number {
  return ((edvMl - esvMl) / edvMl) * 100;
}

/**
 * Teichholz EF from linear dimensions, e.g. `teichholzEfPercent(5.0, 3.2) ≈ 65.36`.
 * Lang 2015 no longer recommends it (CLINICAL.md §1.5), so the engine reports it under its
 * own name and never uses it for the LVEF category.
 */
export function teichholzEfPercent(lviddCm: number, lvidsCm: number): number {
  return ejectionFractionPercent(teichholzVolumeMl(lviddCm), teichholzVolumeMl(lvidsCm));
}
