import { randomUUID } from 'node:crypto';
import { Op } from 'sequelize';
import { db } from '../../db/connection';
import { Exam, Payment } from '../../db/models';
import type { TakePaymentInput } from '../../lib/schemas/exams';
import type { SessionUser } from '../../lib/session-user';
import { conflict, HttpError, notFound, ruleBroken } from '../http/errors';
import { sendCharge, settleCharge, type ChargeOutcome } from '../payments/charges';
import { ledgerTotals } from '../payments/ledger';
import { PAYMENTS_DOWN_MESSAGE, paymentsMode } from '../payments/provider';
import { sendRefund, settleRefund } from '../payments/refunds';
import { audit } from './audit';
import { examsChanged } from './worklist-cache';
import { refundOnCancel } from '../../lib/booking/refunds';
import { paymentPolicy } from './settings';

export interface LedgerRow {
  id: number;
  kind: 'deposit' | 'balance' | 'refund';
  amountCents: number;
  currency: string;
  status: 'pending' | 'succeeded' | 'failed' | 'canceled';
  at: string;
  providerId: string | null;
  failure: string | null;
}

/** Every movement of an exam's money, oldest first. */
export async function examLedger(examId: number): Promise<LedgerRow[]> {
  const rows = await Payment.findAll({ where: { examId }, order: [['id', 'ASC']] });
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    amountCents: r.amountCents,
    currency: r.currency,
    status: r.status,
    at: r.createdAt.toISOString(),
    providerId: r.kind === 'refund' ? r.providerRefundId : r.providerIntentId,
    failure: r.failureMessage,
  }));
}

/** What is owed now for a deposit or the balance. */
function amountDue(exam: Exam, kind: 'deposit' | 'balance', t: Awaited<ReturnType<typeof ledgerTotals>>): number {
  if (kind === 'deposit') return Math.max(0, exam.depositCents - t.depositPaidCents);
  return Math.max(0, exam.priceCents - (t.depositPaidCents + t.balancePaidCents - t.refundedCents));
}

export interface PaymentAnswer {
  outcome: 'succeeded' | 'declined' | 'pending' | 'requires-action';
  message: string;
  paymentId: number;
  paymentState: string;
  clientSecret?: string;
}

/**
 * Takes a deposit or the balance: writes the ledger row (one transaction), asks the provider
 * with the row's idempotency key, then records the answer (a second transaction). A decline
 * leaves the exam booked with the amount still due; a provider that cannot be reached leaves
 * the row pending for the worker to confirm.
 */
export async function takePayment(actor: SessionUser, examId: number, input: TakePaymentInput, requestId: string): Promise<PaymentAnswer> {
  const mode = paymentsMode();
  if (mode === 'off') throw new HttpError(503, 'DEPENDENCY_DOWN', 'Card payments are not set up on this server. Nothing was charged.');
  if (mode === 'test' && !input.paymentMethod) throw new HttpError(400, 'VALIDATION', 'Choose a payment method.', { paymentMethod: 'Choose a payment method.' });

  const { row, exam } = await db().transaction(async (transaction) => {
    const exam = await Exam.findByPk(examId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!exam) throw notFound('The exam');
    if (exam.payer !== 'self-pay') throw ruleBroken('This exam is billed to an insurer; no card payment is taken here.');
    const allowed = input.kind === 'deposit' ? ['booked', 'arrived'] : ['arrived', 'in-progress', 'completed'];
    if (!allowed.includes(exam.status)) {
      throw ruleBroken(input.kind === 'deposit' ? `A deposit is taken before the exam; this one is ${exam.status}.` : `The balance is taken once the patient has arrived; this exam is ${exam.status}.`);
    }
    const due = amountDue(exam, input.kind, await ledgerTotals(exam.id, transaction));
    if (due <= 0) throw ruleBroken(input.kind === 'deposit' ? 'The deposit is already paid.' : 'Nothing is left to pay.');
    const pending = await Payment.findOne({ where: { examId, kind: input.kind, status: 'pending' }, transaction });
    if (pending) {
      // The same request again (a double click, a time-out) resumes the same attempt and key.
      if (pending.paymentMethod === (input.paymentMethod ?? null) && pending.amountCents === due) return { row: pending, exam };
      throw conflict('A payment for this exam is still being confirmed. Wait a moment, then reload.');
    }
    const row = await Payment.create(
      { examId, kind: input.kind, amountCents: due, currency: exam.currency, idempotencyKey: randomUUID(), paymentMethod: input.paymentMethod ?? null, providerIntentId: null, providerRefundId: null, refundOfId: null, failureCode: null, failureMessage: null, createdBy: actor.id },
      { transaction },
    );
    await audit({ actorUserId: actor.id, action: 'payment.attempt', entityType: 'payment', entityId: row.id, detail: { examId, kind: input.kind, amountCents: due }, requestId }, transaction);
    return { row, exam };
  });

  const outcome: ChargeOutcome = await sendCharge(row, exam);
  const settled = await db().transaction((transaction) => settleCharge(row, outcome, transaction, 'api', actor.id));
  examsChanged();
  const state = (await Exam.findByPk(examId, { attributes: ['paymentState'] }))!.paymentState;
  switch (outcome.kind) {
    case 'succeeded':
      return { outcome: 'succeeded', message: 'Payment received.', paymentId: settled.id, paymentState: state };
    case 'declined':
      return { outcome: 'declined', message: `The card was declined: ${outcome.message} The exam stays booked and the amount is still due.`, paymentId: settled.id, paymentState: state };
    case 'requires-action':
      return { outcome: 'requires-action', message: 'Enter the card in the payment form.', paymentId: settled.id, paymentState: state, clientSecret: outcome.clientSecret };
    default:
      throw new HttpError(503, 'DEPENDENCY_DOWN', PAYMENTS_DOWN_MESSAGE);
  }
}

