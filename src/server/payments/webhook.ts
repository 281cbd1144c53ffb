import Stripe from 'stripe';
import { UniqueConstraintError } from 'sequelize';
import { db } from '../../db/connection';
import { Payment, PaymentEvent } from '../../db/models';
import { config } from '../config';
import { HttpError } from '../http/errors';
import { settleCharge } from './charges';
import { settleRefund } from './refunds';
import { examsChanged } from '../services/worklist-cache';

/** Verifies a delivery's signature; a bad or stale signature is a 400 and changes nothing. */
export function verifyEvent(rawBody: string, signature: string | null): Stripe.Event {
  const secret = config().STRIPE_WEBHOOK_SECRET;
  if (!secret) throw new HttpError(503, 'DEPENDENCY_DOWN', 'Payment notifications are not set up on this server.');
  if (!signature) throw new HttpError(400, 'BAD_REQUEST', 'Missing payment-service signature.');
  try {
    return Stripe.webhooks.constructEvent(rawBody, signature, secret, 300);
  } catch {
    throw new HttpError(400, 'BAD_REQUEST', 'The payment-service signature does not match.');
  }
}

/** Finds our ledger row for an intent: by provider id, or by the payment id we put in its metadata. */
async function rowForIntent(intent: Stripe.PaymentIntent): Promise<Payment | null> {
  const byIntent = await Payment.findOne({ where: { providerIntentId: intent.id, kind: ['deposit', 'balance'] } });
  if (byIntent) return byIntent;
  const id = Number(intent.metadata?.payment_id);
  return Number.isInteger(id) && id > 0 ? Payment.findByPk(id) : null;
}

/**
 * Applies one verified event, once: the event id is recorded in the same transaction as its
 * effect, so a replayed or duplicated delivery changes nothing.
 */
export async function applyEvent(event: Stripe.Event): Promise<{ outcome: string }> {
  try {
    return await db().transaction(async (transaction) => {
      // Recorded first: a concurrent duplicate waits on the unique key, then finds it taken.
      const record = await PaymentEvent.create({ providerEventId: event.id, type: event.type, outcome: 'processing', receivedAt: new Date() }, { transaction });
      let outcome = 'ignored';
      if (event.type === 'payment_intent.succeeded' || event.type === 'payment_intent.payment_failed') {
        const intent = event.data.object as Stripe.PaymentIntent;
        const row = await rowForIntent(intent);
        if (row) {
          const ok = event.type === 'payment_intent.succeeded';
          const err = intent.last_payment_error;
          const settled = await settleCharge(row, ok ? { kind: 'succeeded', intentId: intent.id } : { kind: 'declined', intentId: intent.id, code: err?.decline_code ?? err?.code ?? 'payment_failed', message: err?.message ?? 'The card was declined.' }, transaction, 'webhook', null);
          outcome = `payment ${settled.status}`;
        } else outcome = 'unknown payment';
      } else if (event.type === 'charge.refunded') {
        const charge = event.data.object as Stripe.Charge;
        const intentId = typeof charge.payment_intent === 'string' ? charge.payment_intent : charge.payment_intent?.id;
        const rows = intentId ? await Payment.findAll({ where: { kind: 'refund', providerIntentId: intentId }, transaction, order: [['id', 'ASC']] }) : [];
        // Settle pending refunds in order while the provider's refunded total covers them.
        let covered = charge.amount_refunded - rows.filter((r) => r.status === 'succeeded').reduce((a, r) => a + r.amountCents, 0);
        for (const r of rows.filter((x) => x.status === 'pending')) {
          if (r.amountCents > covered) break;
          await settleRefund(r, { kind: 'succeeded', refundId: r.providerRefundId ?? `via ${event.id}` }, transaction, 'webhook');
          covered -= r.amountCents;
        }
        outcome = 'refunds checked';
      }
      await record.update({ outcome }, { transaction });
      return { outcome };
    }).finally(examsChanged);
  } catch (error) {
    if (error instanceof UniqueConstraintError) return { outcome: 'duplicate' };
    throw error;
  }
}
