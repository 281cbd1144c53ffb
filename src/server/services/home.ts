import { fn, col, Op, type WhereOptions } from 'sequelize';
import { Exam, ExamType, Patient, Room, Scanner, User } from '../../db/models';
import { EXAM_STATUSES, type ExamStatus } from '../../lib/exam-status';
import type { Role } from '../../lib/roles';
import type { SessionUser } from '../../lib/session-user';
import { zonedClock, zonedDate, zonedDayRange, addDays } from '../../lib/time';

export interface DayExamRow {
  id: number;
  accessionNumber: string;
  time: string;
  patientName: string;
  examType: string;
  room: string;
  sonographer: string;
  status: ExamStatus;
  priority: 'routine' | 'urgent';
}

export interface DaySummary {
  date: string;
  counts: Record<ExamStatus, number>;
  total: number;
  exams: DayExamRow[];
}

/** Which exams of the day a role's home page lists. */
function scopeFor(user: SessionUser): WhereOptions<Exam> {
  if (user.role === 'sonographer') return { sonographerId: user.id };
  if (user.role === 'referrer') return { referrerId: user.referrerId ?? -1 };
  return {};
}

/** Today's exams (clinic time) with counts by status, scoped to what the role should see. */
export async function daySummary(user: SessionUser, timeZone: string, now = new Date()): Promise<DaySummary> {
  const date = zonedDate(now, timeZone);
  const { start, end } = zonedDayRange(date, timeZone);
  const where = { ...scopeFor(user), scheduledStart: { [Op.gte]: start, [Op.lt]: end } };

  const grouped = (await Exam.findAll({
    attributes: ['status', [fn('COUNT', col('id')), 'n']],
    where,
    group: ['status'],
    raw: true,
  })) as unknown as Array<{ status: ExamStatus; n: number | string }>;
  const counts = Object.fromEntries(EXAM_STATUSES.map((s) => [s, 0])) as Record<ExamStatus, number>;
  for (const row of grouped) counts[row.status] = Number(row.n);

  const rows = await Exam.findAll({
    where,
    include: [
      { model: Patient, as: 'patient', attributes: ['familyName', 'givenName'] },
      { model: ExamType, as: 'examType', attributes: ['name'] },
      { model: Room, as: 'room', attributes: ['name'] },
      { model: User, as: 'sonographer', attributes: ['displayName'] },
    ],
    order: [['scheduledStart', 'ASC']],
    limit: 60,
  });
  const exams = rows.map((e) => {
    const r = e as Exam & { patient: Patient; examType: ExamType; room: Room; sonographer: User };
    return {
      id: r.id,
      accessionNumber: r.accessionNumber,
      time: zonedClock(r.scheduledStart, timeZone),
      patientName: `${r.patient.familyName}, ${r.patient.givenName}`,
      examType: r.examType.name,
      room: r.room.name,
      sonographer: r.sonographer.displayName,
      status: r.status,
      priority: r.priority,
    };
  });
  return { date, counts, total: Object.values(counts).reduce((a, b) => a + b, 0), exams };
}

export interface UpcomingForReferrer {
  id: number;
  date: string;
  time: string;
  patientName: string;
  examType: string;
  status: ExamStatus;
}

/** The next two weeks of exams of the patients a referrer sent, status only. */
export async function referrerUpcoming(user: SessionUser, timeZone: string, now = new Date()): Promise<UpcomingForReferrer[]> {
  if (user.referrerId == null) return [];
  const today = zonedDate(now, timeZone);
  const rows = await Exam.findAll({
    where: {
      referrerId: user.referrerId,
      scheduledStart: {
        [Op.gte]: zonedDayRange(addDays(today, -7), timeZone).start,
        [Op.lt]: zonedDayRange(addDays(today, 14), timeZone).end,
      },
    },
    include: [
      { model: Patient, as: 'patient', attributes: ['familyName', 'givenName'] },
      { model: ExamType, as: 'examType', attributes: ['name'] },
    ],
    order: [['scheduledStart', 'ASC']],
    limit: 100,
  });
  return rows.map((e) => {
    const r = e as Exam & { patient: Patient; examType: ExamType };
    return {
      id: r.id,
      date: zonedDate(r.scheduledStart, timeZone),
      time: zonedClock(r.scheduledStart, timeZone),
      patientName: `${r.patient.familyName}, ${r.patient.givenName}`,
      examType: r.examType.name,
      status: r.status,
    };
  });
}

export interface ClinicSummary {
  activeUsersByRole: Record<Role, number>;
  rooms: number;
  scanners: number;
  examTypes: number;
  lockedAccounts: number;
}

/** Head-counts for the manager's home page. */
export async function clinicSummary(now = new Date()): Promise<ClinicSummary> {
  const byRole = (await User.findAll({
    attributes: ['role', [fn('COUNT', col('id')), 'n']],
    where: { active: true },
    group: ['role'],
    raw: true,
  })) as unknown as Array<{ role: Role; n: number | string }>;
  const activeUsersByRole = { admin: 0, frontdesk: 0, sonographer: 0, radiologist: 0, referrer: 0 };
  for (const row of byRole) activeUsersByRole[row.role] = Number(row.n);
  const [rooms, scanners, examTypes, lockedAccounts] = await Promise.all([
    Room.count({ where: { active: true } }),
    Scanner.count({ where: { active: true } }),
    ExamType.count({ where: { active: true } }),
    User.count({ where: { lockedUntil: { [Op.gt]: now } } }),
  ]);
  return { activeUsersByRole, rooms, scanners, examTypes, lockedAccounts };
}
