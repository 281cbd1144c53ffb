import type { FieldDef, NumberField } from '../templates/types';
import { NOT_DONE, NOT_MEASURABLE, type Measurements } from '../types';
import { convert, type Unit } from '../units';
import type { FieldReader } from './types';

/** Index a template's fields by code, e.g. `indexFields(sections).get('lviddCm')`. */
export function indexFields(sections: readonly { fields: readonly FieldDef[] }[]): Map<string, FieldDef> {
  const map = new Map<string, FieldDef>();
  for (const section of sections) for (const field of section.fields) map.set(field.code, field);
  return map;
}

/**
 * Reader over already validated measurements: numbers come back converted to the unit the
 * formula wants, so a template may store mm while the formula takes cm.
 */
export function createReader(fields: ReadonlyMap<string, FieldDef>, measurements: Measurements): FieldReader {
  const numberField = (code: string): NumberField => {
    const field = fields.get(code);
    if (field === undefined || field.kind !== 'number') throw new Error(`No numeric field ${code}`);
    return field;
  };
  return {
    number(code: string, unit?: Unit): number | null {
      const field = numberField(code);
      const entry = measurements[code];
      if (typeof entry !== 'number') return null;
      return unit === undefined ? entry : convert(entry, field.unit, unit);
    },
    state(code: string) {
      const entry = measurements[code];
      if (typeof entry === 'number') return 'value';
      return entry === NOT_MEASURABLE ? NOT_MEASURABLE : NOT_DONE;
    },
    choice(code: string): string | null {
      const entry = measurements[code];
      return typeof entry === 'string' && entry !== NOT_DONE && entry !== NOT_MEASURABLE ? entry : null;
    },
  };
}
