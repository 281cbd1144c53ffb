import { db } from '../../db/connection';
import { Exam, Patient, ProcedureStep } from '../../db/models';
import { EXAM_STATUS_LABELS, type ExamStatus } from '../../lib/exam-status';
import { beginScan } from '../services/reports';
import { audit } from '../services/audit';
import { matchToExam } from './matching';

/**
 * Modality Performed Procedure Step (PS3.4 annex F): the scanner says a step is in progress
 * (N-CREATE), then completed or discontinued (N-SET). Crestline moves the exam with it:
 * in progress → the exam is being scanned (checked in first if the desk had not yet); completed
 * → recorded, the exam stays open until the sonographer submits the preliminary report;
 * discontinued → the exam goes back to arrived, the reason in the audit log.
 */

export type StepRefusal = 'invalid' | 'duplicate' | 'unknown-step' | 'refused';
export type StepAnswer = { ok: true; examId: number } | { ok: false; refusal: StepRefusal; comment: string };

export interface StepStart {
  sopInstanceUid: string;
  scannerAe: string;
  patientId: string;
  accessionNumber: string;
  studyInstanceUid: string;
  startedAt: Date | null;
}

export interface StepChange {
  sopInstanceUid: string;
  scannerAe: string;
  /** Performed Procedure Step Status (0040,0252) as sent, trimmed; empty when the N-SET leaves it. */
  status: string;
  endedAt: Date | null;
  /** Discontinuation reason's code meaning, if the scanner sent one. */
  reason: string | null;
}

const refuse = (refusal: StepRefusal, comment: string): StepAnswer => ({ ok: false, refusal, comment });

/** N-CREATE with status IN PROGRESS. */
export async function stepStarted(step: StepStart, associationId: string): Promise<StepAnswer> {
  if (!step.accessionNumber && !step.studyInstanceUid) return refuse('invalid', 'The step names no accession number or Study Instance UID of a scheduled exam.');
  return db().transaction(async (transaction) => {
    if (await ProcedureStep.findOne({ where: { sopInstanceUid: step.sopInstanceUid }, transaction })) return refuse('duplicate', 'This procedure step exists already.');
    const where = step.accessionNumber ? { accessionNumber: step.accessionNumber } : { studyInstanceUid: step.studyInstanceUid };
    const exam = (await Exam.findOne({ where, transaction, lock: transaction.LOCK.UPDATE, include: [{ model: Patient, as: 'patient', attributes: ['mrn'] }] })) as (Exam & { patient: Patient }) | null;
    if (!exam) return refuse('invalid', `No exam is scheduled with accession number ${step.accessionNumber || '(none)'}.`);
    const identity = matchToExam(step, { mrn: exam.patient.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid });
    if (!identity.ok) return refuse('invalid', `The step is for patient ID ${step.patientId || '(none)'}; exam ${exam.accessionNumber} is for ${exam.patient.mrn}.`);
    const via = { via: 'scanner', scannerAe: step.scannerAe, step: step.sopInstanceUid };
    if (exam.status === 'booked') {
      await exam.update({ status: 'arrived', arrivedAt: new Date(), version: exam.version + 1 }, { transaction });
      await audit({ actorUserId: null, action: 'exam.check-in', entityType: 'exam', entityId: exam.id, detail: { from: 'booked', to: 'arrived', ...via }, requestId: associationId }, transaction);
    }
    if (exam.status === 'arrived') {
      const report = await beginScan(exam, null, transaction);
      await audit({ actorUserId: null, action: 'exam.start', entityType: 'exam', entityId: exam.id, detail: { from: 'arrived', to: 'in-progress', reportId: report.id, ...via }, requestId: associationId }, transaction);
    } else if (exam.status !== 'in-progress') {
      return refuse('refused', `Exam ${exam.accessionNumber} is ${EXAM_STATUS_LABELS[exam.status as ExamStatus].toLowerCase()}; it cannot be started.`);
    }
    await ProcedureStep.create({ sopInstanceUid: step.sopInstanceUid, examId: exam.id, scannerAe: step.scannerAe, status: 'in-progress', startedAt: step.startedAt ?? new Date() }, { transaction });
    return { ok: true, examId: exam.id };
  });
}

/** N-SET: COMPLETED or DISCONTINUED end the step; anything else only updates attributes we do not keep. */
export async function stepChanged(change: StepChange, associationId: string): Promise<StepAnswer> {
  return db().transaction(async (transaction) => {
    const step = await ProcedureStep.findOne({ where: { sopInstanceUid: change.sopInstanceUid }, transaction, lock: transaction.LOCK.UPDATE });
    if (!step) return refuse('unknown-step', 'No such procedure step.');
    if (step.status !== 'in-progress') return refuse('refused', `This procedure step is already ${step.status}; it can no longer be changed.`);
    const status = change.status.toUpperCase();
    if (status === '' || status === 'IN PROGRESS') return { ok: true, examId: step.examId };
    if (status !== 'COMPLETED' && status !== 'DISCONTINUED') return refuse('invalid', `Unknown procedure step status "${change.status.slice(0, 20)}".`);
    const exam = await Exam.findByPk(step.examId, { transaction, lock: transaction.LOCK.UPDATE });
    const endedAt = change.endedAt ?? new Date();
    const via = { via: 'scanner', scannerAe: change.scannerAe, step: step.sopInstanceUid };
    if (status === 'COMPLETED') {
      await step.update({ status: 'completed', endedAt }, { transaction });
      await audit({ actorUserId: null, action: 'exam.step-complete', entityType: 'exam', entityId: step.examId, detail: via, requestId: associationId }, transaction);
      return { ok: true, examId: step.examId };
    }
    const reason = (change.reason ?? 'No reason given by the scanner').slice(0, 200);
    await step.update({ status: 'discontinued', endedAt, discontinuedReason: reason }, { transaction });
    const backToArrived = exam?.status === 'in-progress';
    if (backToArrived) await exam!.update({ status: 'arrived', version: exam!.version + 1 }, { transaction });
    await audit(
      { actorUserId: null, action: 'exam.discontinue', entityType: 'exam', entityId: step.examId, detail: { ...via, reason, ...(backToArrived ? { from: 'in-progress', to: 'arrived' } : { status: exam?.status }) }, requestId: associationId },
      transaction,
    );
    return { ok: true, examId: step.examId };
  });
}
