import { describe, expect, it } from 'vitest';
import { ellipsoidVolumeMl, evaluate, getTemplate, roundHalfUp, type NoduleInput, type TemplateDef } from '@/lib/clinical';
import { compareWithPriors, formatChange, type ComparedExam } from '@/lib/report-compare/compare';
import { storedEvaluation } from '@/lib/schemas/reports';
import { expectOk } from './clinical/helpers';

const template = (id: string): TemplateDef => {
  const t = getTemplate(id);
  if (t === undefined) throw new Error(`no template ${id}`);
  return t;
};
const THYROID = template('thyroid');
const ABDOMEN = template('abdomen');

let nextReportId = 1;
/** An exam evaluated by the real engine, as a saved report would hold it. */
function exam(templateId: 'thyroid' | 'abdomen', examDate: string, measurements: Record<string, number | string>, nodules: NoduleInput[] = []): ComparedExam {
  const e = expectOk(evaluate({ templateId, measurements, nodules, patient: { sex: 'female', birthDate: '1960-04-10', examDate } }));
  const reportId = nextReportId++;
  return { reportId, examId: reportId + 1000, examDate, measurements, nodules, evaluation: storedEvaluation(e) };
}
const thyroid = (examDate: string, measurements: Record<string, number | string>, nodules: NoduleInput[] = []) => exam('thyroid', examDate, measurements, nodules);
const rightLobe = (lengthCm: number) => ({ rightLobeLengthCm: lengthCm, rightLobeWidthCm: 1.6, rightLobeDepthCm: 1.5 });
const nodule = (id: string, lengthMm: number, widthMm: number, depthMm: number, extra: Partial<NoduleInput> = {}): NoduleInput => ({
  id, lobe: 'right', lengthMm, widthMm, depthMm, composition: 'solid', echogenicity: 'hypoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: ['none-or-comet-tail'], ...extra,
});

