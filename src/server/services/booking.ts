import { randomUUID } from 'node:crypto';
import { Transaction } from 'sequelize';
import { db } from '../../db/connection';
import { Exam, ExamType, Patient, Referrer, Room } from '../../db/models';
import { canMoveExam } from '../../lib/exam-status';
import { withinOpenHours, type Span } from '../../lib/booking/slots';
import { accessionFrom, uidFromUuid } from '../../lib/identifiers';
import type { BookExamInput, RescheduleInput } from '../../lib/schemas/exams';
import type { SessionUser } from '../../lib/session-user';
import { zonedDate } from '../../lib/time';
import { HttpError, notFound, ruleBroken, stale } from '../http/errors';
import { bookingConfirmation } from '../mail/templates';
import { queueMail } from '../mail/outbox';
import { audit } from './audit';
import { describeClash, lockResources, overlappingExams, type Resources } from './clashes';
import { nextValue } from './sequences';
import { clinicHours, clinicProfile } from './settings';
import { examFacts } from './exam-facts';
import { recomputePaymentState } from '../payments/ledger';
import { examsChanged } from './worklist-cache';

/**
 * Bookings read committed data: after waiting for the resource locks, the overlap check must
 * see the booking that held them (under REPEATABLE READ it would read an older snapshot).
 */
const BOOKING_TX = { isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED };

/** Checks a span and its resources, with the resource rows locked; throws the first problem. */
async function checkSlot(span: Span, res: Resources, transaction: Transaction, now: Date, excludeExamId?: number): Promise<void> {
  const { timeZone } = await clinicProfile(transaction);
  const { room, scanner, sonographer } = await lockResources(res, transaction);
  const fields: Record<string, string> = {};
  if (!room || !room.active) fields.roomId = 'This room is not in use.';
  if (!scanner || !scanner.active) fields.scannerId = 'This scanner is not in use.';
  else if (room && scanner.roomId !== room.id) fields.scannerId = `${scanner.name} is not in ${room.name}.`;
  if (!sonographer || !sonographer.active || sonographer.role !== 'sonographer') fields.sonographerId = 'Choose an active sonographer.';
  if (Object.keys(fields).length) throw ruleBroken('The room, scanner and sonographer do not fit together.', fields);

  if (span.start.getTime() < now.getTime()) throw ruleBroken('The start time has already passed.', { start: 'Choose a time in the future.' });
  if (!withinOpenHours(span, await clinicHours(transaction), timeZone)) {
    throw ruleBroken('The exam would not fit inside the clinic’s opening hours.', { start: 'Choose a time inside opening hours.' });
  }
  const [clash] = await overlappingExams(span, res, transaction, excludeExamId);
  if (clash) {
    const names = { room: room!.name, scanner: scanner!.name, sonographer: sonographer!.displayName };
    throw new HttpError(409, 'CONFLICT', describeClash(clash, res, names, timeZone), { start: 'This time is taken.' });
  }
}

/**
 * Books an exam in one transaction: checks, resource locks, accession number, the deposit
 * owed (for self-pay) and the preparation e-mail to the patient; all or nothing.
 */
export async function bookExam(actor: SessionUser, input: BookExamInput, requestId: string, now = new Date()): Promise<{ id: number; accessionNumber: string; paymentState: string }> {
  return afterChange(db().transaction(BOOKING_TX, async (transaction) => {
    const [patient, type, referrer] = await Promise.all([
      Patient.findByPk(input.patientId, { transaction }),
      ExamType.findByPk(input.examTypeId, { transaction }),
      input.referrerId ? Referrer.findByPk(input.referrerId, { transaction }) : Promise.resolve(null),
    ]);
    const fields: Record<string, string> = {};
    if (!patient) fields.patientId = 'No such patient.';
    if (!type || !type.active) fields.examTypeId = 'Choose an exam type in use.';
    if (input.referrerId && (!referrer || !referrer.active)) fields.referrerId = 'Choose an active referring clinician.';
    if (Object.keys(fields).length) throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', fields);

    const start = new Date(input.start);
    const span = { start, end: new Date(start.getTime() + type!.durationMinutes * 60_000) };
    const res = { roomId: input.roomId, scannerId: input.scannerId, sonographerId: input.sonographerId };
    await checkSlot(span, res, transaction, now);

    const { timeZone } = await clinicProfile(transaction);
    const bookingDay = zonedDate(now, timeZone);
    const accessionNumber = accessionFrom(bookingDay, await nextValue(`accession:${bookingDay}`, transaction));
    const selfPay = input.payer === 'self-pay';
    const depositCents = selfPay ? type!.depositCents : 0;
    const exam = await Exam.create(
      {
        accessionNumber,
        patientId: patient!.id,
        examTypeId: type!.id,
        referrerId: referrer?.id ?? null,
        ...res,
        scheduledStart: span.start,
        scheduledEnd: span.end,
        durationMinutes: type!.durationMinutes,
        priority: input.priority,
        indication: input.indication,
        studyInstanceUid: uidFromUuid(randomUUID()),
        priceCents: type!.selfPayPriceCents,
        currency: type!.currency,
        cancelReason: null,
        payer: input.payer,
        depositCents,
        paymentState: depositCents > 0 ? 'deposit-due' : 'none',
        createdBy: actor.id,
      },
      { transaction },
    );
    await audit({ actorUserId: actor.id, action: 'exam.book', entityType: 'exam', entityId: exam.id, detail: { accessionNumber, examTypeId: type!.id, roomId: res.roomId, start: span.start.toISOString(), payer: input.payer }, requestId }, transaction);
    if (patient!.email) {
      const room = await Room.findByPk(res.roomId, { transaction });
      const clinic = await clinicProfile(transaction);
      const facts = examFacts({ patient: patient!, type: type!, room: room!, exam }, clinic.timeZone);
      await queueMail({ kind: 'booking', to: patient!.email, examId: exam.id, ...bookingConfirmation(clinic, facts) }, transaction, now);
    }
    return { id: exam.id, accessionNumber, paymentState: exam.paymentState };
  }));
}

