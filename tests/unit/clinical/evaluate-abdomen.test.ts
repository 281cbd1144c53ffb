import { describe, expect, it } from 'vitest';
import { evaluate, roundHalfUp, type EvaluateInput, type Measurements } from '@/lib/clinical';
import { expectOk } from './helpers';

const run = (measurements: Measurements, patient: Partial<EvaluateInput['patient']> = {}, extra: Partial<EvaluateInput> = {}) =>
  expectOk(evaluate({ templateId: 'abdomen', measurements, patient: { sex: 'male', birthDate: '1960-06-01', examDate: '2025-06-01', ...patient }, ...extra }));
const status = (r: ReturnType<typeof run>, code: string) => r.flags.find((f) => f.valueCode === code)?.status;

describe('evaluate (abdomen)', () => {
  it('calculates spleen, bladder and post-void volumes', () => {
    const r = run({
      spleenLengthCm: 12, spleenWidthCm: 7, spleenDepthCm: 4.5,
      bladderPreLengthCm: 10, bladderPreWidthCm: 8, bladderPreDepthCm: 7,
      bladderPostLengthCm: 8, bladderPostWidthCm: 6, bladderPostDepthCm: 5,
    });
    // CLINICAL.md §1.1: spleen 197.9, bladder 293.2, PVR 125.7 mL with π/6
    const v = (code: string) => roundHalfUp(r.derived.find((d) => d.code === code)?.value ?? 0, 1);
    expect([v('spleenVolumeMl'), v('bladderVolumeMl'), v('postVoidResidualMl')]).toEqual([197.9, 293.2, 125.7]);
    expect(r.findings.join(' ')).toMatch(/bladder volume 293 mL pre-void, post-void residual 126 mL/i);
  });

  it('widens the CBD limit with age and after cholecystectomy', () => {
    // CLINICAL.md §2.3: ≤ 6 mm (CP); +1 mm per decade over 60 (CP), capped at 8.5 mm (Bachar 2003)
    expect(status(run({ cbdMm: 7 }, { birthDate: '1975-01-01' }), 'cbdMm')).toBe('high');
    const old = run({ cbdMm: 7 }, { birthDate: '1950-01-01' });
    expect(status(old, 'cbdMm')).toBe('normal');
    expect(old.flags.find((f) => f.valueCode === 'cbdMm')?.range?.max).toBe(7);
    expect(old.findings.join(' ')).toMatch(/upper limit 7 mm \(age 75 y/);
    expect(status(run({ cbdMm: 7.1 }, { birthDate: '1950-01-01' }), 'cbdMm')).toBe('high');
    expect(status(run({ cbdMm: 8.5 }, { birthDate: '1930-01-01' }), 'cbdMm')).toBe('normal');
    expect(status(run({ cbdMm: 8.6 }, { birthDate: '1930-01-01' }), 'cbdMm')).toBe('high');
    expect(status(run({ cbdMm: 9, cholecystectomy: 'yes' }, { birthDate: '1975-01-01' }), 'cbdMm')).toBe('normal');
    expect(status(run({ cbdMm: 7 }, { birthDate: '1950-01-01' }, { options: { cbdAllowance: 'none' } }), 'cbdMm')).toBe('high');
  });

  it('places organ limits exactly (at → normal, just above → high)', () => {
    // Gosink & Leymaster 1981: enlarged ≥ 15.5 cm
    expect(status(run({ liverLengthCm: 15.4 }), 'liverLengthCm')).toBe('normal');
    expect(status(run({ liverLengthCm: 15.5 }), 'liverLengthCm')).toBe('high');
    // Ultraschall Med 2011: spleen ≤ 12 cm
    expect(status(run({ spleenLengthCm: 12.0 }), 'spleenLengthCm')).toBe('normal');
    expect(status(run({ spleenLengthCm: 12.1 }), 'spleenLengthCm')).toBe('high');
    // common practice: portal vein ≤ 13 mm
    expect(status(run({ portalVeinMm: 13 }), 'portalVeinMm')).toBe('normal');
    expect(status(run({ portalVeinMm: 13.1 }), 'portalVeinMm')).toBe('high');
    // pancreatic duct "> 2 mm" dilated (our choice of the two abstracts)
    expect(status(run({ pancreaticDuctMm: 2.0 }), 'pancreaticDuctMm')).toBe('normal');
    expect(status(run({ pancreaticDuctMm: 2.1 }), 'pancreaticDuctMm')).toBe('high');
    // CMDT 2020: kidney 9–12 cm; > 1.5 cm left–right difference
    expect(status(run({ rightKidneyLengthCm: 8.9 }), 'rightKidneyLengthCm')).toBe('low');
    expect(status(run({ rightKidneyLengthCm: 10.0, leftKidneyLengthCm: 11.5 }), 'kidneyLengthDifferenceCm')).toBe('normal');
    expect(status(run({ rightKidneyLengthCm: 10.0, leftKidneyLengthCm: 11.6 }), 'kidneyLengthDifferenceCm')).toBe('high');
    // gallbladder wall ≤ 3 mm (CP)
    expect(status(run({ gbWallMm: 3.0 }), 'gbWallMm')).toBe('normal');
    expect(status(run({ gbWallMm: 3.1 }), 'gbWallMm')).toBe('high');
  });

  it('categorises an AAA with the surveillance interval of the named scheme', () => {
    // CLINICAL.md §2.3: SVS 2018 4.0–4.4 cm → 12 months; NHS → 12 months; ACR 2013 → 1 year
    const r = run({ aortaDiameterCm: 4.2, aortaConvention: 'outer-to-outer' });
    expect(r.assessments.aaa).toMatchObject({ isAneurysm: true, surveillance: { scheme: 'svs-2018', band: '4.0-4.4', advice: { intervalMonths: 12 } } });
    expect(r.findings.join(' ')).toMatch(/Abdominal aortic aneurysm, maximum diameter 4\.2 cm \(outer-to-outer\); SVS 2018: ultrasound every 12 months\./);
    expect(r.algorithms.aaaScheme).toBe('SVS 2018');
    const nhs = run({ aortaDiameterCm: 4.7, aortaConvention: 'inner-to-inner' }, {}, { options: { aaaScheme: 'nhs-aaa' } });
    expect(nhs.assessments.aaa?.surveillance.advice.intervalMonths).toBe(3);
    expect(nhs.findings.join(' ')).toMatch(/NHS AAA Screening Programme: surveillance every 3 months/);
    expect(status(run({ aortaDiameterCm: 2.9 }), 'aortaDiameterCm')).toBe('normal');
    expect(status(run({ aortaDiameterCm: 3.0 }), 'aortaDiameterCm')).toBe('high');
  });

  it('prompts at the repair threshold by sex', () => {
    // CLINICAL.md §4: ≥ 5.5 cm men, ≥ 5.0 cm women (SVS/ESVS, SRC~)
    const ids = (r: ReturnType<typeof run>) => r.urgentPrompts.map((p) => p.ruleId);
    expect(ids(run({ aortaDiameterCm: 5.2 }, { sex: 'male' }))).toEqual([]);
    expect(ids(run({ aortaDiameterCm: 5.5 }, { sex: 'male' }))).toEqual(['aaa-repair-threshold']);
    expect(ids(run({ aortaDiameterCm: 5.0 }, { sex: 'female' }))).toEqual(['aaa-repair-threshold']);
    expect(run({ aortaDiameterCm: 5.0 }, { sex: 'unknown' }).urgentPrompts[0]?.message).toMatch(/sex not recorded/);
  });

  it('prompts for rapid growth against the prior exam', () => {
    // CLINICAL.md §2.3: ≥ 0.5 cm in 6 months (SRC~)
    const r = run({ aortaDiameterCm: 4.6 }, {}, { prior: { examDate: '2025-01-01', measurements: { aortaDiameterCm: 4.0 } } });
    expect(r.assessments.aaa?.rapidGrowth).toBe(true);
    expect(r.urgentPrompts.map((p) => p.ruleId)).toEqual(['aaa-rapid-growth']);
    expect(run({ aortaDiameterCm: 4.3 }, {}, { prior: { examDate: '2025-01-01', measurements: { aortaDiameterCm: 4.0 } } }).assessments.aaa?.rapidGrowth).toBe(false);
  });
});
