import type { TiradsLevel } from './score';

export const TIRADS_MAX_REPORTED = 4;
export const TIRADS_MAX_BIOPSIED = 2;

export interface RankableNodule {
  index: number;
  points: number;
  level: TiradsLevel;
  maxDiameterCm: number;
  meetsFnaSize: boolean;
}

/**
 * Indices of the (at most four) nodules to report: highest points first, larger first on a
 * tie, then entry order, e.g. points [2, 5, 4, 3, 6] → [4, 1, 2, 3]. Nodules in `include`
 * (those chosen for FNA) come first, so a biopsied nodule is never left out of the report.
 */
export function selectReportedNodules(nodules: readonly RankableNodule[], max = TIRADS_MAX_REPORTED, include: readonly number[] = []): number[] {
  const ranked = [...nodules]
    .sort((a, b) => b.points - a.points || b.maxDiameterCm - a.maxDiameterCm || a.index - b.index)
    .map((n) => n.index)
    .filter((i) => !include.includes(i));
  return [...include, ...ranked].slice(0, max);
}

/**
 * Indices of the (at most two) nodules to biopsy among those meeting FNA size. Order: highest
 * level, then larger size (the ACR rule, CLINICAL.md §3.3, SRC+), then higher points, then entry
 * order. The issue text said "highest points"; the sourced rule (level, then size) wins.
 */
export function selectBiopsyNodules(nodules: readonly RankableNodule[], max = TIRADS_MAX_BIOPSIED): number[] {
  return nodules
    .filter((n) => n.meetsFnaSize)
    .sort((a, b) => b.level - a.level || b.maxDiameterCm - a.maxDiameterCm || b.points - a.points || a.index - b.index)
    .slice(0, max)
    .map((n) => n.index);
}
