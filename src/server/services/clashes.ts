import { Op, type Transaction } from 'sequelize';
import { Exam, ExamType, Room, Scanner, User } from '../../db/models';
import type { Span } from '../../lib/booking/slots';
import { zonedClock } from '../../lib/time';

/** Exams in these states hold their room, scanner and sonographer. */
export const HOLDING_STATUSES = ['booked', 'arrived', 'in-progress', 'completed'] as const;
/** Longest exam the catalog allows; bounds the index range scanned for overlaps. */
export const MAX_EXAM_MINUTES = 240;

export interface Resources {
  roomId: number;
  scannerId: number;
  sonographerId: number;
}

/** Exams that hold any of the resources during the span (the exam being moved excluded). */
export async function overlappingExams(span: Span, res: Resources, transaction?: Transaction, excludeExamId?: number) {
  return Exam.findAll({
    where: {
      status: { [Op.in]: [...HOLDING_STATUSES] },
      scheduledStart: { [Op.lt]: span.end, [Op.gt]: new Date(span.start.getTime() - MAX_EXAM_MINUTES * 60_000) },
      scheduledEnd: { [Op.gt]: span.start },
      [Op.or]: [{ roomId: res.roomId }, { scannerId: res.scannerId }, { sonographerId: res.sonographerId }],
      ...(excludeExamId ? { id: { [Op.ne]: excludeExamId } } : {}),
    },
    include: [{ model: ExamType, as: 'examType', attributes: ['name'] }],
    order: [['scheduledStart', 'ASC']],
    transaction,
  });
}

/**
 * Locks the room, scanner and sonographer rows, always in that order, so that two bookings
 * touching any of the same resources queue behind each other instead of both seeing a free slot.
 */
export async function lockResources(res: Resources, transaction: Transaction) {
  const room = await Room.findByPk(res.roomId, { transaction, lock: transaction.LOCK.UPDATE });
  const scanner = await Scanner.findByPk(res.scannerId, { transaction, lock: transaction.LOCK.UPDATE });
  const sonographer = await User.findByPk(res.sonographerId, { transaction, lock: transaction.LOCK.UPDATE });
  return { room, scanner, sonographer };
}

/** A sentence naming what is taken, e.g. "Room 2 is already booked 09:00–09:45 (Abdomen, complete)." */
export function describeClash(
  clash: Exam & { examType?: ExamType },
  res: Resources,
  names: { room: string; scanner: string; sonographer: string },
  timeZone: string,
): string {
  const what = clash.roomId === res.roomId ? names.room : clash.scannerId === res.scannerId ? names.scanner : names.sonographer;
  const when = `${zonedClock(clash.scheduledStart, timeZone)}–${zonedClock(clash.scheduledEnd, timeZone)}`;
  return `${what} is already booked ${when}${clash.examType ? ` (${clash.examType.name}, ${clash.accessionNumber})` : ''}. Choose another time or resource.`;
}