describe('compareWithPriors: value rows', () => {
  it('lists a value only when the current exam and a prior both have it', () => {
    const prior = thyroid('2024-05-20', { ...rightLobe(4.2), isthmusThicknessMm: 'not-measurable', cervicalNodes: 'no-suspicious' });
    const current = thyroid('2025-05-20', { ...rightLobe(4.8), leftLobeLengthCm: 4.5, leftLobeWidthCm: 1.5, leftLobeDepthCm: 1.4, isthmusThicknessMm: 3, cervicalNodes: 'no-suspicious' });
    const c = compareWithPriors({ template: THYROID, current, priors: [prior] });
    // worked by hand: left lobe and isthmus only measured now, so only the current exam has a
    // total volume (the engine sums both lobes); choices are not values
    expect(c.rows.map((r) => [r.code, r.kind])).toEqual([
      ['rightLobeLengthCm', 'measured'],
      ['rightLobeWidthCm', 'measured'],
      ['rightLobeDepthCm', 'measured'],
      ['rightLobeVolumeMl', 'derived'],
    ]);
    expect(current.evaluation?.derived.some((d) => d.code === 'thyroidVolumeMl')).toBe(true);
    expect(c.rows[0]).toMatchObject({ label: 'Length (craniocaudal)', section: 'Right lobe', unit: 'cm', decimals: 1 });
  });

  it('leaves out derived values of a prior stored without an evaluation', () => {
    const prior = { ...thyroid('2024-05-20', rightLobe(4.2)), evaluation: null };
    const c = compareWithPriors({ template: THYROID, current: thyroid('2025-05-20', rightLobe(4.8)), priors: [prior] });
    expect(c.rows.map((r) => r.code)).toEqual(['rightLobeLengthCm', 'rightLobeWidthCm', 'rightLobeDepthCm']);
  });

  it('gives the change and the change in per cent', () => {
    const prior = thyroid('2024-05-20', { ...rightLobe(4.2), isthmusThicknessMm: 5 });
    const current = thyroid('2025-05-20', { ...rightLobe(4.8), isthmusThicknessMm: 4.5 });
    const row = (code: string) => compareWithPriors({ template: THYROID, current, priors: [prior] }).rows.find((r) => r.code === code);
    // worked by hand: 4.8 − 4.2 = 0.6 cm, 0.6 / 4.2 = 14.29 %
    expect(row('rightLobeLengthCm')).toMatchObject({ prior: 4.2, current: 4.8, priorDate: '2024-05-20', change: 0.6 });
    expect(row('rightLobeLengthCm')?.changePercent).toBeCloseTo(14.29, 2);
    expect(formatChange(row('rightLobeLengthCm')!)).toBe('+0.6 cm (+14 %)');
    // worked by hand: 4.5 − 5 = −0.5 mm, −10 %
    expect(row('isthmusThicknessMm')?.change).toBe(-0.5);
    expect(formatChange(row('isthmusThicknessMm')!)).toBe('\u22120.5 mm (\u221210 %)');
    expect(formatChange(row('rightLobeWidthCm')!)).toBe('no change');
  });

  it('takes the change of a derived value from the printed (rounded) volumes', () => {
    const c = compareWithPriors({ template: THYROID, current: thyroid('2025-05-20', rightLobe(4.8)), priors: [thyroid('2024-05-20', rightLobe(4.2))] });
    const volume = c.rows.find((r) => r.code === 'rightLobeVolumeMl');
    // CLINICAL.md §1.1 ellipsoid π/6: 4.8 × 1.6 × 1.5 → 6.03 mL; worked by hand: 4.2 × 1.6 × 1.5 → 5.28 mL
    expect(volume?.current).toBeCloseTo(ellipsoidVolumeMl(4.8, 1.6, 1.5), 10);
    expect(roundHalfUp(volume?.prior ?? 0, 2)).toBe(5.28);
    // worked by hand: printed 6.0 − 5.3 = 0.7 mL, 0.7 / 5.3 = 13.2 %
    expect(volume).toMatchObject({ unit: 'mL', decimals: 1, change: 0.7 });
    expect(volume?.changePercent).toBeCloseTo(13.21, 2);
    expect(formatChange(volume!)).toBe('+0.7 mL (+13 %)');
  });

  it('draws the series oldest → current across two priors given in any order', () => {
    const oldest = thyroid('2023-05-02', { ...rightLobe(4.0), isthmusThicknessMm: 2.5 });
    const middle = thyroid('2024-05-20', rightLobe(4.2));
    const current = thyroid('2025-05-20', { ...rightLobe(4.8), isthmusThicknessMm: 3 });
    const c = compareWithPriors({ template: THYROID, current, priors: [oldest, middle] });
    expect(c.priors.map((p) => [p.examDate, p.reportId, p.examId])).toEqual([
      ['2024-05-20', middle.reportId, middle.examId],
      ['2023-05-02', oldest.reportId, oldest.examId],
    ]);
    const length = c.rows.find((r) => r.code === 'rightLobeLengthCm');
    expect(length).toMatchObject({ prior: 4.2, priorDate: '2024-05-20' });
    expect(length?.series).toEqual([{ date: '2023-05-02', value: 4.0 }, { date: '2024-05-20', value: 4.2 }, { date: '2025-05-20', value: 4.8 }]);
    // worked by hand: the isthmus was skipped in 2024, so it compares with 2023
    const isthmus = c.rows.find((r) => r.code === 'isthmusThicknessMm');
    expect(isthmus).toMatchObject({ prior: 2.5, priorDate: '2023-05-02', change: 0.5 });
    expect(isthmus?.series.map((p) => p.date)).toEqual(['2023-05-02', '2025-05-20']);
  });

  it('ignores exams on or after the current exam date', () => {
    const current = thyroid('2025-05-20', rightLobe(4.8));
    const sameDay = thyroid('2025-05-20', rightLobe(4.7));
    const later = thyroid('2026-01-10', rightLobe(5.0));
    expect(compareWithPriors({ template: THYROID, current, priors: [sameDay, later] })).toEqual({ priors: [], rows: [], nodules: [] });
    const earlier = thyroid('2025-05-19', rightLobe(4.6));
    const c = compareWithPriors({ template: THYROID, current, priors: [later, earlier, sameDay] });
    expect(c.priors.map((p) => p.examDate)).toEqual(['2025-05-19']);
    expect(c.rows[0]?.series.map((p) => p.value)).toEqual([4.6, 4.8]);
  });

  it('compares the abdominal aorta diameter', () => {
    const abdomen = (date: string, cm: number) => exam('abdomen', date, { aortaDiameterCm: cm, aortaConvention: 'outer-to-outer' });
    const c = compareWithPriors({ template: ABDOMEN, current: abdomen('2026-12-01', 3.1), priors: [abdomen('2025-11-10', 2.9), abdomen('2024-11-03', 2.6)] });
    const aorta = c.rows.find((r) => r.code === 'aortaDiameterCm');
    // worked by hand: 3.1 − 2.9 = 0.2 cm, 0.2 / 2.9 = 6.9 %
    expect(aorta).toMatchObject({ kind: 'measured', unit: 'cm', prior: 2.9, current: 3.1, change: 0.2 });
    expect(aorta?.changePercent).toBeCloseTo(6.9, 1);
    expect(formatChange(aorta!)).toBe('+0.2 cm (+7 %)');
    expect(aorta?.series.map((p) => p.value)).toEqual([2.6, 2.9, 3.1]);
  });
});

describe('formatChange', () => {
  it('prints the amount without a per cent when the prior was 0, and percentage points for a % value', () => {
    // worked by hand
    expect(formatChange({ change: 0.3, changePercent: null, unit: 'cm', decimals: 1 })).toBe('+0.3 cm');
    expect(formatChange({ change: -5, changePercent: -8.33, unit: '%', decimals: 0 })).toBe('\u22125 percentage points (\u22128 %)');
    expect(formatChange({ change: 0.04, changePercent: 1, unit: 'cm', decimals: 1 })).toBe('no change');
  });
});

