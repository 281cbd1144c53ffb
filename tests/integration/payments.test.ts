import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Exam, Patient, Payment, PaymentEvent, User } from '../../src/db/models';
import { sendCharge } from '../../src/server/payments/charges';
import { cancelExam } from '../../src/server/services/cancellation';
import type { SessionUser } from '../../src/lib/session-user';
import { at, book, bookingBody, catalog, testDay, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { testEnv } from '../helpers/env';
import { call, sessionFor } from '../helpers/http';
import { DEMO_LOGIN } from '../helpers/demo';

let c: Catalog;
let patientId: number;
let desk: SessionUser;
const fake = () => process.env.STRIPE_API_BASE!;
const fakeAuth = { Authorization: `Bearer ${process.env.STRIPE_SECRET_KEY}` };

/** Events the payments stand-in has sent that concern one of our payment intents. */
async function fakeEventsFor(intentId: string): Promise<Array<{ id: string; type: string }>> {
  const res = await fetch(`${fake()}/_fake/events`, { headers: fakeAuth });
  const body = (await res.json()) as { data: Array<{ id: string; type: string; data: { object: { id: string; payment_intent?: string } } }> };
  return body.data.filter((e) => e.data.object.id === intentId || e.data.object.payment_intent === intentId);
}

/** Waits until the stand-in's webhook has reached the app (it is delivered after the API answer). */
async function until(check: () => Promise<boolean>, ms = 8_000): Promise<void> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error('timed out waiting');
}

async function bookSelfPay(dayIndex: number, hour: number) {
  const res = await book(bookingBody(c, { patientId, start: at(testDay(dayIndex), hour, 0) }));
  expect(res.status).toBe(201);
  return res.body.exam as { id: number; accessionNumber: string };
}

const pay = async (examId: number, paymentMethod: string, kind = 'deposit') =>
  call('POST', `/api/exams/${examId}/payments`, { cookie: await sessionFor('frontdesk'), json: { kind, paymentMethod } });

beforeAll(async () => {
  testDb();
  c = await catalog();
  patientId = (await Patient.findOne({ order: [['id', 'DESC']] }))!.id;
  const u = await User.findOne({ where: { email: DEMO_LOGIN.frontdesk } });
  desk = { id: u!.id, email: u!.email, displayName: u!.displayName, role: 'frontdesk', referrerId: null };
});
afterAll(closeTestDb);

describe('deposits through the Stripe SDK and the local payments stand-in', () => {
  it('takes a deposit with the success test method and records it once the webhook arrives', async () => {
    const exam = await bookSelfPay(10, 9);
    const res = await pay(exam.id, 'pm_card_visa');
    expect(res.status).toBe(200);
    expect(res.body.payment).toMatchObject({ outcome: 'succeeded', paymentState: 'deposit-paid' });
    const row = (await Payment.findOne({ where: { examId: exam.id, kind: 'deposit' } }))!;
    expect(row).toMatchObject({ status: 'succeeded', amountCents: c.types['abdomen-complete']!.depositCents, currency: 'USD' });
    expect(row.providerIntentId).toMatch(/^pi_/);
    await until(async () => (await PaymentEvent.count({ where: { type: 'payment_intent.succeeded' } })) > 0 && (await fakeEventsFor(row.providerIntentId!)).length > 0);
    // A second deposit is refused: nothing is due.
    expect((await pay(exam.id, 'pm_card_visa')).status).toBe(422);
  });

  it('leaves the exam booked with the deposit due after a decline, and says why', async () => {
    const exam = await bookSelfPay(10, 10);
    const res = await pay(exam.id, 'pm_card_chargeDeclined');
    expect(res.status).toBe(200);
    expect(res.body.payment.outcome).toBe('declined');
    expect(res.body.payment.message).toMatch(/declined/i);
    const row = (await Exam.findByPk(exam.id))!;
    expect(row.status).toBe('booked');
    expect(row.paymentState).toBe('deposit-due');
    expect(await Payment.findOne({ where: { examId: exam.id } })).toMatchObject({ status: 'failed', failureCode: 'generic_decline' });
    const poor = await pay(exam.id, 'pm_card_chargeDeclinedInsufficientFunds');
    expect(poor.body.payment.message).toMatch(/insufficient funds/i);
    // A good card afterwards works: each attempt has its own row and key.
    expect((await pay(exam.id, 'pm_card_visa')).body.payment.outcome).toBe('succeeded');
    expect(await Payment.count({ where: { examId: exam.id } })).toBe(3);
  });

  it('charges once when the same request is retried with its idempotency key', async () => {
    const exam = await bookSelfPay(10, 11);
    const [a, b] = await Promise.all([pay(exam.id, 'pm_card_visa'), pay(exam.id, 'pm_card_visa')]);
    const ok = [a, b].filter((r) => r.status === 200 && r.body.payment.outcome === 'succeeded');
    expect(ok.length).toBeGreaterThanOrEqual(1);
    const rows = await Payment.findAll({ where: { examId: exam.id, status: 'succeeded' } });
    expect(rows).toHaveLength(1);
    // Sending the same ledger row again replays the provider's first answer: same intent.
    const again = await sendCharge(rows[0]!, (await Exam.findByPk(exam.id))!);
    expect(again).toEqual({ kind: 'succeeded', intentId: rows[0]!.providerIntentId });
    const events = await fakeEventsFor(rows[0]!.providerIntentId!);
    expect(events.filter((e) => e.type === 'payment_intent.succeeded')).toHaveLength(1);
  });
});

