import { db } from '../../db/connection';
import { ExamType, Patient, Room } from '../../db/models';
import { canMoveExam } from '../../lib/exam-status';
import { refundOnCancel } from '../../lib/booking/refunds';
import type { CancelInput } from '../../lib/schemas/exams';
import type { SessionUser } from '../../lib/session-user';
import { ruleBroken } from '../http/errors';
import { queueMail } from '../mail/outbox';
import { cancellation } from '../mail/templates';
import { ledgerTotals, recomputePaymentState } from '../payments/ledger';
import { planRefunds } from '../payments/refunds';
import { paymentsMode } from '../payments/provider';
import { audit } from './audit';
import { afterChange, lockExam } from './booking';
import { examFacts } from './exam-facts';
import { sendPendingRefunds } from './payments';
import { clinicProfile, paymentPolicy } from './settings';

export interface CancelAnswer {
  id: number;
  version: number;
  refundCents: number;
  keptCents: number;
  policy: string;
  refundStatus: 'none' | 'sent' | 'waiting';
}

/**
 * Cancels a booked or arrived exam with a reason, applying the refund policy: the decision,
 * the refund rows and the patient's e-mail are written in one transaction; the refunds are
 * then sent to the provider (and retried by the worker if it cannot be reached).
 */
export async function cancelExam(actor: SessionUser, id: number, input: CancelInput, requestId: string, now = new Date()): Promise<CancelAnswer> {
  const decided = await afterChange(db().transaction(async (transaction) => {
    const exam = await lockExam(id, input.version, transaction);
    if (!canMoveExam(exam.status, 'cancelled')) throw ruleBroken(`An exam that is ${exam.status} cannot be cancelled.`);
    const totals = await ledgerTotals(exam.id, transaction);
    const hoursAhead = (exam.scheduledStart.getTime() - now.getTime()) / 3_600_000;
    const decision = refundOnCancel({ policy: await paymentPolicy(transaction), hoursAhead, depositPaidCents: totals.depositPaidCents, balancePaidCents: totals.balancePaidCents - totals.refundedCents });
    const refunds = decision.refundCents > 0 ? await planRefunds(exam, decision.refundCents, actor.id, transaction) : [];
    const from = exam.status;
    await exam.update({ status: 'cancelled', cancelReason: input.reason, version: exam.version + 1 }, { transaction });
    await recomputePaymentState(exam, transaction);
    await audit(
      { actorUserId: actor.id, action: 'exam.cancel', entityType: 'exam', entityId: exam.id, detail: { from, hoursAhead: Math.round(hoursAhead), refundCents: decision.refundCents, keptCents: decision.keptCents }, requestId },
      transaction,
    );
    const patient = await Patient.findByPk(exam.patientId, { transaction });
    if (patient?.email) {
      const [type, room, clinic] = await Promise.all([ExamType.findByPk(exam.examTypeId, { transaction }), Room.findByPk(exam.roomId, { transaction }), clinicProfile(transaction)]);
      const paidSomething = totals.depositPaidCents + totals.balancePaidCents > 0;
      const mail = cancellation(clinic, examFacts({ patient, type: type!, room: room!, exam }, clinic.timeZone), paidSomething ? { ...decision, currency: exam.currency } : null);
      await queueMail({ kind: 'cancellation', to: patient.email, examId: exam.id, ...mail }, transaction, now);
    }
    return { exam, decision, refunds: refunds.length };
  }));

  let refundStatus: CancelAnswer['refundStatus'] = 'none';
  if (decided.refunds > 0) {
    refundStatus = paymentsMode() !== 'off' && (await sendPendingRefunds(id)) === decided.refunds ? 'sent' : 'waiting';
  }
  return { id, version: decided.exam.version, refundCents: decided.decision.refundCents, keptCents: decided.decision.keptCents, policy: decided.decision.reason, refundStatus };
}
