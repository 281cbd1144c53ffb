// THE rounding and boundary rule of the engine (CLINICAL.md §0.2 items 2 and 3):
//
// 1. Full precision inside. Formulas never round; BSA is never rounded before indexing
//    (so M3's LVMI is 90.499 → 90, not 90.665 → 91).
// 2. Rounding happens only at the edge, half away from zero ("half-up" for the positive
//    values of this domain): 0.375 → 0.38, never banker's 0.37.
// 3. A value is compared with a published limit after rounding to the precision at which
//    it is printed, and that precision equals the precision of the published table
//    (LVMI whole g/m², LVIDd 0.1 cm, RWT 0.01, …). So banded tables such as "43–95 | 96–108"
//    have no gaps (95.4 → 95 → normal; 95.5 → 96 → mildly abnormal) and every flag agrees
//    with the number the physician reads in the report. Limits are inclusive as published:
//    "≤ 0.42" means rounded RWT 0.42 is still ≤ 0.42; "> 0.42" starts at 0.43.
// Why not "continuous value > limit"? It prints "95 g/m²" next to "mildly abnormal".

/** Round half away from zero, e.g. `roundHalfUp(0.375, 2) === 0.38`, `roundHalfUp(-1.635, 2) === -1.64`. */
export function roundHalfUp(value: number, decimals: number): number {
  if (!Number.isFinite(value)) return value;
  const scale = 10 ** decimals;
  let scaled = Math.abs(value) * scale;
  // Near a half, strip binary noise such as 37.499999999999994 (= 1.8 / 4.8 × 100), which
  // would otherwise round down; clinical inputs never carry 12 significant digits.
  if (Math.abs(scaled - Math.floor(scaled) - 0.5) < 1e-7) scaled = Number(scaled.toPrecision(12));
  const rounded = Math.floor(scaled + 0.5) / scale;
  return value < 0 ? -rounded : rounded;
}

/** `isAbove(0.425, 0.42, 2) === true` (0.425 prints as 0.43). */
export const isAbove = (value: number, limit: number, decimals: number): boolean =>
  roundHalfUp(value, decimals) > limit;

/** `isAtLeast(1.495, 1.5, 2) === true` (1.495 cm prints as 1.50 cm). */
export const isAtLeast = (value: number, limit: number, decimals: number): boolean =>
  roundHalfUp(value, decimals) >= limit;

/** `isBelow(16.9, 17, 0) === false` (prints as 17). */
export const isBelow = (value: number, limit: number, decimals: number): boolean =>
  roundHalfUp(value, decimals) < limit;

/** `isAtMost(2.14, 2.1, 1) === true` (prints as 2.1). */
export const isAtMost = (value: number, limit: number, decimals: number): boolean =>
  roundHalfUp(value, decimals) <= limit;

/**
 * Printing precision (decimals) of the quantities that category rules compare. Each equals
 * the precision of the published limit it meets; templates and reference rows reuse these.
 */
export const PRECISION = {
  bsaM2: 2,
  lvDimensionCm: 1,
  lvMassG: 0,
  lvmiGM2: 0,
  rwt: 2,
  percent: 0,
  volumeMl: 0,
  thyroidVolumeMl: 1,
  laviMlM2: 0,
  velocityCmS: 0,
  tissueVelocityCmS: 1,
  trVelocityMS: 1,
  eOverA: 2,
  eOverEPrime: 1,
  pressureMmHg: 0,
  ivcCm: 1,
  zScore: 2,
  noduleCm: 2,
  noduleMm: 1,
  aortaCm: 1,
  ductMm: 1,
  organCm: 1,
  growthPercent: 1,
} as const;
