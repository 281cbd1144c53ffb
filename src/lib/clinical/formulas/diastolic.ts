import { isAbove, isAtLeast, isAtMost, isBelow, PRECISION } from '../rounding';
import { averageEOverEPrime, eOverA, eOverEPrime } from './doppler';

// 2016 ASE/EACVI algorithm (Nagueh et al. JASE 2016), as requested. Section 9 item 5:
// the 2025 ASE update supersedes it; every result carries DIASTOLIC_ALGORITHM so a later
// 2025 implementation can sit beside this one without rewriting stored results.
export const DIASTOLIC_ALGORITHM = 'ASE/EACVI 2016 (Nagueh et al. JASE 2016)';

/** Inputs in cm/s, m/s and mL/m²; null means not measurable or not done (both simply unavailable). */
export interface DiastolicInputs {
  eVelocityCmS: number | null;
  aVelocityCmS: number | null;
  septalEPrimeCmS: number | null;
  lateralEPrimeCmS: number | null;
  trVelocityMS: number | null;
  laviMlM2: number | null;
}

export type DiastolicBranch = 'normal-ef' | 'reduced-ef-or-myocardial-disease';

export type DiastolicConclusion =
  | 'normal'
  | 'indeterminate'
  | 'dysfunction'
  | 'grade-I'
  | 'grade-II'
  | 'grade-III'
  | 'cannot-determine';

export interface DiastolicCriterion {
  id: 'e-over-e-prime' | 'e-prime' | 'tr-velocity' | 'lavi';
  label: string;
  /** null when the variable could not be assessed. */
  abnormal: boolean | null;
}

export interface DiastolicResult {
  algorithm: string;
  branch: DiastolicBranch;
  conclusion: DiastolicConclusion;
  laPressure: 'normal' | 'raised' | null;
  criteria: DiastolicCriterion[];
  abnormalCount: number;
  availableCount: number;
  reason: string;
}

// E/e′ criterion: average > 14; with one site only, septal > 15 or lateral > 13 (SRC~).
function eOverEPrimeCriterion(x: DiastolicInputs): DiastolicCriterion {
  const label = 'E/e′';
  const { eVelocityCmS: e, septalEPrimeCmS: s, lateralEPrimeCmS: l } = x;
  if (e === null) return { id: 'e-over-e-prime', label, abnormal: null };
  if (s !== null && l !== null) return { id: 'e-over-e-prime', label: 'average E/e′ > 14', abnormal: isAbove(averageEOverEPrime(e, s, l), 14, PRECISION.eOverEPrime) };
  if (s !== null) return { id: 'e-over-e-prime', label: 'septal E/e′ > 15', abnormal: isAbove(eOverEPrime(e, s), 15, PRECISION.eOverEPrime) };
  if (l !== null) return { id: 'e-over-e-prime', label: 'lateral E/e′ > 13', abnormal: isAbove(eOverEPrime(e, l), 13, PRECISION.eOverEPrime) };
  return { id: 'e-over-e-prime', label, abnormal: null };
}

// e′ criterion counts once: septal < 7 or lateral < 10 cm/s.
function ePrimeCriterion(x: DiastolicInputs): DiastolicCriterion {
  const label = 'septal e′ < 7 or lateral e′ < 10 cm/s';
  const septalLow = x.septalEPrimeCmS === null ? null : isBelow(x.septalEPrimeCmS, 7, PRECISION.tissueVelocityCmS);
  const lateralLow = x.lateralEPrimeCmS === null ? null : isBelow(x.lateralEPrimeCmS, 10, PRECISION.tissueVelocityCmS);
  if (septalLow === null && lateralLow === null) return { id: 'e-prime', label, abnormal: null };
  return { id: 'e-prime', label, abnormal: septalLow === true || lateralLow === true };
}

function trCriterion(x: DiastolicInputs): DiastolicCriterion {
  const abnormal = x.trVelocityMS === null ? null : isAbove(x.trVelocityMS, 2.8, PRECISION.trVelocityMS);
  return { id: 'tr-velocity', label: 'TR velocity > 2.8 m/s', abnormal };
}

function laviCriterion(x: DiastolicInputs): DiastolicCriterion {
  const abnormal = x.laviMlM2 === null ? null : isAbove(x.laviMlM2, 34, PRECISION.laviMlM2);
  return { id: 'lavi', label: 'LAVI > 34 mL/m²', abnormal };
}

