import { isAbove, PRECISION } from '../rounding';

/** Three diameters of a nodule in mm (craniocaudal, transverse, anteroposterior). */
export interface NoduleDimensionsMm {
  lengthMm: number;
  widthMm: number;
  depthMm: number;
}

export interface NoduleGrowth {
  significant: boolean;
  /** Dimensions that grew by > 20 % and > 2 mm. */
  grownDimensions: Array<keyof NoduleDimensionsMm>;
  volumeChangePercent: number;
}

/**
 * Significant growth between two exams (ACR TI-RADS, CLINICAL.md §3.3): > 20 % and > 2 mm in
 * at least two dimensions, or > 50 % in volume, e.g. 10×8×6 → 12.1×10.1×6 mm is significant.
 * The numbers are SRC+; strict ">" is our decision where the wording is unverified (MEM): an
 * increase of exactly 20 %, 2 mm or 50 % is not growth. Millimetres compared at 0.1 mm,
 * percentages at 0.1 %.
 */
export function noduleGrowth(prior: NoduleDimensionsMm, current: NoduleDimensionsMm): NoduleGrowth {
  const keys: Array<keyof NoduleDimensionsMm> = ['lengthMm', 'widthMm', 'depthMm'];
  const grownDimensions = keys.filter((k) => {
    const deltaMm = current[k] - prior[k];
    return isAbove(deltaMm, 2, PRECISION.noduleMm) && isAbove((deltaMm / prior[k]) * 100, 20, PRECISION.growthPercent);
  });
  // Ellipsoid volume ratio: the coefficient cancels, so the product of diameters suffices.
  const product = (d: NoduleDimensionsMm): number => d.lengthMm * d.widthMm * d.depthMm;
  const volumeChangePercent = ((product(current) - product(prior)) / product(prior)) * 100;
  const volumeGrew = isAbove(volumeChangePercent, 50, PRECISION.growthPercent);
  return {
    significant: grownDimensions.length >= 2 || volumeGrew,
    grownDimensions,
    volumeChangePercent,
  };
}
