import { isAtLeast, PRECISION } from '../rounding';
import { COMPOSITION, ECHOGENIC_FOCI, ECHOGENICITY, MARGIN, SHAPE, type TiradsFeatures } from './features';

export const TIRADS_VERSION = 'ACR TI-RADS 2017 (Tessler et al. JACR 2017)';

export type TiradsLevel = 1 | 2 | 3 | 4 | 5;

/**
 * Total points, e.g. solid + hypoechoic + wider-than-tall + smooth + none → 4 (T1).
 * Spongiform composition scores 0 overall: the chart says not to add other categories.
 */
export function tiradsPoints(f: TiradsFeatures): number {
  if (f.composition === 'spongiform') return 0;
  const foci = [...new Set(f.foci)].reduce((sum, focus) => sum + ECHOGENIC_FOCI[focus].points, 0);
  return COMPOSITION[f.composition].points + ECHOGENICITY[f.echogenicity].points + SHAPE[f.shape].points + MARGIN[f.margin].points + foci;
}

/**
 * Level from points, e.g. `tiradsLevel(4) === 4`.
 * Section 9 item 11 decision: a 1-point total (e.g. cystic + macrocalcification) is TR1. The
 * chart has no 1-point row; TR1 and TR2 are managed identically (no FNA, no follow-up), so
 * only the label differs, and 0–1 → TR1 is the common practice mapping (CP).
 */
export function tiradsLevel(points: number): TiradsLevel {
  if (points >= 7) return 5;
  if (points >= 4) return 4;
  if (points === 3) return 3;
  if (points === 2) return 2;
  return 1;
}

export const TIRADS_LEVEL_LABELS: Readonly<Record<TiradsLevel, string>> = {
  1: 'benign',
  2: 'not suspicious',
  3: 'mildly suspicious',
  4: 'moderately suspicious',
  5: 'highly suspicious',
};

interface SizeRule {
  fnaCm: number;
  followUpCm: number;
  followUpYears: readonly number[];
}

// Size thresholds and imaging schedule per level (CLINICAL.md §3.2–3.3, SRC+).
const SIZE_RULES: Readonly<Partial<Record<TiradsLevel, SizeRule>>> = {
  3: { fnaCm: 2.5, followUpCm: 1.5, followUpYears: [1, 3, 5] },
  4: { fnaCm: 1.5, followUpCm: 1.0, followUpYears: [1, 2, 3, 5] },
  5: { fnaCm: 1.0, followUpCm: 0.5, followUpYears: [1, 2, 3, 4, 5] },
};

export type TiradsAction = 'fna' | 'follow-up' | 'none';

export interface TiradsRecommendation {
  action: TiradsAction;
  /** Years after this exam at which to image (follow-up only). */
  followUpYears: readonly number[];
  fnaThresholdCm: number | null;
  followUpThresholdCm: number | null;
}

/**
 * FNA / follow-up / no action by maximum diameter, e.g. `tiradsRecommendation(4, 1.2).action === 'follow-up'`.
 * Section 9 item 11: limits are "≥" as on the ACR chart (not the "> 2.5 cm" of one secondary
 * table), compared at 0.1 mm (2 decimals of cm), so 1.5 cm is FNA for TR4 and 1.49 cm is not.
 */
export function tiradsRecommendation(level: TiradsLevel, maxDiameterCm: number): TiradsRecommendation {
  const rule = SIZE_RULES[level];
  if (rule === undefined) return { action: 'none', followUpYears: [], fnaThresholdCm: null, followUpThresholdCm: null };
  const thresholds = { fnaThresholdCm: rule.fnaCm, followUpThresholdCm: rule.followUpCm };
  if (isAtLeast(maxDiameterCm, rule.fnaCm, PRECISION.noduleCm)) return { action: 'fna', followUpYears: [], ...thresholds };
  if (isAtLeast(maxDiameterCm, rule.followUpCm, PRECISION.noduleCm)) return { action: 'follow-up', followUpYears: rule.followUpYears, ...thresholds };
  return { action: 'none', followUpYears: [], ...thresholds };
}

/** Follow-up schedule of a level, e.g. `tiradsFollowUpYears(4)` → [1, 2, 3, 5]; TR1–2 → []. */
export function tiradsFollowUpYears(level: TiradsLevel): readonly number[] {
  return SIZE_RULES[level]?.followUpYears ?? [];
}