describe('payment notifications (webhook)', () => {
  it('refuses a delivery with a bad signature and changes nothing', async () => {
    // Only the forged event is counted: genuine notifications of earlier tests may still be arriving.
    const res = await call('POST', '/api/payments/webhook', {
      rawBody: JSON.stringify({ id: 'evt_forged', type: 'payment_intent.succeeded', data: { object: { id: 'pi_x' } } }),
      headers: { 'Stripe-Signature': `t=${Math.floor(Date.now() / 1000)},v1=${'0'.repeat(64)}` },
    });
    expect(res.status).toBe(400);
    expect(await PaymentEvent.count({ where: { providerEventId: 'evt_forged' } })).toBe(0);
    expect((await call('POST', '/api/payments/webhook', { rawBody: '{}' })).status).toBe(400);
  });

  it('changes nothing when an event is delivered again', async () => {
    const exam = await bookSelfPay(10, 13);
    await pay(exam.id, 'pm_card_visa');
    const row = (await Payment.findOne({ where: { examId: exam.id } }))!;
    let event: { id: string } | undefined;
    await until(async () => {
      event = (await fakeEventsFor(row.providerIntentId!)).find((e) => e.type === 'payment_intent.succeeded');
      return !!event && (await PaymentEvent.count({ where: { providerEventId: event.id } })) === 1;
    });
    const snapshot = JSON.stringify(await Payment.findAll({ where: { examId: exam.id }, raw: true }));
    const resend = await fetch(`${fake()}/_fake/events/${event!.id}/resend`, { method: 'POST', headers: fakeAuth });
    expect(resend.status).toBe(200);
    expect(((await resend.json()) as { receiver_status: number }).receiver_status).toBe(200);
    expect(await PaymentEvent.count({ where: { providerEventId: event!.id } })).toBe(1);
    expect(JSON.stringify(await Payment.findAll({ where: { examId: exam.id }, raw: true }))).toBe(snapshot);
  });
});

describe('cancellation refunds by the clinic policy (24 hours)', () => {
  it('refunds the deposit in full when cancelled a day or more ahead', async () => {
    const exam = await bookSelfPay(11, 9);
    await pay(exam.id, 'pm_card_visa');
    const res = await call('POST', `/api/exams/${exam.id}/cancel`, { cookie: await sessionFor('frontdesk'), json: { version: 0, reason: 'Patient is travelling' } });
    expect(res.status).toBe(200);
    expect(res.body.cancellation).toMatchObject({ refundCents: c.types['abdomen-complete']!.depositCents, keptCents: 0, refundStatus: 'sent' });
    const refund = (await Payment.findOne({ where: { examId: exam.id, kind: 'refund' } }))!;
    expect(refund.status).toBe('succeeded');
    expect(refund.providerRefundId).toMatch(/^re_/);
    expect((await Exam.findByPk(exam.id))!).toMatchObject({ status: 'cancelled', paymentState: 'refunded', cancelReason: 'Patient is travelling' });
  });

  it('keeps the deposit when cancelled less than a day ahead', async () => {
    const exam = await bookSelfPay(11, 11);
    await pay(exam.id, 'pm_card_visa');
    const start = (await Exam.findByPk(exam.id))!.scheduledStart;
    const twoHoursBefore = new Date(start.getTime() - 2 * 3_600_000);
    const answer = await cancelExam(desk, exam.id, { version: 0, reason: 'Called in sick' }, 'test', twoHoursBefore);
    expect(answer).toMatchObject({ refundCents: 0, keptCents: c.types['abdomen-complete']!.depositCents, refundStatus: 'none' });
    expect(await Payment.count({ where: { examId: exam.id, kind: 'refund' } })).toBe(0);
    expect((await Exam.findByPk(exam.id))!.paymentState).toBe('deposit-kept');
  });

  it('refuses to cancel twice (the lifecycle ends at cancelled)', async () => {
    const exam = await bookSelfPay(11, 13);
    const desk2 = await sessionFor('frontdesk');
    expect((await call('POST', `/api/exams/${exam.id}/cancel`, { cookie: desk2, json: { version: 0, reason: 'Duplicate booking' } })).status).toBe(200);
    expect((await call('POST', `/api/exams/${exam.id}/cancel`, { cookie: desk2, json: { version: 1, reason: 'Again' } })).status).toBe(422);
  });
});

describe('balance at check-out', () => {
  it('takes the rest once the patient has arrived, and then nothing is due', async () => {
    const exam = await bookSelfPay(12, 9);
    await pay(exam.id, 'pm_card_visa');
    expect((await pay(exam.id, 'pm_card_visa', 'balance')).status).toBe(422);
    const deskCookie = await sessionFor('frontdesk');
    await call('POST', `/api/exams/${exam.id}/status`, { cookie: deskCookie, json: { version: 0, to: 'arrived' } });
    const res = await pay(exam.id, 'pm_card_visa', 'balance');
    expect(res.body.payment).toMatchObject({ outcome: 'succeeded', paymentState: 'paid' });
    const rows = await Payment.findAll({ where: { examId: exam.id, status: 'succeeded' } });
    const price = (await Exam.findByPk(exam.id))!.priceCents;
    expect(rows.reduce((a, r) => a + r.amountCents, 0)).toBe(price);
  });
});

