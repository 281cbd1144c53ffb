import { describe, expect, it } from 'vitest';
import { getTemplate, type TemplateDef } from '@/lib/clinical';
import { lengthFields, lengthForField } from '@/lib/report-form/length-fields';

const thyroid = getTemplate('thyroid') as TemplateDef;
const echo = getTemplate('echo') as TemplateDef;
const abdomen = getTemplate('abdomen') as TemplateDef;

describe('lengthFields', () => {
  it('lists the numeric mm and cm fields in scan order, named without ambiguity', () => {
    const fields = lengthFields(thyroid);
    expect(fields.map((f) => f.code)).toEqual([
      'rightLobeLengthCm', 'rightLobeWidthCm', 'rightLobeDepthCm',
      'leftLobeLengthCm', 'leftLobeWidthCm', 'leftLobeDepthCm',
      'isthmusThicknessMm',
    ]);
    expect(fields[0]).toEqual({ code: 'rightLobeLengthCm', label: 'Right lobe: length (craniocaudal)', unit: 'cm', decimals: 1, section: 'Right lobe' });
    expect(fields.at(-1)).toMatchObject({ label: 'Isthmus thickness (AP)', unit: 'mm' });
  });

  it('leaves out areas, velocities, percentages, choices and M-mode lengths', () => {
    const codes = lengthFields(echo).map((f) => f.code);
    expect(codes).toContain('lviddCm');
    expect(codes).toContain('rvBasalMm');
    for (const code of ['laAreaA4cCm2', 'eVelocityCmS', 'trVelocityMS', 'lvefPercent', 'rhythm', 'tapseMm']) expect(codes).not.toContain(code);
  });

  it('gives every length field of the abdomen template a unit of mm or cm', () => {
    const fields = lengthFields(abdomen);
    expect(fields.length).toBeGreaterThan(10);
    expect(fields.every((f) => f.unit === 'mm' || f.unit === 'cm')).toBe(true);
    expect(fields.map((f) => f.code)).not.toContain('cholecystectomy');
  });
});

describe('lengthForField', () => {
  it('converts mm to a cm field and rounds as the field prints', () => {
    // Arithmetic: 42.26 mm / 10 = 4.226 cm → 4.2 at 1 decimal.
    expect(lengthForField(42.26, { unit: 'cm', decimals: 1 })).toBe(4.2);
    // Arithmetic: 48 mm = 4.8 cm; 4.25 cm rounds half up to 4.3 (the engine's rule, CLINICAL.md §0.2).
    expect(lengthForField(48, { unit: 'cm', decimals: 1 })).toBe(4.8);
    expect(lengthForField(42.5, { unit: 'cm', decimals: 1 })).toBe(4.3);
  });

  it('keeps mm for a mm field, rounded to its decimals', () => {
    // Arithmetic: 3.46 mm → 3.5 at 1 decimal; 22.5 mm → 23 at 0 decimals (half up).
    expect(lengthForField(3.46, { unit: 'mm', decimals: 1 })).toBe(3.5);
    expect(lengthForField(22.5, { unit: 'mm', decimals: 0 })).toBe(23);
  });

  it('leaves the value unrounded when the field states no decimals', () => {
    // Arithmetic: 12.34 mm / 10 = 1.234 cm.
    expect(lengthForField(12.34, { unit: 'cm' })).toBeCloseTo(1.234, 12);
  });
});
