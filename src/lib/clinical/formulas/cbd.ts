import { PRECISION, roundHalfUp } from '../rounding';

export type CbdAllowance = 'per-decade-over-60' | 'none';

/** Upper limit after cholecystectomy, "up to about 10 mm" (CLINICAL.md §2.3, common practice). */
export const CBD_POST_CHOLECYSTECTOMY_MM = 10;
/** Suggested upper limit in the elderly, Bachar et al. J Ultrasound Med 2003 (SRC+). */
export const CBD_ELDERLY_CAP_MM = 8.5;

/**
 * CBD upper limit with an age allowance, e.g. `cbdUpperLimitMm(75) === 7`.
 * Section 9 item 8 decision: the "1 mm per completed decade over 60" rule of thumb (CP), capped
 * at Bachar's measured elderly limit of 8.5 mm. Bachar's slope (0.04 mm/y) has no published
 * baseline limit to add it to, and the cap keeps the rule within measured data. Completed
 * decades (65 y → +0 mm) rather than a pro-rata allowance, so the limit never loosens early.
 */
export function cbdUpperLimitMm(
  ageYears: number,
  options: { baseLimitMm?: number; allowance?: CbdAllowance; cholecystectomy?: boolean } = {},
): number {
  const base = options.baseLimitMm ?? 6;
  if (options.cholecystectomy === true) return Math.max(base, CBD_POST_CHOLECYSTECTOMY_MM);
  if ((options.allowance ?? 'per-decade-over-60') === 'none' || ageYears < 70) return base;
  const decades = Math.floor((ageYears - 60) / 10);
  return roundHalfUp(Math.min(base + decades, Math.max(base, CBD_ELDERLY_CAP_MM)), PRECISION.ductMm);
}
