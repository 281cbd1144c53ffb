import Stripe from 'stripe';
import type { Transaction } from 'sequelize';
import { randomUUID } from 'node:crypto';
import { Exam, Payment } from '../../db/models';
import { log } from '../log';
import { audit } from '../services/audit';
import { recomputePaymentState } from './ledger';
import { payments, providerUnreachable } from './provider';

/**
 * Writes the refund rows for `refundCents`, taken from the exam's succeeded payments (the
 * balance first, then the deposit), one row per original payment. Sent to the provider later.
 */
export async function planRefunds(exam: Exam, refundCents: number, actorUserId: number | null, transaction: Transaction): Promise<Payment[]> {
  const paid = await Payment.findAll({ where: { examId: exam.id, status: 'succeeded' }, transaction, order: [['id', 'ASC']] });
  const refunds = paid.filter((p) => p.kind === 'refund');
  const refundedOf = (id: number) => refunds.filter((r) => r.refundOfId === id).reduce((a, r) => a + r.amountCents, 0);
  const sources = paid.filter((p) => p.kind !== 'refund').sort((a, b) => (a.kind === 'balance' ? -1 : 1) - (b.kind === 'balance' ? -1 : 1));
  const planned: Payment[] = [];
  let left = refundCents;
  for (const source of sources) {
    const room = source.amountCents - refundedOf(source.id);
    const amount = Math.min(room, left);
    if (amount <= 0) continue;
    planned.push(
      await Payment.create(
        { examId: exam.id, kind: 'refund', amountCents: amount, currency: source.currency, idempotencyKey: randomUUID(), paymentMethod: null, providerIntentId: source.providerIntentId, providerRefundId: null, refundOfId: source.id, failureCode: null, failureMessage: null, createdBy: actorUserId },
        { transaction },
      ),
    );
    left -= amount;
  }
  return planned;
}

export type RefundOutcome = { kind: 'succeeded'; refundId: string } | { kind: 'pending'; refundId: string } | { kind: 'failed'; code: string; message: string } | { kind: 'unknown' };

/** Sends one refund row with its idempotency key (safe to repeat). */
export async function sendRefund(row: Payment): Promise<RefundOutcome> {
  try {
    const refund = await payments().refunds.create(
      { payment_intent: row.providerIntentId!, amount: row.amountCents, metadata: { exam_id: String(row.examId), payment_id: String(row.id) } },
      { idempotencyKey: row.idempotencyKey },
    );
    if (refund.status === 'succeeded') return { kind: 'succeeded', refundId: refund.id };
    if (refund.status === 'failed' || refund.status === 'canceled') return { kind: 'failed', code: refund.failure_reason ?? refund.status, message: 'The refund was refused by the payment service.' };
    return { kind: 'pending', refundId: refund.id };
  } catch (error) {
    if (providerUnreachable(error) || error instanceof Stripe.errors.StripeIdempotencyError || (error as { code?: string }).code === 'idempotency_key_in_use') return { kind: 'unknown' };
    if (error instanceof Stripe.errors.StripeError) {
      log.warn({ paymentId: row.id, type: error.type, code: error.code }, 'refund refused by provider');
      return { kind: 'failed', code: error.code ?? error.type, message: 'The payment service refused the refund.' };
    }
    throw error;
  }
}

/** Records a refund outcome once (from the API answer, a retry, or a webhook). */
export async function settleRefund(row: Payment, outcome: RefundOutcome, transaction: Transaction, source: string): Promise<void> {
  const fresh = await Payment.findByPk(row.id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!fresh || fresh.status !== 'pending' || outcome.kind === 'unknown') return;
  if (outcome.kind === 'pending') {
    await fresh.update({ providerRefundId: outcome.refundId, attempts: fresh.attempts + 1 }, { transaction });
    return;
  }
  const ok = outcome.kind === 'succeeded';
  await fresh.update(
    outcome.kind === 'succeeded'
      ? { status: 'succeeded', providerRefundId: outcome.refundId, failureCode: null, failureMessage: null, attempts: fresh.attempts + 1 }
      : { status: 'failed', failureCode: outcome.code, failureMessage: outcome.message, attempts: fresh.attempts + 1 },
    { transaction },
  );
  const exam = await Exam.findByPk(fresh.examId, { transaction, lock: transaction.LOCK.UPDATE });
  await recomputePaymentState(exam!, transaction);
  await audit({ actorUserId: null, action: ok ? 'payment.refunded' : 'payment.refund-failed', entityType: 'payment', entityId: fresh.id, detail: { examId: fresh.examId, amountCents: fresh.amountCents, source } }, transaction);
}
