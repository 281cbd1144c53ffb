import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Exam, Patient, Report } from '../../src/db/models';
import { evaluate, REFERENCE_RANGES, type EvaluateInput } from '../../src/lib/clinical';
import { storedEvaluation } from '../../src/lib/schemas/reports';
import { zonedDate } from '../../src/lib/time';
import { at, book, bookingBody, catalog, testDay, TZ, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';
import { fullEchoInput, thyroidInputWithFourNodules } from '../unit/clinical/helpers';

let c: Catalog;
let patients: Patient[];

beforeAll(async () => {
  testDb();
  c = await catalog();
  patients = await Patient.findAll({ where: { sex: ['female', 'male'] }, order: [['id', 'ASC']], limit: 10 });
});
afterAll(closeTestDb);

const ABDOMEN: Record<string, number | string> = {
  liverLengthCm: 14, cholecystectomy: 'no', gbWallMm: 2, cbdMm: 4, portalVeinMm: 11, pancreaticDuctMm: 1.5,
  spleenLengthCm: 12, spleenWidthCm: 7, spleenDepthCm: 4.5, rightKidneyLengthCm: 10.9, leftKidneyLengthCm: 11.2,
  aortaDiameterCm: 2.0, aortaConvention: 'outer-to-outer',
};

/** Books, checks in and starts an exam; returns the draft report's id and the exam. */
async function startedExam(type: 'thyroid' | 'abdomen-complete' | 'echo-tte', hour: number, patientIndex = 0) {
  const room = type === 'echo-tte' ? 2 : 0;
  const res = await book(bookingBody(c, { patientId: patients[patientIndex]!.id, start: at(testDay(20 + (hour % 3)), hour, 0), roomIndex: room, type, payer: 'insured' }));
  expect(res.status).toBe(201);
  const desk = await sessionFor('frontdesk');
  expect((await call('POST', `/api/exams/${res.body.exam.id}/status`, { cookie: desk, json: { version: 0, to: 'arrived' } })).status).toBe(200);
  const started = await call('POST', `/api/exams/${res.body.exam.id}/start`, { cookie: await sessionFor('sonographer'), json: { version: 1 } });
  expect(started.status).toBe(200);
  return { reportId: started.body.reportId as number, exam: (await Exam.findByPk(res.body.exam.id))! };
}

/** What the engine says for these entries, with the patient factors the server uses. */
async function expected(exam: Exam, input: Pick<EvaluateInput, 'templateId' | 'measurements' | 'nodules'> & { heightCm?: number | null; weightKg?: number | null }) {
  const p = (await Patient.findByPk(exam.patientId))!;
  const r = evaluate({
    templateId: input.templateId,
    measurements: input.measurements,
    nodules: input.nodules,
    patient: { sex: p.sex, birthDate: p.birthDate, examDate: zonedDate(exam.scheduledStart, TZ), heightCm: input.heightCm ?? null, weightKg: input.weightKg ?? null },
    referenceRanges: REFERENCE_RANGES,
  });
  if (!r.ok) throw new Error(JSON.stringify(r.fieldErrors));
  return r;
}

const save = async (reportId: number, body: Record<string, unknown>) => call('PUT', `/api/reports/${reportId}/draft`, { cookie: await sessionFor('sonographer'), json: body });
/** The stored report, as any reader gets it (the autosave answer does not echo the evaluation). */
const storedReport = async (reportId: number) => (await call('GET', `/api/reports/${reportId}`, { cookie: await sessionFor('sonographer') })).body.report;

describe('saving a draft stores exactly what the engine computes', () => {
  it('thyroid with four nodules', async () => {
    const { reportId, exam } = await startedExam('thyroid', 9);
    const input = thyroidInputWithFourNodules();
    const res = await save(reportId, { version: 0, measurements: input.measurements, nodules: input.nodules, heightCm: null, weightKg: null, probeId: null });
    expect(res.status).toBe(200);
    const want = await expected(exam, input);
    const row = (await Report.findByPk(reportId))!;
    const stored = row.evaluation as { derived: unknown; flags: unknown; findings: unknown; assessments: { nodules: unknown } };
    expect(stored.derived).toEqual(JSON.parse(JSON.stringify(want.derived)));
    // Stored without each flag's citation and sentence (StoredFlag)...
    expect(stored.flags).toEqual(JSON.parse(JSON.stringify(storedEvaluation(want).flags)));
    expect(JSON.stringify(stored.flags)).not.toContain('"message"');
    // ...and read back exactly as the engine wrote them.
    expect((await storedReport(reportId)).evaluation.flags).toEqual(JSON.parse(JSON.stringify(want.flags)));
    expect(stored.assessments.nodules).toEqual(JSON.parse(JSON.stringify(want.assessments.nodules)));
    expect(row.findingsText).toBe(want.findings.join('\n'));
    expect(row.templateVersion).toBe(want.templateVersion);
    expect(row.referenceSetVersion).toBe(want.referenceSetVersion);
    expect(row.version).toBe(1);
    // CLINICAL.md §1.1: lobes 6.032 + 4.948 mL (π/6) → total 10.98 mL
    const total = (stored.derived as Array<{ code: string; value: number }>).find((d) => d.code === 'thyroidVolumeMl')!;
    expect(total.value).toBeCloseTo(10.98, 2);
  });

  it('abdomen', async () => {
    const { reportId, exam } = await startedExam('abdomen-complete', 10);
    const res = await save(reportId, { version: 0, measurements: ABDOMEN, nodules: [], heightCm: null, weightKg: null, probeId: null });
    expect(res.status).toBe(200);
    const want = await expected(exam, { templateId: 'abdomen', measurements: ABDOMEN });
    const report = await storedReport(reportId);
    expect(report.version).toBe(res.body.report.version);
    expect(report.evaluation.derived).toEqual(JSON.parse(JSON.stringify(want.derived)));
    expect(report.evaluation.flags).toEqual(JSON.parse(JSON.stringify(want.flags)));
    // CLINICAL.md §1.1: spleen 12 × 7 × 4.5 cm, π/6 → 197.9 mL
    expect(report.evaluation.derived.find((d: { code: string }) => d.code === 'spleenVolumeMl').value).toBeCloseTo(197.92, 1);
  });

  it('echo, with the patient factors taken from the exam', async () => {
    const { reportId, exam } = await startedExam('echo-tte', 11);
    const input = fullEchoInput('male');
    const res = await save(reportId, { version: 0, measurements: input.measurements, nodules: [], heightCm: 170, weightKg: 70, probeId: null });
    expect(res.status).toBe(200);
    const want = await expected(exam, { templateId: 'echo', measurements: input.measurements, heightCm: 170, weightKg: 70 });
    const report = await storedReport(reportId);
    expect(report.measurements).toEqual(input.measurements);
    expect(report.evaluation.derived).toEqual(JSON.parse(JSON.stringify(want.derived)));
    expect(report.evaluation.flags).toEqual(JSON.parse(JSON.stringify(want.flags)));
    // CLINICAL.md §1.3 M1: LV mass 181.976 g whatever the sex; BSA 1.8181 m² (Mosteller)
    expect(report.evaluation.derived.find((d: { code: string }) => d.code === 'lvMassG').value).toBeCloseTo(181.976, 3);
    expect(res.body.report.abnormalCount).toBe(want.flags.filter((f) => f.status === 'low' || f.status === 'high').length);
  });
});

describe('refusals', () => {
  it('refuses a value outside plausible bounds with 400 naming the field, and stores nothing', async () => {
    const { reportId } = await startedExam('thyroid', 13);
    const res = await save(reportId, { version: 0, measurements: { rightLobeLengthCm: 48 }, nodules: [], heightCm: null, weightKg: null, probeId: null });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['measurements.rightLobeLengthCm']).toMatch(/plausible/);
    const row = (await Report.findByPk(reportId))!;
    expect(row.version).toBe(0);
    expect(row.measurements).toEqual({});
  });

  it('refuses a stale save with 409 and returns the newer report', async () => {
    const { reportId } = await startedExam('thyroid', 14);
    const first = await save(reportId, { version: 0, measurements: { rightLobeLengthCm: 4.8 }, nodules: [], heightCm: null, weightKg: null, probeId: null });
    expect(first.status).toBe(200);
    const late = await save(reportId, { version: 0, measurements: { rightLobeLengthCm: 5.1 }, nodules: [], heightCm: null, weightKg: null, probeId: null });
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe('STALE');
    expect(late.body.error.current).toMatchObject({ version: 1, measurements: { rightLobeLengthCm: 4.8 } });
    expect((await Report.findByPk(reportId))!.measurements).toEqual({ rightLobeLengthCm: 4.8 });
  });

  it('refuses a probe from another room', async () => {
    const { reportId } = await startedExam('thyroid', 15);
    const { Probe } = await import('../../src/db/models');
    const foreign = await Probe.findOne({ where: { scannerId: c.rooms[1]!.scannerId } });
    const res = await save(reportId, { version: 0, measurements: {}, nodules: [], heightCm: null, weightKg: null, probeId: foreign!.id });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('probeId');
  });

  it('starts only an arrived exam', async () => {
    const res = await book(bookingBody(c, { patientId: patients[1]!.id, start: at(testDay(23), 9, 0), payer: 'insured' }));
    const early = await call('POST', `/api/exams/${res.body.exam.id}/start`, { cookie: await sessionFor('sonographer'), json: { version: 0 } });
    expect(early.status).toBe(422);
  });
});

