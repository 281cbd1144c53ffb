import { describe, expect, it } from 'vitest';
import { ellipsoidVolumeMl, evaluate, roundHalfUp, type NoduleInput } from '@/lib/clinical';
import { expectOk, thyroidInputWithFourNodules } from './helpers';

const solidHypo: NoduleInput = { lobe: 'right', lengthMm: 12, widthMm: 10, depthMm: 8, composition: 'solid', echogenicity: 'hypoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: [] };

describe('evaluate (thyroid)', () => {
  it('reports lobes, their volumes and the total', () => {
    const r = expectOk(evaluate(thyroidInputWithFourNodules()));
    // CLINICAL.md §1.1: 6.0 mL, 4.9 mL, total 11.0 mL (π/6)
    expect(r.findings).toContain('Right lobe 4.8 × 1.6 × 1.5 cm, volume 6.0 mL.');
    expect(r.findings).toContain('Left lobe 4.5 × 1.5 × 1.4 cm, volume 4.9 mL.');
    expect(r.findings.join(' ')).toContain('Total thyroid volume 11.0 mL (ellipsoid, coefficient 0.5236; sum of lobes, isthmus excluded).');
    expect(r.flags.find((f) => f.valueCode === 'thyroidVolumeMl')?.status).toBe('normal');
  });

  it('takes the ellipsoid coefficient as an option and records it', () => {
    const r = expectOk(evaluate({ ...thyroidInputWithFourNodules(), options: { ellipsoidCoefficient: 0.479 } }));
    const total = r.derived.find((d) => d.code === 'thyroidVolumeMl');
    // CLINICAL.md §1.1: 0.479 (Brunn 1981, SRC~) → 10.0 mL (10.045)
    expect(roundHalfUp(total?.value ?? 0, 3)).toBe(10.045);
    expect(total?.method).toContain('coefficient 0.4790');
  });

  it('assesses the worked nodules with TI-RADS level and recommendation', () => {
    const r = expectOk(evaluate(thyroidInputWithFourNodules()));
    // CLINICAL.md §3.4 T1, T2, T4, T5; Tessler et al. JACR 2017
    expect(r.assessments.nodules?.map((n) => [n.id, n.points, n.level, n.action])).toEqual([
      ['N1', 4, 4, 'follow-up'],
      ['N2', 2, 2, 'none'],
      ['N3', 3, 3, 'fna'],
      ['N4', 0, 1, 'none'],
    ]);
    const text = r.findings.join('\n');
    expect(text).toMatch(/Nodule N1 \(right lobe, mid\): 12\.0 × 10\.0 × 8\.0 mm; .*ACR TI-RADS 4 points, TR4 \(moderately suspicious\)\. Follow-up ultrasound at 1, 2, 3 and 5 years\./);
    expect(text).toMatch(/Nodule N3 .*TR3 .*FNA recommended \(size ≥ 2\.5 cm\)\./);
    expect(text).toMatch(/Nodule N4 .*spongiform.*TR1/);
    expect(r.algorithms.tirads).toMatch(/ACR TI-RADS/);
  });

  it('reports at most four nodules and biopsies at most two', () => {
    const input = thyroidInputWithFourNodules();
    const tr5 = (mm: number): NoduleInput => ({ ...solidHypo, lengthMm: mm, shape: 'taller-than-wide', echogenicity: 'very-hypoechoic' });
    const nodules = [...(input.nodules ?? []), tr5(14), tr5(20), tr5(11)];
    const r = expectOk(evaluate({ ...input, nodules }));
    const a = r.assessments.nodules ?? [];
    expect(a.filter((n) => n.reported)).toHaveLength(4);
    expect(a.filter((n) => n.biopsySelected).map((n) => n.id)).toEqual(['N5', 'N6']); // the two TR5 nodules of 20 and 14 mm, not the 11 mm one
    expect(a.find((n) => n.id === 'N7')?.action).toBe('fna-not-selected');
    expect(a.find((n) => n.id === 'N3')?.action).toBe('fna-not-selected');
    expect(r.findings.join(' ')).toMatch(/3 further nodules with lower TI-RADS points not described individually/);
    // CLINICAL.md §4: TR5 meeting FNA size prompts (category 3)
    expect(r.urgentPrompts.filter((p) => p.ruleId === 'tirads-tr5-fna')).toHaveLength(3);
    expect(expectOk(evaluate({ ...input, nodules, options: { disabledUrgentRules: ['tirads-tr5-fna'] } })).urgentPrompts).toEqual([]);
  });

  it('always reports a nodule chosen for FNA, even with lower points', () => {
    // CLINICAL.md §3.3: report the 4 highest-scoring; biopsy by level then size. A 4-point TR4
    // nodule of 3.0 cm (FNA) must not be hidden behind four 5–6 point TR4 nodules of 1.1 cm.
    const input = thyroidInputWithFourNodules();
    const small = (extra: Partial<NoduleInput>): NoduleInput => ({ ...solidHypo, lengthMm: 11, ...extra });
    const nodules = [
      small({ margin: 'lobulated-or-irregular' }),
      small({ margin: 'lobulated-or-irregular' }),
      small({ echogenicity: 'very-hypoechoic' }),
      small({ echogenicity: 'very-hypoechoic' }),
      { ...solidHypo, lengthMm: 30 },
    ];
    const a = expectOk(evaluate({ ...input, nodules })).assessments.nodules ?? [];
    expect(a.map((n) => n.points)).toEqual([6, 6, 5, 5, 4]);
    expect(a[4]).toMatchObject({ action: 'fna', biopsySelected: true, reported: true });
    expect(a.filter((n) => n.reported)).toHaveLength(4);
    expect(a[3]?.reported).toBe(false);
  });

  it('flags the same total volume for a woman but not a man', () => {
    // CLINICAL.md §2.4; Gutekunst 1988 as cited (SRC~): upper normal 18 mL women, 25 mL men
    const m = { rightLobeLengthCm: 5.5, rightLobeWidthCm: 2.2, rightLobeDepthCm: 2.0, leftLobeLengthCm: 5.0, leftLobeWidthCm: 2.0, leftLobeDepthCm: 1.8 };
    const expected = ellipsoidVolumeMl(5.5, 2.2, 2.0) + ellipsoidVolumeMl(5.0, 2.0, 1.8);
    const run = (sex: 'male' | 'female' | 'unknown') => expectOk(evaluate({ templateId: 'thyroid', measurements: m, patient: { sex, birthDate: '1980-01-01', examDate: '2025-01-01' } }));
    const women = run('female').flags.find((f) => f.valueCode === 'thyroidVolumeMl');
    expect(women?.value).toBeCloseTo(expected, 12);
    expect(women?.status).toBe('high');
    expect(run('male').flags.find((f) => f.valueCode === 'thyroidVolumeMl')?.status).toBe('normal');
    expect(run('unknown').flags.find((f) => f.valueCode === 'thyroidVolumeMl')?.status).toBe('not-applied');
  });

  it('sums only the lobes present', () => {
    const input = thyroidInputWithFourNodules();
    const r = expectOk(evaluate({ ...input, measurements: { ...input.measurements, rightLobeState: 'absent', rightLobeLengthCm: undefined, rightLobeWidthCm: undefined, rightLobeDepthCm: undefined } }));
    expect(r.findings).toContain('Right lobe absent.');
    expect(r.derived.find((d) => d.code === 'thyroidVolumeMl')?.value).toBeCloseTo(ellipsoidVolumeMl(4.5, 1.5, 1.4), 12);
  });

  it('compares nodules with the prior exam', () => {
    // CLINICAL.md §3.3: > 20 % and > 2 mm in two dimensions; a rising level → repeat in 1 year
    const input = thyroidInputWithFourNodules();
    const before: NoduleInput = { ...solidHypo, id: 'N1', lengthMm: 9, widthMm: 7.5, composition: 'mixed' };
    const r = expectOk(evaluate({ ...input, prior: { examDate: '2024-05-20', nodules: [before] } }));
    const n1 = r.assessments.nodules?.find((n) => n.id === 'N1');
    expect(n1?.prior).toMatchObject({ levelRose: true, intervalDays: 365, growth: { significant: true, grownDimensions: ['lengthMm', 'widthMm'] } });
    expect(r.findings.join(' ')).toMatch(/Significant growth since the prior exam \(12 months\).*TR level has risen/);
    expect(r.assessments.nodules?.find((n) => n.id === 'N2')?.prior).toBeNull();
  });

  it('prompts for extrathyroidal extension and suspicious nodes', () => {
    const input = thyroidInputWithFourNodules();
    const r = expectOk(evaluate({ ...input, measurements: { ...input.measurements, cervicalNodes: 'suspicious' }, nodules: [{ ...solidHypo, lengthMm: 6, widthMm: 5, depthMm: 4, margin: 'extrathyroidal-extension' }] }));
    expect(r.urgentPrompts.map((p) => p.ruleId).sort()).toEqual(['thyroid-extrathyroidal-extension', 'thyroid-suspicious-nodes']);
  });

  it('refuses too many nodules and malformed ones', () => {
    const input = thyroidInputWithFourNodules();
    const many = Array.from({ length: 11 }, () => solidHypo);
    const tooMany = evaluate({ ...input, nodules: many });
    expect(tooMany.ok).toBe(false);
    if (!tooMany.ok) expect(tooMany.fieldErrors.nodules).toMatch(/at most 10/);
    const bad = evaluate({ ...input, nodules: [{ ...solidHypo, lengthMm: 120, depthMm: 0.5, foci: ['none-or-comet-tail', 'punctate'] }] });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(Object.keys(bad.fieldErrors).sort()).toEqual(['nodules[0].depthMm', 'nodules[0].foci', 'nodules[0].lengthMm']);
    const badFeature = evaluate({ ...input, nodules: [{ ...solidHypo, composition: 'rocky' as never }] });
    expect(badFeature.ok ? {} : badFeature.fieldErrors).toHaveProperty(['nodules[0].composition']);
    expect(evaluate({ ...input, templateId: 'echo', measurements: {} }).ok).toBe(false);
  });
});
