import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import type { Priority } from '../../lib/exam-status';

export interface QueueRow {
  reportId: number;
  examId: number;
  accessionNumber: string;
  examType: string;
  patientName: string;
  mrn: string;
  priority: Priority;
  submittedAt: string;
  /** Minutes since the exam was booked (the age of the request). */
  requestAgeMinutes: number;
  waitingMinutes: number;
  abnormalCount: number;
  sonographer: string;
  /** The physician who opened it, if anyone has. */
  readingBy: string | null;
}

/** Preliminary reports waiting for a reading physician: urgent first, then longest waiting. */
export async function readingQueue(now = new Date()): Promise<QueueRow[]> {
  const rows = await db().query<{
    report_id: number; exam_id: number; accession_number: string; exam_type: string; family_name: string; given_name: string; mrn: string;
    priority: Priority; submitted_at: Date; created_at: Date; abnormal_count: number; sonographer: string; reading_by: string | null;
  }>(
    `SELECT r.id AS report_id, e.id AS exam_id, e.accession_number, t.name AS exam_type, p.family_name, p.given_name, p.mrn,
            e.priority, r.submitted_at, e.created_at, r.abnormal_count, u.display_name AS sonographer, c.display_name AS reading_by
       FROM reports r
       JOIN exams e ON e.id = r.exam_id
       JOIN exam_types t ON t.id = e.exam_type_id
       JOIN patients p ON p.id = e.patient_id
       JOIN users u ON u.id = e.sonographer_id
       LEFT JOIN users c ON c.id = r.claimed_by
      WHERE r.status = 'preliminary'
      ORDER BY e.priority = 'urgent' DESC, r.submitted_at ASC
      LIMIT 200`,
    { type: QueryTypes.SELECT },
  );
  const minutes = (d: Date) => Math.max(0, Math.round((now.getTime() - new Date(d).getTime()) / 60_000));
  return rows.map((r) => ({
    reportId: r.report_id,
    examId: r.exam_id,
    accessionNumber: r.accession_number,
    examType: r.exam_type,
    patientName: `${r.family_name}, ${r.given_name}`,
    mrn: r.mrn,
    priority: r.priority,
    submittedAt: new Date(r.submitted_at).toISOString(),
    requestAgeMinutes: minutes(r.created_at),
    waitingMinutes: minutes(r.submitted_at),
    abnormalCount: r.abnormal_count,
    sonographer: r.sonographer,
    readingBy: r.reading_by,
  }));
}
