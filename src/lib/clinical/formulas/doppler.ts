import { isAbove, isAtMost, isBelow, PRECISION } from '../rounding';

/** Simplified Bernoulli ΔP = 4v², v in m/s, e.g. `bernoulliGradientMmHg(4.0) === 64`. */
export function bernoulliGradientMmHg(velocityMS: number): number {
  return 4 * velocityMS ** 2;
}

export type RapCategory = 'normal' | 'intermediate' | 'high';

export interface RapEstimate {
  rapMmHg: number;
  rangeMmHg: readonly [number, number];
  category: RapCategory;
}

/**
 * RA pressure from IVC size and sniff collapse (Rudski 2010 / Lang 2015), e.g.
 * `estimateRapFromIvc(1.8, 60).rapMmHg === 3`.
 * Gaps decided here: IVC exactly 2.1 cm counts as "≤ 2.1" (table wording); collapse of
 * exactly 50 % is neither "> 50" nor "< 50", so it is intermediate (8 mmHg), as CLINICAL.md suggests.
 * Diameter compared at 0.1 cm, collapse at whole %. Not valid under positive-pressure ventilation.
 */
export function estimateRapFromIvc(ivcDiameterCm: number, collapsePercent: number): RapEstimate {
  const small = isAtMost(ivcDiameterCm, 2.1, PRECISION.ivcCm);
  const collapses = isAbove(collapsePercent, 50, PRECISION.percent);
  const stiff = isBelow(collapsePercent, 50, PRECISION.percent);
  if (small && collapses) return { rapMmHg: 3, rangeMmHg: [0, 5], category: 'normal' };
  if (!small && stiff) return { rapMmHg: 15, rangeMmHg: [10, 20], category: 'high' };
  return { rapMmHg: 8, rangeMmHg: [5, 10], category: 'intermediate' };
}

/** IVC collapse with sniff from maximal and minimal diameters, e.g. `ivcCollapsePercent(2.0, 0.8) === 60`. */
export function ivcCollapsePercent(maxDiameterCm: number, minDiameterCm: number): number {
  return ((maxDiameterCm - minDiameterCm) / maxDiameterCm) * 100;
}

/** RVSP = 4·TRVmax² + RAP, e.g. `rvspMmHg(2.6, 15) ≈ 42.04`. */
export function rvspMmHg(trVelocityMS: number, rapMmHg: number): number {
  return bernoulliGradientMmHg(trVelocityMS) + rapMmHg;
}

/** Mitral E/A, e.g. `eOverA(80, 60) ≈ 1.333`. E and A in the same unit. */
export function eOverA(eVelocityCmS: number, aVelocityCmS: number): number {
  return eVelocityCmS / aVelocityCmS;
}

/** E over one e′ site, e.g. `eOverEPrime(80, 6) ≈ 13.33`. E and e′ in the same unit. */
export function eOverEPrime(eVelocityCmS: number, ePrimeCmS: number): number {
  return eVelocityCmS / ePrimeCmS;
}

/**
 * Average E/e′ = E / mean(septal e′, lateral e′), e.g. `averageEOverEPrime(80, 6, 8) ≈ 11.43`.
 * Deliberately not the mean of the two ratios (which would give 11.7).
 */
export function averageEOverEPrime(eVelocityCmS: number, septalEPrimeCmS: number, lateralEPrimeCmS: number): number {
  return eVelocityCmS / ((septalEPrimeCmS + lateralEPrimeCmS) / 2);
}
