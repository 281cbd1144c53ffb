import { Op } from 'sequelize';
import { Exam, ExamType, Patient, Room } from '../../db/models';
import type { ExamStatus } from '../../lib/exam-status';
import { freeGaps } from '../../lib/booking/gaps';
import { openSpans } from '../../lib/booking/slots';
import { zonedClock, zonedDayRange } from '../../lib/time';
import { clinicHours } from './settings';

export interface ScheduleBlock {
  id: number;
  start: string;
  end: string;
  label: string;
  time: string;
  status: ExamStatus;
  patientName: string;
  urgent: boolean;
}

export interface ScheduleDay {
  day: string;
  open: Array<{ start: string; end: string }>;
  rooms: Array<{ id: number; name: string; blocks: ScheduleBlock[]; gaps: Array<{ start: string; end: string; label: string }> }>;
}

/** A clinic day with rooms side by side: each room's exams and the free gaps between them. */
export async function daySchedule(day: string, timeZone: string): Promise<ScheduleDay> {
  const { start, end } = zonedDayRange(day, timeZone);
  const open = openSpans(day, await clinicHours(), timeZone);
  const [rooms, exams] = await Promise.all([
    Room.findAll({ where: { active: true }, order: [['name', 'ASC']] }),
    Exam.findAll({
      where: { scheduledStart: { [Op.gte]: start, [Op.lt]: end }, status: { [Op.notIn]: ['cancelled', 'noshow'] } },
      include: [{ model: ExamType, as: 'examType', attributes: ['name'] }, { model: Patient, as: 'patient', attributes: ['familyName', 'givenName'] }],
      order: [['scheduledStart', 'ASC']],
    }),
  ]);
  return {
    day,
    open: open.map((o) => ({ start: o.start.toISOString(), end: o.end.toISOString() })),
    rooms: rooms.map((room) => {
      const mine = (exams as Array<Exam & { examType: ExamType; patient: Patient }>).filter((e) => e.roomId === room.id);
      const gaps = freeGaps(open, mine.map((e) => ({ start: e.scheduledStart, end: e.scheduledEnd })));
      return {
        id: room.id,
        name: room.name,
        blocks: mine.map((e) => ({
          id: e.id,
          start: e.scheduledStart.toISOString(),
          end: e.scheduledEnd.toISOString(),
          label: e.examType.name,
          time: `${zonedClock(e.scheduledStart, timeZone)}–${zonedClock(e.scheduledEnd, timeZone)}`,
          status: e.status,
          patientName: `${e.patient.familyName}, ${e.patient.givenName}`,
          urgent: e.priority === 'urgent',
        })),
        gaps: gaps.map((g) => ({ start: g.start.toISOString(), end: g.end.toISOString(), label: `${zonedClock(g.start, timeZone)}–${zonedClock(g.end, timeZone)}` })),
      };
    }),
  };
}
