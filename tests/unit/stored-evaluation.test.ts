// What the database keeps of an evaluation (storedEvaluation) and how readers get it back
// (readEvaluation): flags judged against a reference row are stored without their citation and
// sentence, and read back exactly as the engine wrote them.
import { describe, expect, it } from 'vitest';
import { evaluate, REFERENCE_RANGES, type EvaluateInput, type EvaluationSuccess } from '../../src/lib/clinical';
import { readEvaluation, storedEvaluation, type ReportEvaluation } from '../../src/lib/schemas/reports';
import { expectOk, fullEchoInput, thyroidInputWithFourNodules } from './clinical/helpers';

const run = (input: EvaluateInput): EvaluationSuccess => expectOk(evaluate({ ...input, referenceRanges: REFERENCE_RANGES }));
const asReport = (e: EvaluationSuccess): ReportEvaluation => ({
  derived: e.derived, flags: e.flags, findings: e.findings, assessments: e.assessments, urgentPrompts: e.urgentPrompts,
  algorithms: e.algorithms, patient: e.patient, options: e.options, cautions: e.cautions,
});
/** As it comes back from a JSON column. */
const throughJson = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

const ABDOMEN: EvaluateInput = {
  templateId: 'abdomen',
  // Values chosen to give normal, high and age-adjusted (CBD) flags; checked against the engine, not published figures.
  measurements: {
    liverLengthCm: 17.5, cholecystectomy: 'no', gbWallMm: 2, cbdMm: 7, portalVeinMm: 11, pancreaticDuctMm: 1.5, spleenLengthCm: 12, spleenWidthCm: 7,
    spleenDepthCm: 4.5, rightKidneyLengthCm: 11, leftKidneyLengthCm: 9.1, aortaDiameterCm: 3.4, aortaConvention: 'outer-to-outer',
  },
  patient: { sex: 'female', birthDate: '1950-01-15', examDate: '2026-12-02' },
};

describe('stored evaluation', () => {
  const cases: [string, EvaluateInput][] = [
    ['echo, a woman with height and weight', { ...fullEchoInput('female') }],
    ['echo, sex not recorded (sex-specific rows not applied)', fullEchoInput('unknown')],
    ['thyroid with four nodules', thyroidInputWithFourNodules()],
    ['abdomen, an older patient (CBD limit adjusted for age)', ABDOMEN],
  ];

  it.each(cases)('%s: reads back exactly what the engine wrote', (_name, input) => {
    const e = run(input);
    expect(e.flags.length).toBeGreaterThan(0);
    if (input.templateId === 'abdomen') expect(e.flags.some((f) => f.adjustment !== null)).toBe(true);
    const back = readEvaluation(throughJson(storedEvaluation(e)), REFERENCE_RANGES);
    expect(back).toEqual(throughJson(asReport(e)));
  });

  it('leaves the citation and the sentence out of flags judged against a row, and keeps flags without a row whole', () => {
    const e = run(fullEchoInput('unknown'));
    const withRow = e.flags.filter((f) => f.referenceId !== null);
    const withoutRow = e.flags.filter((f) => f.referenceId === null);
    expect(withRow.length).toBeGreaterThan(0);
    expect(withoutRow.length).toBeGreaterThan(0);
    const stored = storedEvaluation(e);
    for (const f of stored.flags) {
      if (f.referenceId === null) {
        expect(f.message).toBe(e.flags.find((x) => x.valueCode === f.valueCode)!.message);
      } else {
        expect(f).not.toHaveProperty('message');
        expect(f).not.toHaveProperty('source');
        expect(f).not.toHaveProperty('provenance');
        expect(f).not.toHaveProperty('referenceSetVersion');
        expect(f.range?.text).toBeTruthy();
      }
    }
  });

  it('is much smaller for a full echo set', () => {
    const e = run(fullEchoInput('female'));
    const whole = JSON.stringify(asReport(e)).length;
    const stored = JSON.stringify(storedEvaluation(e)).length;
    expect(stored).toBeLessThan(whole * 0.75);
  });

  it('reads an evaluation stored whole (before flags were stored lean) unchanged', () => {
    const e = throughJson(asReport(run(fullEchoInput('male'))));
    expect(readEvaluation(e, [])).toEqual(e);
  });

  it('takes the citation from the rows of the set it is given', () => {
    const e = run(fullEchoInput('female'));
    const stored = throughJson(storedEvaluation(e));
    const renamed = REFERENCE_RANGES.map((r) => ({ ...r, source: `${r.source} (revised)` }));
    const back = readEvaluation(stored, renamed);
    const flag = back.flags.find((f) => f.referenceId !== null)!;
    expect(flag.source).toMatch(/\(revised\)$/);
    expect(flag.message).toContain('(revised))');
  });
});