describe('compareWithPriors: nodules', () => {
  const withoutId = ({ id: _id, ...rest }: NoduleInput): NoduleInput => rest;
  const lobes = rightLobe(4.8);

  it('finds significant growth of 10×8×6 → 12.1×10.1×6 mm', () => {
    const prior = thyroid('2024-05-20', lobes, [nodule('N1', 10, 8, 6)]);
    const current = thyroid('2025-05-20', lobes, [nodule('N1', 12.1, 10.1, 6)]);
    const [n] = compareWithPriors({ template: THYROID, current, priors: [prior] }).nodules;
    // CLINICAL.md §3.3, ACR TI-RADS growth (worked example in tirads/growth.ts): length and width
    // grew > 20 % and > 2 mm; worked by hand: volume 12.1·10.1·6 / (10·8·6) − 1 = 52.76 %
    expect(n).toMatchObject({ id: 'N1', priorDate: '2024-05-20', intervalDays: 365 });
    expect(n?.growth).toMatchObject({ significant: true, grownDimensions: ['lengthMm', 'widthMm'] });
    expect(n?.growth.volumeChangePercent).toBeCloseTo(52.76, 2);
    expect(n?.prior).toMatchObject({ lengthMm: 10, widthMm: 8, depthMm: 6, maxDiameterMm: 10 });
    expect(n?.current.maxDiameterMm).toBe(12.1);
    expect(n?.series).toEqual([{ date: '2024-05-20', value: 10 }, { date: '2025-05-20', value: 12.1 }]);
    // The engine's own prior comparison of the same pair must agree.
    const engine = expectOk(evaluate({ templateId: 'thyroid', measurements: lobes, nodules: current.nodules, patient: { sex: 'female', birthDate: '1960-04-10', examDate: '2025-05-20' }, prior: { examDate: '2024-05-20', nodules: prior.nodules } }));
    expect(n?.growth).toEqual(engine.assessments.nodules?.[0]?.prior?.growth);
  });

  it('finds no significant growth of 10×8×6 → 11×9×6 mm', () => {
    const prior = thyroid('2024-05-20', lobes, [nodule('N1', 10, 8, 6)]);
    const current = thyroid('2025-05-20', lobes, [nodule('N1', 11, 9, 6)]);
    const [n] = compareWithPriors({ template: THYROID, current, priors: [prior] }).nodules;
    // CLINICAL.md §3.3: +1 mm is not > 2 mm; worked by hand: volume 11·9 / (10·8) − 1 = 23.75 % ≤ 50 %
    expect(n?.growth).toMatchObject({ significant: false, grownDimensions: [] });
    expect(n?.growth.volumeChangePercent).toBeCloseTo(23.75, 2);
  });

  it('notes a rise of the TI-RADS level, and not a steady one', () => {
    const iso = { echogenicity: 'hyperechoic-or-isoechoic' } as const;
    // ACR TI-RADS (Tessler 2017; CLINICAL.md §3): solid 2 + isoechoic 1 = 3 → TR3; solid 2 + hypoechoic 2 = 4 → TR4
    const prior = thyroid('2024-05-20', lobes, [nodule('N1', 10, 8, 6, iso), nodule('N2', 9, 8, 7)]);
    const current = thyroid('2025-05-20', lobes, [nodule('N1', 10, 8, 6), nodule('N2', 9, 8, 7)]);
    const c = compareWithPriors({ template: THYROID, current, priors: [prior] });
    expect(c.nodules.map((n) => [n.id, n.prior.level, n.current.level, n.levelRose])).toEqual([
      ['N1', 3, 4, true],
      ['N2', 4, 4, false],
    ]);
    const unknown = compareWithPriors({ template: THYROID, current, priors: [{ ...prior, evaluation: null }] });
    expect(unknown.nodules.map((n) => [n.prior.level, n.levelRose])).toEqual([[null, null], [null, null]]);
  });

  it('links a nodule to the latest prior that has its id and leaves unmatched nodules out', () => {
    const oldest = thyroid('2023-05-02', lobes, [nodule('N1', 8, 7, 6), nodule('N2', 6, 5, 5)]);
    const middle = thyroid('2024-05-20', lobes, [nodule('N1', 9, 8, 6)]);
    const current = thyroid('2025-05-20', lobes, [nodule('N1', 10, 8, 6), nodule('N2', 7, 5, 5), nodule('N3', 12, 10, 8), withoutId(nodule('x', 5, 5, 5))]);
    const c = compareWithPriors({ template: THYROID, current, priors: [middle, oldest] });
    expect(c.nodules.map((n) => [n.id, n.priorDate])).toEqual([
      ['N1', '2024-05-20'],
      ['N2', '2023-05-02'],
    ]);
    // worked by hand: max diameters 8, 9, 10 mm
    expect(c.nodules[0]?.series.map((p) => p.value)).toEqual([8, 9, 10]);
    // worked by hand: 2023-05-02 → 2025-05-20 = 366 (across 29 Feb 2024) + 365 + 18 = 749 days
    expect(c.nodules[1]?.intervalDays).toBe(749);
  });
});
