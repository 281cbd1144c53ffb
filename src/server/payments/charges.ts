import Stripe from 'stripe';
import type { Transaction } from 'sequelize';
import { Exam, ExamType, Patient, Payment, Room } from '../../db/models';
import { formatInstant } from '../../lib/time';
import { log } from '../log';
import { queueMail } from '../mail/outbox';
import { receipt } from '../mail/templates';
import { audit } from '../services/audit';
import { examFacts } from '../services/exam-facts';
import { clinicProfile } from '../services/settings';
import { recomputePaymentState } from './ledger';
import { payments, providerUnreachable } from './provider';

/** What the provider said about one charge attempt. */
export type ChargeOutcome =
  | { kind: 'succeeded'; intentId: string }
  | { kind: 'declined'; intentId: string | null; code: string; message: string }
  | { kind: 'requires-action'; intentId: string; clientSecret: string }
  | { kind: 'unknown' };

/**
 * Sends one ledger row to the provider with the row's idempotency key. Sending the same row
 * again (a retry after a time-out) replays the provider's first answer and never charges twice.
 */
export async function sendCharge(row: Payment, exam: Exam): Promise<ChargeOutcome> {
  try {
    const intent = await payments().paymentIntents.create(
      {
        amount: row.amountCents,
        currency: row.currency.toLowerCase(),
        // Confirmed here on the server (test methods, saved cards): no redirect-based methods.
        // Otherwise the provider's card element in the browser confirms it.
        ...(row.paymentMethod
          ? { payment_method: row.paymentMethod, confirm: true, automatic_payment_methods: { enabled: true, allow_redirects: 'never' as const } }
          : { automatic_payment_methods: { enabled: true } }),
        // Identifiers only: the provider never needs the patient's name or the exam's findings.
        description: `${exam.accessionNumber} ${row.kind}`,
        metadata: { exam_id: String(exam.id), payment_id: String(row.id), accession: exam.accessionNumber, kind: row.kind },
      },
      { idempotencyKey: row.idempotencyKey },
    );
    if (intent.status === 'succeeded') return { kind: 'succeeded', intentId: intent.id };
    if (intent.client_secret && (intent.status === 'requires_payment_method' || intent.status === 'requires_action' || intent.status === 'requires_confirmation')) {
      return { kind: 'requires-action', intentId: intent.id, clientSecret: intent.client_secret };
    }
    return { kind: 'unknown' };
  } catch (error) {
    if (error instanceof Stripe.errors.StripeCardError) {
      const e = error as Stripe.errors.StripeCardError & { payment_intent?: { id: string } };
      return { kind: 'declined', intentId: e.payment_intent?.id ?? null, code: e.decline_code ?? e.code ?? 'card_declined', message: e.message };
    }
    // Unreachable, or the same key still being processed by a parallel request: the outcome
    // is not known yet, so the row stays pending and is asked about again.
    if (providerUnreachable(error) || error instanceof Stripe.errors.StripeIdempotencyError || (error as { code?: string }).code === 'idempotency_key_in_use') return { kind: 'unknown' };
    if (error instanceof Stripe.errors.StripeError) {
      log.warn({ paymentId: row.id, type: error.type, code: error.code }, 'payment refused by provider');
      return { kind: 'declined', intentId: null, code: error.code ?? error.type, message: 'The payment service refused the request.' };
    }
    throw error;
  }
}

/**
 * Records a provider outcome on a ledger row (from the API answer, a retry or a webhook), once:
 * a row already settled is left alone. Updates the exam's payment state and, on success,
 * queues the receipt.
 */
export async function settleCharge(row: Payment, outcome: ChargeOutcome, transaction: Transaction, source: string, actorUserId: number | null): Promise<Payment> {
  const fresh = await Payment.findByPk(row.id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!fresh || fresh.status !== 'pending' || outcome.kind === 'unknown') return fresh ?? row;
  const exam = await Exam.findByPk(fresh.examId, { transaction, lock: transaction.LOCK.UPDATE });
  if (outcome.kind === 'requires-action') {
    await fresh.update({ providerIntentId: outcome.intentId, attempts: fresh.attempts + 1 }, { transaction });
    return fresh;
  }
  const ok = outcome.kind === 'succeeded';
  await fresh.update(
    {
      status: ok ? 'succeeded' : 'failed',
      providerIntentId: outcome.intentId ?? fresh.providerIntentId,
      failureCode: ok ? null : outcome.code,
      failureMessage: ok ? null : outcome.message.slice(0, 300),
      attempts: fresh.attempts + 1,
    },
    { transaction },
  );
  await recomputePaymentState(exam!, transaction);
  await audit({ actorUserId, action: ok ? 'payment.succeeded' : 'payment.declined', entityType: 'payment', entityId: fresh.id, detail: { examId: exam!.id, kind: fresh.kind, amountCents: fresh.amountCents, source, ...(ok ? {} : { code: fresh.failureCode }) } }, transaction);
  if (ok) await queueReceipt(fresh, exam!, transaction);
  return fresh;
}

async function queueReceipt(row: Payment, exam: Exam, transaction: Transaction): Promise<void> {
  const patient = await Patient.findByPk(exam.patientId, { transaction });
  if (!patient?.email || row.kind === 'refund') return;
  const [type, room, clinic] = await Promise.all([ExamType.findByPk(exam.examTypeId, { transaction }), Room.findByPk(exam.roomId, { transaction }), clinicProfile(transaction)]);
  const facts = examFacts({ patient, type: type!, room: room!, exam }, clinic.timeZone);
  const mail = receipt(clinic, facts, { kind: row.kind, amountCents: row.amountCents, currency: row.currency, paidAt: formatInstant(new Date(), clinic.timeZone), providerId: row.providerIntentId ?? String(row.id) });
  await queueMail({ kind: 'receipt', to: patient.email, examId: exam.id, dedupeKey: `receipt:${row.id}`, ...mail }, transaction);
}
