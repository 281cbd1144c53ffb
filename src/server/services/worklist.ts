import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import type { ExamStatus, PaymentState, Priority } from '../../lib/exam-status';
import type { WorklistQuery, WorklistRow } from '../../lib/schemas/exams';
import { dayClock, zonedDayRange } from '../../lib/time';

// Sort keys map to fixed SQL (never user text); the start time breaks ties.
const ORDER: Record<WorklistQuery['sort'], string> = {
  time: 'e.scheduled_start',
  patient: 'p.family_name {dir}, p.given_name',
  examType: 't.name',
  room: 'r.name',
  status: 'e.status',
  payment: 'e.payment_state',
};

interface Row {
  id: number;
  accession_number: string;
  scheduled_start: Date;
  duration_minutes: number;
  patient_id: number;
  room_id: number;
  status: ExamStatus;
  priority: Priority;
  payment_state: PaymentState;
  version: number;
  family_name: string;
  given_name: string;
  mrn: string;
  exam_type: string;
  room: string;
  sonographer: string;
  total: number | bigint;
}

/**
 * One page of a clinic day's exams, filtered and sorted in SQL. The day is taken in the clinic's
 * time zone and turned into a UTC range so the (room, start) and start indexes are used; the
 * page and the total come back in one round trip (COUNT(*) OVER ()). The busiest read in the
 * app (every screen polls it), hence plain SQL rather than model instances.
 */
export async function worklist(q: WorklistQuery, timeZone: string): Promise<{ rows: WorklistRow[]; total: number }> {
  const { start, end } = zonedDayRange(q.day, timeZone);
  const where = ['e.scheduled_start >= :start', 'e.scheduled_start < :end'];
  if (q.roomId) where.push('e.room_id = :roomId');
  if (q.sonographerId) where.push('e.sonographer_id = :sonographerId');
  if (q.status) where.push('e.status = :status');
  const dir = q.dir === 'desc' ? 'DESC' : 'ASC';
  const order = `${ORDER[q.sort].replace('{dir}', dir)} ${dir}, e.scheduled_start ASC, e.id ASC`;
  const replacements = { start, end, roomId: q.roomId ?? null, sonographerId: q.sonographerId ?? null, status: q.status ?? null, limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
  const rows = await db().query<Row>(
    `SELECT e.id, e.accession_number, e.scheduled_start, e.duration_minutes, e.patient_id, e.room_id, e.status, e.priority,
            e.payment_state, e.version, p.family_name, p.given_name, p.mrn, t.name AS exam_type, r.name AS room,
            u.display_name AS sonographer, COUNT(*) OVER () AS total
       FROM exams e
       JOIN patients p ON p.id = e.patient_id
       JOIN exam_types t ON t.id = e.exam_type_id
       JOIN rooms r ON r.id = e.room_id
       JOIN users u ON u.id = e.sonographer_id
      WHERE ${where.join(' AND ')}
      ORDER BY ${order}
      LIMIT :limit OFFSET :offset`,
    { replacements, type: QueryTypes.SELECT },
  );
  let total = rows.length ? Number(rows[0]!.total) : 0;
  if (!rows.length && q.page > 1) {
    // Past the last page: the window count came back with no rows, so ask for it alone.
    const [c] = await db().query<{ n: number | bigint }>(`SELECT COUNT(*) AS n FROM exams e WHERE ${where.join(' AND ')}`, { replacements, type: QueryTypes.SELECT });
    total = Number(c?.n ?? 0);
  }
  const clock = dayClock(q.day, timeZone);
  return {
    total,
    rows: rows.map((r) => {
      const startAt = new Date(r.scheduled_start);
      return {
        id: r.id,
        accessionNumber: r.accession_number,
        start: startAt.toISOString(),
        time: clock(startAt),
        durationMinutes: r.duration_minutes,
        patientId: r.patient_id,
        patientName: `${r.family_name}, ${r.given_name}`,
        mrn: r.mrn,
        examType: r.exam_type,
        room: r.room,
        roomId: r.room_id,
        sonographer: r.sonographer,
        status: r.status,
        priority: r.priority,
        paymentState: r.payment_state,
        version: r.version,
      };
    }),
  };
}
