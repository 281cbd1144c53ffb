import type { ImagingMode } from '../types';
import type { Unit } from '../units';
import type { ChoiceField, ChoiceOption, NumberField } from './types';

/** Numeric field shorthand, e.g. `num('lviddCm', 'LVIDd', 'cm', 1, [2, 9], 'B-mode', 4.8)`. */
export function num(code: string, label: string, unit: Unit, decimals: number, bounds: readonly [number, number], mode: ImagingMode, example: number): NumberField {
  return { kind: 'number', code, label, unit, decimals, min: bounds[0], max: bounds[1], mode, example };
}

/** Choice field shorthand; options as [value, label] pairs. */
export function choice(code: string, label: string, options: ReadonlyArray<readonly [string, string]>, mode: ImagingMode | null = null): ChoiceField {
  return { kind: 'choice', code, label, options: options.map(([value, l]): ChoiceOption => ({ value, label: l })), mode };
}

export const YES_NO: ReadonlyArray<readonly [string, string]> = [
  ['no', 'No'],
  ['yes', 'Yes'],
];
