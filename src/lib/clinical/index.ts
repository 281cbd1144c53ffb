// Public surface of the clinical engine. Framework-free: no Astro, React, Sequelize or Node
// import anywhere below this folder, so islands and server run the very same code.

export { evaluate } from './evaluate/evaluate';
export { flagMessage } from './evaluate/flags';
export type * from './evaluate/types';
export { HEIGHT_BOUNDS_CM, WEIGHT_BOUNDS_KG } from './evaluate/validate';
export { CAUTIONS } from './cautions';
export * from './types';

export { REFERENCE_RANGES, REFERENCE_SET_VERSION, type ReferenceRange } from './reference-ranges';
export { classifyValue, selectReference, SEX_NOT_APPLIED, type Classification, type ReferenceSelection } from './reference/classify';

export { getTemplate, TEMPLATES } from './templates/registry';
export { dataFingerprint, templateFingerprint } from './templates/fingerprint';
export { missingRequired } from './templates/required';
export type * from './templates/types';
export type { NoduleAction, NoduleAssessment, NoduleInput, NoduleLobe, NoduleZone } from './templates/thyroid/nodules';
export { DEFAULT_PROBE, PROBE_KINDS } from './probes';
export { URGENT_RULES, type UrgentRule, type UrgentRuleId } from './urgent';

export * from './units';
export { isAbove, isAtLeast, isAtMost, isBelow, PRECISION, roundHalfUp } from './rounding';
export { formatNumber, formatQuantity, formatRange } from './formatting';
export { ageInYears, daysBetween, parseIsoDate, type CalendarDate } from './dates';
export * from './physics';

export * from './formulas/ellipsoid';
export * from './formulas/bsa';
export * from './formulas/lv';
export * from './formulas/atrium';
export * from './formulas/doppler';
export * from './formulas/diastolic';
export * from './formulas/aortic-root';
export * from './formulas/cbd';
export * from './aaa/schemes';
export * from './aaa/aaa';
export * from './tirads/features';
export * from './tirads/score';
export * from './tirads/selection';
export * from './tirads/growth';
