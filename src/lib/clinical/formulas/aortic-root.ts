import type { Sex } from '../types';

// Section 9 item 6 decision: the root at the sinuses is judged by the Devereux 2012 z-score
// (age, sex and BSA; SEE 0.261 cm; valid above 15 years). Roman 1989 is offered as a second
// predictor; the fixed 40/36 mm limits are not used because they ignore body size and age.
export const AORTIC_ROOT_METHOD = 'Devereux et al. Am J Cardiol 2012';
export const DEVEREUX_SEE_CM = 0.261;
export const DEVEREUX_MIN_AGE_YEARS = 16;

/**
 * Expected sinus diameter, 2.423 + 0.009·age + 0.461·BSA − 0.267·sex (1 man, 2 woman), e.g.
 * `expectedAorticRootDevereuxCm(55, 2.0, 'male') ≈ 3.573`.
 */
export function expectedAorticRootDevereuxCm(ageYears: number, bsaValueM2: number, sex: Sex): number {
  const sexCode = sex === 'male' ? 1 : 2;
  return 2.423 + 0.009 * ageYears + 0.461 * bsaValueM2 - 0.267 * sexCode;
}

/** z = (measured − expected)/0.261, e.g. `aorticRootZDevereux(4.0, 55, 2.0, 'male') ≈ 1.636`. */
export function aorticRootZDevereux(measuredCm: number, ageYears: number, bsaValueM2: number, sex: Sex): number {
  return (measuredCm - expectedAorticRootDevereuxCm(ageYears, bsaValueM2, sex)) / DEVEREUX_SEE_CM;
}

/**
 * Roman 1989 expected sinus diameter (SRC~): 0.97 + 1.12·BSA at 20–39 y, 1.92 + 0.74·BSA from
 * 40 y, e.g. `expectedAorticRootRomanCm(50, 2.0) === 3.4`; null under 20 y (no adult regression).
 */
export function expectedAorticRootRomanCm(ageYears: number, bsaValueM2: number): number | null {
  if (ageYears < 20) return null;
  return ageYears < 40 ? 0.97 + 1.12 * bsaValueM2 : 1.92 + 0.74 * bsaValueM2;
}
