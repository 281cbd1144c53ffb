import { DAYS_PER_YEAR } from '../dates';
import { isAtLeast, PRECISION } from '../rounding';
import type { Sex } from '../types';
import { AAA_SCHEMES, type AaaConvention, type AaaSchemeId, type AaaSizeBand, type SurveillanceAdvice } from './schemes';

const BAND_FLOORS_CM: ReadonlyArray<readonly [AaaSizeBand, number]> = [
  ['5.5-plus', 5.5],
  ['5.0-5.4', 5.0],
  ['4.5-4.9', 4.5],
  ['4.0-4.4', 4.0],
  ['3.5-3.9', 3.5],
  ['3.0-3.4', 3.0],
  ['2.5-2.9', 2.5],
];

/** AAA threshold: maximum diameter ≥ 3.0 cm (NHS AAA Screening; ACR 2019; SRC+). */
export const AAA_THRESHOLD_CM = 3.0;

/** Size band of a maximum aortic diameter compared at 0.1 cm, e.g. `aaaSizeBand(4.96) === '5.0-5.4'`. */
export function aaaSizeBand(diameterCm: number): AaaSizeBand {
  for (const [band, floor] of BAND_FLOORS_CM) {
    if (isAtLeast(diameterCm, floor, PRECISION.aortaCm)) return band;
  }
  return 'below-2.5';
}

/** `isAneurysm(3.0) === true`, `isAneurysm(2.94) === false` (prints as 2.9). */
export const isAneurysm = (diameterCm: number): boolean => isAtLeast(diameterCm, AAA_THRESHOLD_CM, PRECISION.aortaCm);

export interface AaaSurveillance {
  scheme: AaaSchemeId;
  schemeName: string;
  band: AaaSizeBand;
  advice: SurveillanceAdvice;
  notes: string[];
}

const ACTION_RANK: Readonly<Record<SurveillanceAdvice['action'], number>> = {
  refer: 0,
  surveillance: 1,
  rescreen: 2,
  discharge: 3,
  none: 4,
};

// With sex unknown and a sex-split band, show the more cautious advice (referral before
// surveillance, shorter interval first) and say so, instead of silently picking one sex.
function moreCautious(a: SurveillanceAdvice, b: SurveillanceAdvice): SurveillanceAdvice {
  if (ACTION_RANK[a.action] !== ACTION_RANK[b.action]) return ACTION_RANK[a.action] < ACTION_RANK[b.action] ? a : b;
  return (a.intervalMonths ?? Infinity) <= (b.intervalMonths ?? Infinity) ? a : b;
}

/**
 * Surveillance advice of a named scheme, e.g.
 * `aaaSurveillance(4.2, { scheme: 'svs-2018' }).advice.intervalMonths === 12`.
 */
export function aaaSurveillance(
  diameterCm: number,
  options: { scheme: AaaSchemeId; sex?: Sex | null; convention?: AaaConvention | null },
): AaaSurveillance {
  const scheme = AAA_SCHEMES[options.scheme];
  const band = aaaSizeBand(diameterCm);
  const bandAdvice = scheme.bands[band];
  const notes: string[] = [];
  let advice: SurveillanceAdvice;
  if ('any' in bandAdvice) {
    advice = bandAdvice.any;
  } else if (options.sex === 'male' || options.sex === 'female') {
    advice = bandAdvice[options.sex];
  } else {
    advice = moreCautious(bandAdvice.male, bandAdvice.female);
    notes.push('sex-specific interval not applied; the more cautious advice is shown');
  }
  const convention = options.convention ?? null;
  if (convention === null) notes.push('measurement convention not recorded');
  else if (scheme.convention !== null && scheme.convention !== convention) {
    notes.push(`${scheme.name} is defined for ${scheme.convention} measurement; this diameter was measured ${convention}`);
  }
  return { scheme: scheme.id, schemeName: scheme.name, band, advice, notes };
}

/**
 * Repair threshold, 5.5 cm men and 5.0 cm women (SVS/ESVS, SRC~), e.g.
 * `aaaAtRepairThreshold(5.2, 'female') === true`. With sex unknown the lower (female)
 * threshold is used: this only raises a prompt for the physician, so erring early is safer.
 */
export function aaaAtRepairThreshold(diameterCm: number, sex: Sex | null): boolean {
  const thresholdCm = sex === 'male' ? 5.5 : 5.0;
  return isAtLeast(diameterCm, thresholdCm, PRECISION.aortaCm);
}

/**
 * Rapid growth: ≥ 0.5 cm within 6 months, or ≥ 1.0 cm per year over longer intervals
 * (SVS/ESVS summaries, SRC~), e.g. `aaaRapidGrowth(4.6, 4.0, 180) === true`.
 * Rates are not extrapolated from intervals under 6 months, where caliper noise dominates.
 */
export function aaaRapidGrowth(currentCm: number, priorCm: number, intervalDays: number): boolean {
  if (intervalDays <= 0) return false;
  const growthCm = currentCm - priorCm;
  const sixMonthsDays = DAYS_PER_YEAR / 2;
  if (intervalDays <= sixMonthsDays) return isAtLeast(growthCm, 0.5, PRECISION.aortaCm);
  return isAtLeast(growthCm / (intervalDays / DAYS_PER_YEAR), 1.0, PRECISION.aortaCm);
}
