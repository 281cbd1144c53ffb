/**
 * The final report as a PDF, rendered in-process with pdfkit: a full echo report (every echo
 * field, the engine's real evaluation, a physician's findings and impression), built from fixed
 * data so no database is needed. Median and p95 wall time of the render after a warm-up.
 */
import { createHash } from 'node:crypto';
import type { BenchFigure } from '../bench.ts';
import { CLINIC } from '../../seeders/demo-clinic-data.ts';
import { evaluate, getTemplate, REFERENCE_SET_VERSION } from '../../src/lib/clinical/index.ts';
import { findingsToHtml } from '../../src/lib/report-text/findings-html.ts';
import type { ReportContext, ReportDto } from '../../src/lib/schemas/reports.ts';
import { buildReportPdfModel, type ReportPdfInput } from '../../src/server/pdf/report-model.ts';
import { renderReportPdf } from '../../src/server/pdf/render.ts';
import { fullEchoInput } from '../../tests/unit/clinical/helpers.ts';

const WARMUP = 5;
const RUNS = 60;

/** A signed echo report as the loader would hand it over; invented people, the engine's numbers. */
function echoReportInput(): ReportPdfInput {
  const input = fullEchoInput('female');
  const e = evaluate(input);
  if (!e.ok) throw new Error(`bench: echo fixture refused: ${JSON.stringify(e.fieldErrors)}`);
  const template = getTemplate('echo')!;
  const findingsHtml = `<h2>Left heart</h2>${findingsToHtml(e.findings.slice(0, 7).join('\n'))}<h2>Right heart</h2>${findingsToHtml(e.findings.slice(7).join('\n'))}`;
  const impressionHtml =
    '<ol><li><p>Normal LV size with <strong>mildly increased wall thickness</strong> and LV mass index; eccentric pattern by relative wall thickness.</p></li>' +
    '<li><p>Preserved LV systolic function, LVEF 60 % (biplane).</p></li><li><p>Indeterminate diastolic function; mildly elevated TR velocity.</p></li></ol>' +
    '<p>Suggest clinical correlation with blood pressure history.</p>';
  const signedAt = '2025-03-01T16:42:00.000Z';
  const report: ReportDto = {
    id: 9001,
    examId: 4001,
    status: 'final',
    version: 6,
    templateId: 'echo',
    templateVersion: template.version,
    referenceSetVersion: REFERENCE_SET_VERSION,
    measurements: input.measurements as Record<string, number | string>,
    measurementSources: {},
    nodules: [],
    heightCm: input.patient.heightCm ?? null,
    weightKg: input.patient.weightKg ?? null,
    probeId: 31,
    probeKind: 'phased-array',
    evaluation: { derived: e.derived, flags: e.flags, findings: e.findings, assessments: e.assessments, urgentPrompts: e.urgentPrompts, algorithms: e.algorithms, patient: e.patient, options: e.options, cautions: e.cautions },
    findingsText: e.findings.join('\n'),
    abnormalCount: e.flags.filter((f) => f.status === 'low' || f.status === 'high').length,
    updatedAt: signedAt,
    updatedBy: 'Dr Ines Marlowe',
    submittedAt: '2025-03-01T15:55:00.000Z',
    findingsHtml,
    impressionHtml,
    claimedBy: { id: 7, name: 'Dr Ines Marlowe' },
    claimedAt: '2025-03-01T16:20:00.000Z',
    signedBy: 'Dr Ines Marlowe',
    signedAt,
    signedHash: createHash('sha256').update(findingsHtml + impressionHtml + signedAt).digest('hex'),
    // A full report: one urgent communication and one addendum print too.
    communications: [
      { id: 1, ruleId: null, finding: 'Mildly elevated TR velocity', recipientName: 'Dr Wren Castell', recipientRole: 'referring physician', method: 'telephone', communicatedAt: '2025-03-01T16:30:00.000Z', readBack: true, recordedBy: 'Dr Ada Quill', recordedAt: '2025-03-01T16:31:00.000Z' },
    ],
    addenda: [{ id: 1, bodyHtml: '<p>Compared with the outside study of 2024: <strong>no interval change</strong> in LV mass index.</p>', signedBy: 'Dr Ada Quill', signedAt: '2025-03-02T09:10:00.000Z', signedHash: 'cd'.repeat(32) }],
  };
  const context: ReportContext = {
    examId: 4001,
    examVersion: 3,
    examStatus: 'completed',
    accessionNumber: 'A250301-0042',
    examTypeName: 'Echocardiogram, transthoracic',
    indication: 'Exertional dyspnoea for three months; hypertension. Assess LV size, wall thickness and function.',
    patient: { name: 'Hallworth, Bettina', mrn: 'MRN-0048213', sex: 'female', birthDate: input.patient.birthDate, ageYears: e.patient.ageYears },
    examDate: input.patient.examDate,
    when: 'Sat 1 Mar 2025 at 09:30',
    room: 'Room 3 (cardiac)',
    sonographer: 'Priya Castellan',
    probes: [{ id: 31, kind: 'phased-array', label: 'Phased 1–5', frequencyMhz: '1–5 MHz' }],
  };
  return {
    report,
    context,
    template,
    clinic: CLINIC,
    timeZone: CLINIC.timeZone,
    exam: { startsAt: '2025-03-01T15:30:00.000Z', referrer: { name: 'Dr Tomasz Whitcombe', practice: 'Alderbrook Family Practice' } },
  };
}

export async function reportPdfBench(): Promise<BenchFigure[]> {
  const input = echoReportInput();
  // The first render loads and parses the fonts and shapes every word for the first time.
  const coldStart = process.hrtime.bigint();
  let bytes = await renderReportPdf(buildReportPdfModel(input));
  const cold = Number(process.hrtime.bigint() - coldStart) / 1e6;
  for (let i = 1; i < WARMUP; i += 1) bytes = await renderReportPdf(buildReportPdfModel(input));
  const times: number[] = [];
  for (let i = 0; i < RUNS; i += 1) {
    const start = process.hrtime.bigint();
    // Model and render together: what the endpoint does after its reads.
    bytes = await renderReportPdf(buildReportPdfModel(input));
    times.push(Number(process.hrtime.bigint() - start) / 1e6);
  }
  times.sort((a, b) => a - b);
  const at = (q: number) => times[Math.min(times.length - 1, Math.ceil(q * times.length) - 1)]!;
  const mid = times.length / 2;
  const median = times.length % 2 === 0 ? (times[mid - 1]! + times[mid]!) / 2 : times[Math.floor(mid)]!;
  const pages = bytes.toString('latin1').match(/\/Type \/Page\b/g)?.length ?? 0;
  console.log(`  (${RUNS} renders after ${WARMUP} warm-up; ${pages} pages)`);
  return [
    { label: 'first render (cold)', value: cold, unit: 'ms', target: Infinity },
    { label: 'median render', value: median, unit: 'ms', target: 150 },
    { label: 'p95 render', value: at(0.95), unit: 'ms', target: Infinity },
    { label: 'PDF size', value: bytes.length / 1024, unit: 'KB', target: Infinity },
  ];
}
