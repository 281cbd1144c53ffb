import { ExamType } from '../../db/models';
import { freeSlots } from '../../lib/booking/slots';
import type { SlotsQuery } from '../../lib/schemas/exams';
import { addDays, zonedClock, zonedDate, zonedDayRange } from '../../lib/time';
import { HttpError } from '../http/errors';
import { overlappingExams } from './clashes';
import { clinicHours, clinicProfile } from './settings';

export interface SlotSuggestion {
  start: string;
  day: string;
  time: string;
}

const SEARCH_DAYS = 14;

/** The next free starts for an exam type with this room, scanner and sonographer. */
export async function suggestSlots(q: SlotsQuery, now = new Date()): Promise<SlotSuggestion[]> {
  const type = await ExamType.findByPk(q.examTypeId);
  if (!type) throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', { examTypeId: 'No such exam type.' });
  const [{ timeZone }, hours] = await Promise.all([clinicProfile(), clinicHours()]);
  const today = zonedDate(now, timeZone);
  const fromDay = q.from && q.from > today ? q.from : today;
  const span = { start: zonedDayRange(fromDay, timeZone).start, end: zonedDayRange(addDays(fromDay, SEARCH_DAYS), timeZone).end };
  const busy = (await overlappingExams(span, q, undefined, q.excludeExamId)).map((e) => ({ start: e.scheduledStart, end: e.scheduledEnd }));
  return freeSlots({ fromDay, days: SEARCH_DAYS, hours, timeZone, durationMinutes: type.durationMinutes, busy, now, limit: 12 }).map((start) => ({
    start: start.toISOString(),
    day: zonedDate(start, timeZone),
    time: zonedClock(start, timeZone),
  }));
}
