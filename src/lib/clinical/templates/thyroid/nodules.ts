import { daysBetween, type CalendarDate } from '../../dates';
import { ellipsoidVolumeMl } from '../../formulas/ellipsoid';
import { noduleGrowth, type NoduleGrowth } from '../../tirads/growth';
import { COMPOSITION, ECHOGENIC_FOCI, ECHOGENICITY, MARGIN, SHAPE, type TiradsFeatures } from '../../tirads/features';
import { tiradsLevel, tiradsPoints, tiradsRecommendation, type TiradsLevel, type TiradsRecommendation } from '../../tirads/score';
import { selectBiopsyNodules, selectReportedNodules } from '../../tirads/selection';
import { mmToCm } from '../../units';
import type { NoduleSpec } from '../types';

export type NoduleLobe = 'right' | 'left' | 'isthmus';
export type NoduleZone = 'upper' | 'mid' | 'lower';

/**
 * One thyroid nodule as entered: location, three diameters in mm (craniocaudal length,
 * transverse width, anteroposterior depth) and the five ACR TI-RADS feature groups.
 * `id` (e.g. "N1") links the nodule to the same nodule in a prior exam.
 */
export interface NoduleInput extends TiradsFeatures {
  id?: string;
  lobe: NoduleLobe;
  zone?: NoduleZone | null;
  lengthMm: number;
  widthMm: number;
  depthMm: number;
}

export type NoduleAction = 'fna' | 'fna-not-selected' | 'follow-up' | 'none';

export interface NoduleAssessment {
  index: number;
  id: string;
  maxDiameterMm: number;
  volumeMl: number;
  points: number;
  level: TiradsLevel;
  recommendation: TiradsRecommendation;
  /** 'fna-not-selected': meets FNA size but is not among the (at most) two chosen for FNA. */
  action: NoduleAction;
  reported: boolean;
  biopsySelected: boolean;
  prior: { levelRose: boolean; growth: NoduleGrowth; intervalDays: number } | null;
}

const DIMENSIONS = ['lengthMm', 'widthMm', 'depthMm'] as const;
const LOBES: readonly NoduleLobe[] = ['right', 'left', 'isthmus'];
const ZONES: readonly NoduleZone[] = ['upper', 'mid', 'lower'];

function checkOption(errors: Record<string, string>, path: string, value: unknown, options: Readonly<Record<string, unknown>>): void {
  if (typeof value !== 'string' || !Object.hasOwn(options, value)) {
    errors[path] = `must be one of: ${Object.keys(options).join(', ')}`;
  }
}

/** Validate the nodule list against the template's limits; errors keyed like "nodules[0].lengthMm". */
export function validateNodules(spec: NoduleSpec | null, nodules: readonly NoduleInput[] | undefined, prefix: string): Record<string, string> {
  const errors: Record<string, string> = {};
  if (nodules === undefined || nodules.length === 0) return errors;
  if (spec === null) return { [prefix]: 'this template has no nodules' };
  if (nodules.length > spec.maxEntered) errors[prefix] = `at most ${spec.maxEntered} nodules can be entered`;
  const ids = new Set<string>();
  nodules.forEach((n, i) => {
    const at = `${prefix}[${i}]`;
    if (!LOBES.includes(n.lobe)) errors[`${at}.lobe`] = `must be one of: ${LOBES.join(', ')}`;
    if (n.zone !== undefined && n.zone !== null && !ZONES.includes(n.zone)) errors[`${at}.zone`] = `must be one of: ${ZONES.join(', ')}`;
    for (const d of DIMENSIONS) {
      const v = n[d];
      if (typeof v !== 'number' || !Number.isFinite(v) || v < spec.dimensionMinMm || v > spec.dimensionMaxMm) {
        errors[`${at}.${d}`] = `must be a number in mm between ${spec.dimensionMinMm} and ${spec.dimensionMaxMm}`;
      }
    }
    checkOption(errors, `${at}.composition`, n.composition, COMPOSITION);
    checkOption(errors, `${at}.echogenicity`, n.echogenicity, ECHOGENICITY);
    checkOption(errors, `${at}.shape`, n.shape, SHAPE);
    checkOption(errors, `${at}.margin`, n.margin, MARGIN);
    if (!Array.isArray(n.foci) || n.foci.some((f) => !Object.hasOwn(ECHOGENIC_FOCI, f))) {
      errors[`${at}.foci`] = `must be a list of: ${Object.keys(ECHOGENIC_FOCI).join(', ')}`;
    } else if (n.foci.includes('none-or-comet-tail') && n.foci.length > 1) {
      errors[`${at}.foci`] = '"none" cannot be combined with other echogenic foci';
    }
    if (n.id !== undefined) {
      if (ids.has(n.id)) errors[`${at}.id`] = `duplicate nodule id ${n.id}`;
      ids.add(n.id);
    }
  });
  return errors;
}

const maxDiameterMm = (n: NoduleInput): number => Math.max(n.lengthMm, n.widthMm, n.depthMm);

/**
 * Score, size-rule, rank and compare all nodules: at most `maxReported` reported (highest
 * points) and `maxBiopsied` chosen for FNA (see tirads/selection.ts).
 */
export function assessNodules(
  nodules: readonly NoduleInput[],
  spec: NoduleSpec,
  prior: { examDate: CalendarDate; nodules: readonly NoduleInput[] } | null,
  examDate: CalendarDate,
  ellipsoidCoefficient?: number,
): NoduleAssessment[] {
  const scored = nodules.map((n, index) => {
    const points = tiradsPoints(n);
    const level = tiradsLevel(points);
    const maxMm = maxDiameterMm(n);
    const recommendation = tiradsRecommendation(level, mmToCm(maxMm));
    return { n, index, points, level, maxMm, recommendation };
  });
  const rankable = scored.map((s) => ({
    index: s.index,
    points: s.points,
    level: s.level,
    maxDiameterCm: mmToCm(s.maxMm),
    meetsFnaSize: s.recommendation.action === 'fna',
  }));
  const biopsyList = selectBiopsyNodules(rankable, spec.maxBiopsied);
  const biopsy = new Set(biopsyList);
  const reported = new Set(selectReportedNodules(rankable, spec.maxReported, biopsyList));
  return scored.map((s) => {
    const action: NoduleAction = s.recommendation.action === 'fna' && !biopsy.has(s.index) ? 'fna-not-selected' : s.recommendation.action;
    const before = prior === null || s.n.id === undefined ? undefined : prior.nodules.find((p) => p.id === s.n.id);
    return {
      index: s.index,
      id: s.n.id ?? `N${s.index + 1}`,
      maxDiameterMm: s.maxMm,
      volumeMl: ellipsoidVolumeMl(mmToCm(s.n.lengthMm), mmToCm(s.n.widthMm), mmToCm(s.n.depthMm), ellipsoidCoefficient),
      points: s.points,
      level: s.level,
      recommendation: s.recommendation,
      action,
      reported: reported.has(s.index),
      biopsySelected: biopsy.has(s.index),
      prior:
        before === undefined || prior === null
          ? null
          : {
              levelRose: s.level > tiradsLevel(tiradsPoints(before)),
              growth: noduleGrowth(before, s.n),
              intervalDays: daysBetween(prior.examDate, examDate),
            },
    };
  });
}
