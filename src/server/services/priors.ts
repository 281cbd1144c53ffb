import { QueryTypes, type Transaction } from 'sequelize';
import { db } from '../../db/connection';
import { TEMPLATES, type NoduleInput, type PriorExamInput, type TemplateDef } from '../../lib/clinical';
import { compareWithPriors, type ComparedExam, type PriorComparison } from '../../lib/report-compare/compare';
import type { ReportContext, ReportDto, StoredEvaluation } from '../../lib/schemas/reports';
import { zonedDate } from '../../lib/time';

/**
 * The same patient's earlier exams of the same template, for the engine (growth since the
 * latest prior: AAA, thyroid nodules) and for the reading physician's comparison. Only signed
 * reports (final or amended) count as priors: what they say no longer changes, which also makes
 * them safe to keep in memory.
 */

/** How many earlier exams a comparison looks back over (the trend charts' longest series). */
const LOOK_BACK = 8;

type PriorRow = { report_id: number; exam_id: number; scheduled_start: Date; measurements: unknown; nodules: unknown; evaluation: unknown };
const json = <T>(v: unknown): T => (typeof v === 'string' ? JSON.parse(v) : v) as T;

/** Signed reports of the patient's earlier exams of this template, newest first. */
export async function priorExams(x: { reportId: number; timeZone: string; limit?: number }): Promise<ComparedExam[]> {
  const rows = await db().query<PriorRow>(
    `SELECT r2.id AS report_id, e2.id AS exam_id, e2.scheduled_start, r2.measurements, r2.nodules, r2.evaluation
       FROM reports r JOIN exams e ON e.id = r.exam_id
       JOIN exams e2 ON e2.patient_id = e.patient_id AND e2.scheduled_start < e.scheduled_start
       JOIN reports r2 ON r2.exam_id = e2.id AND r2.template_id = r.template_id AND r2.status IN ('final', 'amended')
      WHERE r.id = ?
      ORDER BY e2.scheduled_start DESC LIMIT ?`,
    { replacements: [x.reportId, x.limit ?? LOOK_BACK], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    reportId: r.report_id,
    examId: r.exam_id,
    examDate: zonedDate(new Date(r.scheduled_start), x.timeZone),
    measurements: json<Record<string, number | string>>(r.measurements),
    nodules: json<NoduleInput[]>(r.nodules) ?? [],
    evaluation: json<StoredEvaluation | null>(r.evaluation),
  }));
}

/** Templates whose evaluation reads the latest prior (growth since then), as SQL string literals. */
const READS_PRIOR = Object.values(TEMPLATES)
  .filter((t) => t.readsPrior)
  .map((t) => `'${t.id.replace(/[^a-z0-9-]/g, '')}'`)
  .join(', ');

/**
 * SQL for the id of a report's latest signed prior, as a column of a query over `reports r`
 * joined to `exams e` (so the autosave learns it in the read it already makes); NULL without a
 * lookup for templates whose evaluation does not read a prior.
 */
export const LATEST_PRIOR_ID_SQL = `IF(r.template_id IN (${READS_PRIOR || "''"}), (SELECT r2.id FROM exams e2 JOIN reports r2 ON r2.exam_id = e2.id
    WHERE e2.patient_id = e.patient_id AND e2.scheduled_start < e.scheduled_start AND r2.template_id = r.template_id AND r2.status IN ('final', 'amended')
    ORDER BY e2.scheduled_start DESC LIMIT 1), NULL)`;

const priorInputs = new Map<number, PriorExamInput>();
const PRIOR_CACHE_SIZE = 500;

/** The engine's view of a signed prior report (date, entries, nodules); kept in memory, as a signed report never changes. */
export async function priorInput(priorReportId: number | null, timeZone: string, transaction?: Transaction): Promise<PriorExamInput | null> {
  if (priorReportId === null) return null;
  const hit = priorInputs.get(priorReportId);
  if (hit) return hit;
  const [row] = await db().query<Pick<PriorRow, 'scheduled_start' | 'measurements' | 'nodules'>>(
    `SELECT e.scheduled_start, r.measurements, r.nodules FROM reports r JOIN exams e ON e.id = r.exam_id WHERE r.id = ? AND r.status IN ('final', 'amended')`,
    { replacements: [priorReportId], type: QueryTypes.SELECT, transaction },
  );
  if (!row) return null;
  const input: PriorExamInput = { examDate: zonedDate(new Date(row.scheduled_start), timeZone), measurements: json(row.measurements), nodules: json<NoduleInput[]>(row.nodules) ?? [] };
  if (priorInputs.size >= PRIOR_CACHE_SIZE) priorInputs.delete(priorInputs.keys().next().value!);
  priorInputs.set(priorReportId, input);
  return input;
}

/**
 * A report's signed priors as the report page uses them: the comparison (values beside the
 * current ones, change, nodule growth, trends) and the latest prior for the form's engine.
 */
export async function priorsFor(report: ReportDto, context: Pick<ReportContext, 'examDate'>, template: TemplateDef, timeZone: string): Promise<{ comparison: PriorComparison; latest: PriorExamInput | null }> {
  const priors = (await priorExams({ reportId: report.id, timeZone })).filter((p) => p.examDate < context.examDate);
  const comparison = compareWithPriors({
    template,
    current: { reportId: report.id, examId: report.examId, examDate: context.examDate, measurements: report.measurements, nodules: report.nodules as NoduleInput[], evaluation: report.evaluation },
    priors,
  });
  const newest = priors[0];
  return { comparison, latest: newest ? { examDate: newest.examDate, measurements: newest.measurements, nodules: newest.nodules } : null };
}