describe('submitting the preliminary report', () => {
  it('names the missing required measurements (422), then submits: report preliminary, exam completed, in the reading queue', async () => {
    const { reportId, exam } = await startedExam('thyroid', 16, 2);
    const partial = { rightLobeLengthCm: 4.8, rightLobeWidthCm: 1.6, rightLobeDepthCm: 1.5, leftLobeLengthCm: 4.5 };
    expect((await save(reportId, { version: 0, measurements: partial, nodules: [], heightCm: null, weightKg: null, probeId: null })).status).toBe(200);
    const sono = await sessionFor('sonographer');
    const refused = await call('POST', `/api/reports/${reportId}/submit`, { cookie: sono, json: { version: 1 } });
    expect(refused.status).toBe(422);
    expect(Object.keys(refused.body.error.fields).sort()).toEqual(['measurements.echotexture', 'measurements.isthmusThicknessMm', 'measurements.leftLobeDepthCm', 'measurements.leftLobeWidthCm']);
    expect((await Exam.findByPk(exam.id))!.status).toBe('in-progress');

    const complete = { ...partial, leftLobeWidthCm: 1.5, leftLobeDepthCm: 'not-measurable', isthmusThicknessMm: 3, echotexture: 'homogeneous' };
    expect((await save(reportId, { version: 1, measurements: complete, nodules: [], heightCm: null, weightKg: null, probeId: null })).status).toBe(200);
    const ok = await call('POST', `/api/reports/${reportId}/submit`, { cookie: sono, json: { version: 2 } });
    expect(ok.status).toBe(200);
    expect(ok.body.report).toMatchObject({ status: 'preliminary', version: 3 });
    expect(ok.body.report.findingsText).toMatch(/right lobe/i);
    expect((await Exam.findByPk(exam.id))!.status).toBe('completed');
    // No more edits through the sonographer's draft path.
    expect((await save(reportId, { version: 3, measurements: complete, nodules: [], heightCm: null, weightKg: null, probeId: null })).status).toBe(409);

    const queue = await call('GET', '/reading', { cookie: await sessionFor('radiologist') });
    expect(queue.status).toBe(200);
    expect(queue.body).toContain(exam.accessionNumber);
    const actions = (await AuditEvent.findAll({ where: { entityType: 'report', entityId: String(reportId) }, order: [['id', 'ASC']] })).map((e) => e.action);
    expect(actions).toEqual(['report.save', 'report.save', 'report.preliminary']);
  });
});
