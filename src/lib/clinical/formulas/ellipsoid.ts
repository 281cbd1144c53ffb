import { formatNumber } from '../formatting';

/** π/6 = 0.5236…, the prolate-ellipsoid coefficient (CLINICAL.md §1.1). */
export const ELLIPSOID_PI_OVER_6 = Math.PI / 6;

/**
 * Ellipsoid volume from three orthogonal diameters in cm (cm³ = mL), e.g.
 * `ellipsoidVolumeMl(4.8, 1.6, 1.5) ≈ 6.032`. The coefficient is a parameter because thyroid
 * work also uses 0.479 or 0.529; the caller records the one it used.
 */
export function ellipsoidVolumeMl(lengthCm: number, widthCm: number, heightCm: number, coefficient = ELLIPSOID_PI_OVER_6): number {
  return coefficient * lengthCm * widthCm * heightCm;
}

/** Method text stored with every ellipsoid volume, e.g. `ellipsoidMethod(Math.PI / 6) === 'ellipsoid, coefficient 0.5236'`. */
export const ellipsoidMethod = (coefficient: number): string => `ellipsoid, coefficient ${formatNumber(coefficient, 4)}`;
