import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import { getTemplate } from '../../lib/clinical';
import { HttpError, notFound } from '../http/errors';
import { getReport, reportContext } from '../services/reports';
import { clinicProfile } from '../services/settings';
import { renderReportPdf } from './render';
import { buildReportPdfModel, type ReportPdfInput } from './report-model';

export { buildReportPdfModel, renderReportPdf };
export type { ReportPdfInput, ReportPdfModel } from './report-model';

/** The exam facts the report page does not carry: when it started and who referred, in one read. */
async function examFacts(examId: number): Promise<ReportPdfInput['exam']> {
  const [row] = await db().query<{ scheduled_start: Date; name: string | null; practice: string | null }>(
    'SELECT e.scheduled_start, r.name, r.practice FROM exams e LEFT JOIN referrers r ON r.id = e.referrer_id WHERE e.id = ?',
    { replacements: [examId], type: QueryTypes.SELECT },
  );
  if (!row) throw notFound('The exam');
  return { startsAt: new Date(row.scheduled_start).toISOString(), referrer: row.name ? { name: row.name, practice: row.practice } : null };
}

/**
 * The signed report as a PDF, e.g. `reportPdf(42)` → `{ filename: 'report-A2026-00042.pdf', bytes }`.
 * A report not yet signed has no PDF (409): what a PDF shows must be what a physician signed.
 */
export async function reportPdf(reportId: number): Promise<{ filename: string; bytes: Buffer }> {
  const report = await getReport(reportId);
  if (report.signedAt === null) {
    throw new HttpError(409, 'CONFLICT', `This report is ${report.status}: its PDF is made once a physician signs it.`);
  }
  const template = getTemplate(report.templateId);
  if (!template) throw new HttpError(422, 'RULE', `This report uses a template Crestline no longer knows (${report.templateId}).`);
  const [context, clinic, exam] = await Promise.all([reportContext(report.examId), clinicProfile(), examFacts(report.examId)]);
  const model = buildReportPdfModel({ report, context, template, clinic, timeZone: clinic.timeZone, exam });
  return { filename: `report-${context.accessionNumber}.pdf`, bytes: await renderReportPdf(model) };
}