/** Sends refund rows that are waiting (after a cancellation, or a provider outage). */
export async function sendPendingRefunds(examId?: number): Promise<number> {
  const rows = await Payment.findAll({ where: { kind: 'refund', status: 'pending', ...(examId ? { examId } : {}) }, order: [['id', 'ASC']], limit: 50 });
  let done = 0;
  for (const row of rows) {
    const outcome = await sendRefund(row);
    await db().transaction((transaction) => settleRefund(row, outcome, transaction, examId ? 'api' : 'worker'));
    examsChanged();
    if (outcome.kind === 'succeeded' || outcome.kind === 'failed') done += 1;
  }
  return done;
}

/** Re-asks the provider about charges left pending by an outage (same key: never a second charge). */
export async function confirmPendingCharges(olderThanMs = 60_000, now = new Date()): Promise<number> {
  const rows = await Payment.findAll({
    where: { kind: { [Op.in]: ['deposit', 'balance'] }, status: 'pending', paymentMethod: { [Op.ne]: null }, updatedAt: { [Op.lt]: new Date(now.getTime() - olderThanMs) } },
    limit: 50,
  });
  let done = 0;
  for (const row of rows) {
    const exam = await Exam.findByPk(row.examId);
    const outcome = await sendCharge(row, exam!);
    await db().transaction((transaction) => settleCharge(row, outcome, transaction, 'worker', null));
    if (outcome.kind !== 'unknown') done += 1;
  }
  return done;
}

export interface ExamMoney {
  depositDueCents: number;
  balanceDueCents: number;
  pendingRefunds: boolean;
  /** What cancelling now would do with money already paid (null when nothing was paid). */
  cancelPreview: { refundCents: number; keptCents: number; reason: string; currency: string } | null;
}

/** What the exam page needs to offer payments and explain a cancellation. */
export async function examMoney(examId: number, now = new Date()): Promise<ExamMoney> {
  const exam = await Exam.findByPk(examId);
  if (!exam) throw notFound('The exam');
  const t = await ledgerTotals(examId);
  const paid = t.depositPaidCents + t.balancePaidCents - t.refundedCents;
  const decision = refundOnCancel({ policy: await paymentPolicy(), hoursAhead: (exam.scheduledStart.getTime() - now.getTime()) / 3_600_000, depositPaidCents: t.depositPaidCents, balancePaidCents: t.balancePaidCents - t.refundedCents });
  return {
    depositDueCents: exam.payer === 'self-pay' ? amountDue(exam, 'deposit', t) : 0,
    balanceDueCents: exam.payer === 'self-pay' ? amountDue(exam, 'balance', t) : 0,
    pendingRefunds: t.refundPendingCents > 0,
    cancelPreview: paid > 0 ? { ...decision, currency: exam.currency } : null,
  };
}
