import { Op } from 'sequelize';
import { db } from '../../db/connection';
import { Exam, ExamType, Patient, Room } from '../../db/models';
import { addDays, zonedDate, zonedDayRange } from '../../lib/time';
import { queueMail } from '../mail/outbox';
import { reminder } from '../mail/templates';
import { examFacts } from '../services/exam-facts';
import { clinicProfile } from '../services/settings';

/**
 * Queues the day-before reminder for tomorrow's booked exams (clinic time), once per exam
 * (a dedupe key per exam and time, so a rescheduled exam gets a new reminder).
 */
export async function queueReminders(now = new Date()): Promise<number> {
  const clinic = await clinicProfile();
  const tomorrow = addDays(zonedDate(now, clinic.timeZone), 1);
  const { start, end } = zonedDayRange(tomorrow, clinic.timeZone);
  const exams = await Exam.findAll({
    where: { status: 'booked', scheduledStart: { [Op.gte]: start, [Op.lt]: end }, reminderQueuedAt: null },
    include: [{ model: Patient, as: 'patient' }, { model: ExamType, as: 'examType' }, { model: Room, as: 'room' }],
    limit: 500,
  });
  let queued = 0;
  for (const e of exams as Array<Exam & { patient: Patient; examType: ExamType; room: Room }>) {
    await db().transaction(async (transaction) => {
      if (e.patient.email) {
        const mail = reminder(clinic, examFacts({ patient: e.patient, type: e.examType, room: e.room, exam: e }, clinic.timeZone));
        if (await queueMail({ kind: 'reminder', to: e.patient.email, examId: e.id, dedupeKey: `reminder:${e.id}:${e.scheduledStart.toISOString()}`, ...mail }, transaction, now)) queued += 1;
      }
      await Exam.update({ reminderQueuedAt: now }, { where: { id: e.id }, transaction });
    });
  }
  return queued;
}
