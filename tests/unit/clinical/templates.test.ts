import { describe, expect, it } from 'vitest';
import { convert, evaluate, missingRequired, REFERENCE_RANGES, TEMPLATES, templateFingerprint, type NumberField, type TemplateDef } from '@/lib/clinical';

// Fingerprint per template version; a data change without a version bump fails here.
const PINNED: Record<string, string> = {
  'thyroid@1.1.0': '59e960e5',
  'abdomen@1.1.0': 'e4937a22',
  'echo@1.1.0': 'cdd78491',
};

const templates = Object.values(TEMPLATES);
const numberFields = (t: TemplateDef): NumberField[] => t.sections.flatMap((s) => s.fields).filter((f): f is NumberField => f.kind === 'number');
const patient = { sex: 'female' as const, birthDate: '1970-01-01', examDate: '2025-01-01', heightCm: 165, weightKg: 65 };
const refused = (t: TemplateDef, code: string, value: number): boolean => {
  const r = evaluate({ templateId: t.id, measurements: { [code]: value }, patient });
  return !r.ok && `measurements.${code}` in r.fieldErrors;
};

describe('templates', () => {
  it('are the three exams, each versioned', () => {
    expect(Object.keys(TEMPLATES).sort()).toEqual(['abdomen', 'echo', 'thyroid']);
    for (const t of templates) expect(t.version).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it.each(templates.map((t) => [t.id, t] as const))('%s: bumps its version when its data changes', (_id, t) => {
    expect(templateFingerprint(t), `template ${t.id} changed: bump its version and pin the new fingerprint`).toBe(PINNED[`${t.id}@${t.version}`]);
  });

  it.each(templates.map((t) => [t.id, t] as const))('%s: has unique codes and sane number fields', (_id, t) => {
    const codes = [...t.sections.flatMap((s) => s.fields.map((f) => f.code)), ...t.derived.map((d) => d.code)];
    expect(new Set(codes).size).toBe(codes.length);
    for (const f of numberFields(t)) {
      expect(f.min, f.code).toBeLessThan(f.example);
      expect(f.example, f.code).toBeLessThan(f.max);
      expect(['B-mode', 'M-mode', 'Doppler']).toContain(f.mode);
      expect(Number.isInteger(f.decimals)).toBe(true);
    }
  });

  it.each(templates.map((t) => [t.id, t] as const))('%s: accepts every typical value and refuses it typed in the other unit', (_id, t) => {
    for (const f of numberFields(t)) {
      expect(refused(t, f.code, f.example), `${f.code} example`).toBe(false);
      if (f.unit === 'cm') expect(refused(t, f.code, f.example * 10), `${f.code} typed in mm`).toBe(true);
      if (f.unit === 'mm') expect(refused(t, f.code, f.example / 10), `${f.code} typed in cm`).toBe(true);
      if (f.unit === 'm/s') expect(refused(t, f.code, f.example * 100), `${f.code} typed in cm/s`).toBe(true);
      if (f.unit === 'cm/s' && f.example >= 20) expect(refused(t, f.code, f.example / 100), `${f.code} typed in m/s`).toBe(true);
    }
  });

  it('refuses a 40 cm thyroid lobe', () => {
    expect(refused(TEMPLATES.thyroid, 'rightLobeLengthCm', 40)).toBe(true);
    expect(refused(TEMPLATES.thyroid, 'rightLobeLengthCm', 10)).toBe(false);
    expect(refused(TEMPLATES.thyroid, 'rightLobeLengthCm', 10.01)).toBe(true);
  });

  it.each(templates.map((t) => [t.id, t] as const))('%s: checks values against existing rows at the same precision', (_id, t) => {
    const fields = new Map(numberFields(t).map((f) => [f.code, f]));
    for (const check of t.referenceChecks) {
      const value = fields.get(check.valueCode) ?? t.derived.find((d) => d.code === check.valueCode);
      expect(value, check.valueCode).toBeDefined();
      const rows = REFERENCE_RANGES.filter((r) => r.code === check.referenceCode);
      expect(rows.length, check.referenceCode).toBeGreaterThan(0);
      // One printed step of the value equals one step of the table, so flags match the print.
      for (const r of rows) {
        const stepInRowUnit = convert(10 ** -(value?.decimals ?? 0), value?.unit ?? r.unit, r.unit);
        expect(stepInRowUnit, `${check.valueCode} vs ${r.id}`).toBeCloseTo(10 ** -r.decimals, 12);
      }
    }
  });

  it('groups fields by imaging mode where the exam uses them', () => {
    const modes = new Set(numberFields(TEMPLATES.echo).map((f) => f.mode));
    expect([...modes].sort()).toEqual(['B-mode', 'Doppler', 'M-mode']);
    expect(numberFields(TEMPLATES.echo).find((f) => f.code === 'tapseMm')?.mode).toBe('M-mode');
  });

  it('lets the thyroid template hold nodules with ACR limits', () => {
    // CLINICAL.md §3.3: report at most 4, biopsy at most 2
    expect(TEMPLATES.thyroid.nodules).toMatchObject({ maxReported: 4, maxBiopsied: 2 });
    expect(TEMPLATES.thyroid.nodules?.maxEntered).toBeGreaterThanOrEqual(4);
    expect(TEMPLATES.echo.nodules).toBeNull();
  });

  it('never grades Teichholz EF (CLINICAL.md §1.5)', () => {
    expect(TEMPLATES.echo.referenceChecks.some((c) => c.valueCode === 'teichholzEfPercent')).toBe(false);
  });
});

describe('missingRequired (what "Submit preliminary" insists on)', () => {
  const thyroid = TEMPLATES.thyroid;
  it('lists every required field of an empty form, in scan order', () => {
    expect(missingRequired(thyroid, {})).toEqual([
      'rightLobeLengthCm', 'rightLobeWidthCm', 'rightLobeDepthCm',
      'leftLobeLengthCm', 'leftLobeWidthCm', 'leftLobeDepthCm',
      'isthmusThicknessMm', 'echotexture',
    ]);
  });
  it('accepts "not measurable" but not "not done"', () => {
    const m = { rightLobeLengthCm: 4.8, rightLobeWidthCm: 1.6, rightLobeDepthCm: 'not-measurable', leftLobeLengthCm: 'not-done' } as const;
    const missing = missingRequired(thyroid, m);
    expect(missing).not.toContain('rightLobeDepthCm');
    expect(missing).toContain('leftLobeLengthCm');
  });
  it('waives the lobe dimensions of an absent lobe, and the gallbladder wall after cholecystectomy', () => {
    expect(missingRequired(thyroid, { leftLobeState: 'absent' }).filter((c) => c.startsWith('leftLobe'))).toEqual([]);
    expect(missingRequired(TEMPLATES.abdomen, { cholecystectomy: 'yes' })).not.toContain('gbWallMm');
    expect(missingRequired(TEMPLATES.abdomen, { cholecystectomy: 'no' })).toContain('gbWallMm');
  });
  it('only names fields that exist in the template', () => {
    for (const t of templates) {
      const codes = new Set(t.sections.flatMap((s) => s.fields.map((f) => f.code)));
      for (const rule of t.required) {
        expect(codes.has(rule.code), `${t.id}: ${rule.code}`).toBe(true);
        if (rule.unless) expect(codes.has(rule.unless.code), `${t.id}: ${rule.unless.code}`).toBe(true);
      }
    }
  });
});
