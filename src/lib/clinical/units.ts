// The one place where numbers change unit. Formulas defined in cm (ASE cube formula,
// Teichholz, ellipsoids) receive cm from here, never from an ad-hoc "/ 10".

export type LengthUnit = 'mm' | 'cm';
export type AreaUnit = 'mm2' | 'cm2';
export type VelocityUnit = 'cm/s' | 'm/s';

/** Every unit a field, derived value or reference row may declare. */
export type Unit =
  | LengthUnit
  | AreaUnit
  | VelocityUnit
  | 'mL'
  | 'g'
  | 'kg'
  | 'm2'
  | 'g/m2'
  | 'mL/m2'
  | 'cm/m2'
  | 'mmHg'
  | '%'
  | 'ratio'
  | 'z';

// Factor to the base unit of each dimension; units absent here convert only to themselves.
const TO_BASE: Readonly<Partial<Record<Unit, { dimension: string; factor: number }>>> = {
  mm: { dimension: 'length', factor: 0.1 },
  cm: { dimension: 'length', factor: 1 },
  mm2: { dimension: 'area', factor: 0.01 },
  cm2: { dimension: 'area', factor: 1 },
  'cm/s': { dimension: 'velocity', factor: 1 },
  'm/s': { dimension: 'velocity', factor: 100 },
};

/** True when `convert` can turn `from` into `to`, e.g. `canConvert('mm', 'cm') === true`. */
export function canConvert(from: Unit, to: Unit): boolean {
  if (from === to) return true;
  const a = TO_BASE[from];
  const b = TO_BASE[to];
  return a !== undefined && b !== undefined && a.dimension === b.dimension;
}

/** Convert between compatible units, e.g. `convert(48, 'mm', 'cm') === 4.8`; throws otherwise. */
export function convert(value: number, from: Unit, to: Unit): number {
  if (from === to) return value;
  const a = TO_BASE[from];
  const b = TO_BASE[to];
  if (a === undefined || b === undefined || a.dimension !== b.dimension) {
    throw new Error(`Cannot convert ${from} to ${to}`);
  }
  return (value * a.factor) / b.factor;
}

/** `mmToCm(48) === 4.8` */
export const mmToCm = (lengthMm: number): number => convert(lengthMm, 'mm', 'cm');
/** `cmToMm(4.8) === 48` */
export const cmToMm = (lengthCm: number): number => convert(lengthCm, 'cm', 'mm');
/** `mSToCmS(0.8) === 80` */
export const mSToCmS = (velocityMS: number): number => convert(velocityMS, 'm/s', 'cm/s');
/** `cmSToMS(280) === 2.8` */
export const cmSToMS = (velocityCmS: number): number => convert(velocityCmS, 'cm/s', 'm/s');

const SYMBOLS: Readonly<Partial<Record<Unit, string>>> = {
  mm2: 'mm²',
  cm2: 'cm²',
  m2: 'm²',
  'g/m2': 'g/m²',
  'mL/m2': 'mL/m²',
  'cm/m2': 'cm/m²',
  ratio: '',
  z: '',
};

/** Printable symbol, e.g. `unitSymbol('g/m2') === 'g/m²'`; dimensionless units print nothing. */
export function unitSymbol(unit: Unit): string {
  return SYMBOLS[unit] ?? unit;
}
