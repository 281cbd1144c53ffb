import { describe, expect, it } from 'vitest';
import { evaluate, type EvaluateInput } from '@/lib/clinical';
import { fullEchoInput } from './helpers';

const errorsOf = (input: EvaluateInput): Record<string, string> => {
  const r = evaluate(input);
  return r.ok ? {} : r.fieldErrors;
};
const withMeasurements = (m: Record<string, unknown>): EvaluateInput => {
  const input = fullEchoInput('male');
  return { ...input, measurements: { ...input.measurements, ...(m as EvaluateInput['measurements']) } };
};

describe('evaluate (input refusal)', () => {
  it('refuses a mm value typed into a cm field instead of flagging it', () => {
    const r = evaluate(withMeasurements({ lviddCm: 48 }));
    expect(r.ok).toBe(false);
    expect(errorsOf(withMeasurements({ lviddCm: 48 }))['measurements.lviddCm']).toMatch(/outside the plausible range 2\.0–9\.0 cm \(check the unit\)/);
  });

  it('refuses non-numbers, unknown fields and unknown options', () => {
    const e = errorsOf(withMeasurements({ ivsdCm: '1.0', pwdCm: Number.NaN, lvidsCm: Infinity, shoeSize: 42, rhythm: 'jazz' }));
    expect(Object.keys(e).sort()).toEqual(['measurements.ivsdCm', 'measurements.lvidsCm', 'measurements.pwdCm', 'measurements.rhythm', 'measurements.shoeSize']);
    expect(e['measurements.shoeSize']).toBe('unknown field for this template');
  });

  it('accepts the explicit states', () => {
    expect(evaluate(withMeasurements({ lviddCm: 'not-measurable', pwdCm: 'not-done', ivsdCm: undefined })).ok).toBe(true);
  });

  it('checks the patient, the options and the prior exam', () => {
    const input = fullEchoInput('male');
    expect(errorsOf({ ...input, patient: { ...input.patient, birthDate: '1970-02-30' } })).toHaveProperty(['patient.birthDate']);
    expect(errorsOf({ ...input, patient: { ...input.patient, examDate: '1960-01-01' } })['patient.examDate']).toMatch(/before the birth date/);
    expect(errorsOf({ ...input, patient: { ...input.patient, heightCm: 1.7 } })).toHaveProperty(['patient.heightCm']);
    expect(errorsOf({ ...input, patient: { ...input.patient, weightKg: 700 } })).toHaveProperty(['patient.weightKg']);
    expect(errorsOf({ ...input, options: { ellipsoidCoefficient: 5 } })).toHaveProperty(['options.ellipsoidCoefficient']);
    expect(errorsOf({ ...input, options: { aaaScheme: 'made-up' as never } })).toHaveProperty(['options.aaaScheme']);
    expect(errorsOf({ ...input, options: { disabledUrgentRules: ['nope' as never] } })).toHaveProperty(['options.disabledUrgentRules']);
    expect(errorsOf({ ...input, prior: { examDate: '2025-03-01' } })['prior.examDate']).toMatch(/before the exam date/);
    expect(errorsOf({ ...input, prior: { examDate: '2024-03-01', measurements: { lviddCm: 50 } } })).toHaveProperty(['prior.measurements.lviddCm']);
  });

  it('refuses an unknown template', () => {
    expect(errorsOf({ ...fullEchoInput('male'), templateId: 'knee' })).toEqual({ templateId: 'unknown template knee' });
  });

  it('refuses at the plausibility bounds exactly as declared', () => {
    // LVIDd bounds 2–9 cm: 9.0 accepted, 9.01 refused
    expect(evaluate(withMeasurements({ lviddCm: 9 })).ok).toBe(true);
    expect(evaluate(withMeasurements({ lviddCm: 9.01 })).ok).toBe(false);
    expect(evaluate(withMeasurements({ lviddCm: 2 })).ok).toBe(true);
    expect(evaluate(withMeasurements({ lviddCm: 1.99 })).ok).toBe(false);
  });
});