/** Loads an exam for a change, locked, checking the version the user saw. */
export async function lockExam(id: number, version: number, transaction: Transaction): Promise<Exam> {
  const exam = await Exam.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!exam) throw notFound('The exam');
  if (exam.version !== version) throw stale('exam');
  return exam;
}

/** Moves a booked exam to a new time (and optionally room, scanner, sonographer). */
export async function rescheduleExam(actor: SessionUser, id: number, input: RescheduleInput, requestId: string, now = new Date()): Promise<{ id: number; version: number }> {
  return afterChange(db().transaction(BOOKING_TX, async (transaction) => {
    const exam = await lockExam(id, input.version, transaction);
    if (exam.status !== 'booked') throw ruleBroken(`Only a booked exam can be moved; this one is ${exam.status}.`);
    const start = new Date(input.start);
    const span = { start, end: new Date(start.getTime() + exam.durationMinutes * 60_000) };
    const res = { roomId: input.roomId ?? exam.roomId, scannerId: input.scannerId ?? exam.scannerId, sonographerId: input.sonographerId ?? exam.sonographerId };
    await checkSlot(span, res, transaction, now, exam.id);
    const before = { start: exam.scheduledStart.toISOString(), roomId: exam.roomId, scannerId: exam.scannerId, sonographerId: exam.sonographerId };
    await exam.update({ ...res, scheduledStart: span.start, scheduledEnd: span.end, version: exam.version + 1, reminderQueuedAt: null }, { transaction });
    await audit({ actorUserId: actor.id, action: 'exam.reschedule', entityType: 'exam', entityId: exam.id, detail: { before, after: { start: span.start.toISOString(), ...res } }, requestId }, transaction);
    const patient = await Patient.findByPk(exam.patientId, { transaction });
    if (patient?.email) {
      const [type, room, clinic] = await Promise.all([ExamType.findByPk(exam.examTypeId, { transaction }), Room.findByPk(res.roomId, { transaction }), clinicProfile(transaction)]);
      const facts = examFacts({ patient, type: type!, room: room!, exam }, clinic.timeZone);
      const mail = bookingConfirmation(clinic, facts);
      await queueMail({ kind: 'reschedule', to: patient.email, examId: exam.id, ...mail, subject: `New time: ${mail.subject.replace(/^Your /, 'your ')}` }, transaction, now);
    }
    return { id: exam.id, version: exam.version };
  }));
}

/** Front-desk moves from the list: check-in (arrived) and no-show, after the lifecycle rules. */
export async function moveExamStatus(actor: SessionUser, id: number, to: 'arrived' | 'noshow', version: number, requestId: string): Promise<{ id: number; status: string; version: number }> {
  return afterChange(db().transaction(async (transaction) => {
    const exam = await lockExam(id, version, transaction);
    if (!canMoveExam(exam.status, to)) throw ruleBroken(`An exam that is ${exam.status} cannot be marked ${to === 'arrived' ? 'arrived' : 'as a no-show'}.`);
    const from = exam.status;
    await exam.update({ status: to, version: exam.version + 1, ...(to === 'arrived' ? { arrivedAt: new Date() } : {}) }, { transaction });
    if (to === 'noshow') await recomputePaymentState(exam, transaction);
    await audit({ actorUserId: actor.id, action: to === 'arrived' ? 'exam.check-in' : 'exam.noshow', entityType: 'exam', entityId: exam.id, detail: { from, to }, requestId }, transaction);
    return { id: exam.id, status: exam.status, version: exam.version };
  }));
}

/** Clears cached worklists once a change has committed. */
export async function afterChange<T>(work: Promise<T>): Promise<T> {
  const result = await work;
  examsChanged();
  return result;
}