const count = (criteria: DiastolicCriterion[], wanted: boolean): number =>
  criteria.filter((c) => c.abnormal === wanted).length;

/**
 * Normal LVEF, no myocardial disease: of the variables that could be assessed, more than half
 * abnormal → dysfunction, fewer than half → normal, exactly half → indeterminate; none → cannot
 * determine. E.g. D1 (2 of 4) → 'indeterminate'.
 */
export function diastolicNormalEf2016(x: DiastolicInputs): DiastolicResult {
  const criteria = [eOverEPrimeCriterion(x), ePrimeCriterion(x), trCriterion(x), laviCriterion(x)];
  const abnormalCount = count(criteria, true);
  const availableCount = abnormalCount + count(criteria, false);
  const base = { algorithm: DIASTOLIC_ALGORITHM, branch: 'normal-ef' as const, criteria, abnormalCount, availableCount, laPressure: null };
  const tally = `${abnormalCount} of ${availableCount} criteria abnormal`;
  if (availableCount === 0) return { ...base, conclusion: 'cannot-determine', reason: 'no criterion could be assessed' };
  if (abnormalCount * 2 > availableCount) return { ...base, conclusion: 'dysfunction', reason: tally };
  if (abnormalCount * 2 < availableCount) return { ...base, conclusion: 'normal', reason: tally };
  return { ...base, conclusion: 'indeterminate', reason: tally };
}

/**
 * Reduced LVEF, or normal LVEF with myocardial disease: grade and LA pressure from E/A, E and
 * three criteria, e.g. D5 (E/A 1.4, 3 of 3 positive) → 'grade-II', raised LA pressure.
 */
export function diastolicReducedEf2016(x: DiastolicInputs): DiastolicResult {
  const criteria = [eOverEPrimeCriterion(x), trCriterion(x), laviCriterion(x)];
  const abnormalCount = count(criteria, true);
  const normalCount = count(criteria, false);
  const base = {
    algorithm: DIASTOLIC_ALGORITHM,
    branch: 'reduced-ef-or-myocardial-disease' as const,
    criteria,
    abnormalCount,
    availableCount: abnormalCount + normalCount,
  };
  const { eVelocityCmS: e, aVelocityCmS: a } = x;
  if (e === null || a === null) {
    return { ...base, conclusion: 'cannot-determine', laPressure: null, reason: 'mitral E/A not available' };
  }
  const ratio = eOverA(e, a);
  if (isAtMost(ratio, 0.8, PRECISION.eOverA) && isAtMost(e, 50, PRECISION.velocityCmS)) {
    return { ...base, conclusion: 'grade-I', laPressure: 'normal', reason: 'E/A ≤ 0.8 and E ≤ 50 cm/s' };
  }
  if (isAtLeast(ratio, 2, PRECISION.eOverA)) {
    return { ...base, conclusion: 'grade-III', laPressure: 'raised', reason: 'E/A ≥ 2' };
  }
  const tally = `${abnormalCount} of ${base.availableCount} criteria abnormal`;
  if (abnormalCount >= 2) return { ...base, conclusion: 'grade-II', laPressure: 'raised', reason: tally };
  if (normalCount >= 2) return { ...base, conclusion: 'grade-I', laPressure: 'normal', reason: tally };
  return { ...base, conclusion: 'cannot-determine', laPressure: null, reason: `${tally}; too few or discordant criteria` };
}

/** Dispatch on the branch, e.g. `diastolicFunction2016('normal-ef', inputs)`. */
export function diastolicFunction2016(branch: DiastolicBranch, x: DiastolicInputs): DiastolicResult {
  return branch === 'normal-ef' ? diastolicNormalEf2016(x) : diastolicReducedEf2016(x);
}

export const DIASTOLIC_CONCLUSION_LABELS: Readonly<Record<DiastolicConclusion, string>> = {
  normal: 'normal diastolic function',
  indeterminate: 'indeterminate',
  dysfunction: 'LV diastolic dysfunction',
  'grade-I': 'grade I diastolic dysfunction, normal LA pressure',
  'grade-II': 'grade II diastolic dysfunction, raised LA pressure',
  'grade-III': 'grade III diastolic dysfunction, raised LA pressure',
  'cannot-determine': 'cannot be determined',
};
