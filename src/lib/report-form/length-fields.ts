// Which report fields a length measured on an image may go into, and its value there.
import type { TemplateDef } from '../clinical/templates/types';
import { roundHalfUp } from '../clinical/rounding';
import { convert } from '../clinical/units';
import { fieldNames } from './template-info';

/** A numeric field of the report form that holds a length. */
export interface LengthField {
  code: string;
  label: string;
  unit: 'mm' | 'cm';
  /** Printing precision of the field; the value put into it is rounded to this. */
  decimals?: number;
  /** Section title, to group the choices. */
  section?: string;
}

/**
 * The template's length fields in scan order, labelled as in the form's messages, e.g. thyroid
 * → "Right lobe: length (craniocaudal)" (cm), …, "Isthmus thickness (AP)" (mm). Only B-mode
 * fields: the calipers measure in 2D regions, so an M-mode value such as TAPSE is not offered.
 */
export function lengthFields(template: TemplateDef): LengthField[] {
  const names = fieldNames(template);
  return template.sections.flatMap((section) =>
    section.fields.flatMap((f): LengthField[] =>
      f.kind === 'number' && (f.unit === 'mm' || f.unit === 'cm') && f.mode === 'B-mode'
        ? [{ code: f.code, label: names.get(f.code) ?? f.label, unit: f.unit, decimals: f.decimals, section: section.title }]
        : [],
    ),
  );
}

/** A caliper length in the field's unit, rounded as the field prints it, e.g. 42.26 mm → 4.2 for a cm field with 1 decimal. */
export function lengthForField(lengthMm: number, field: Pick<LengthField, 'unit' | 'decimals'>): number {
  const value = convert(lengthMm, 'mm', field.unit);
  return field.decimals === undefined ? value : roundHalfUp(value, field.decimals);
}
