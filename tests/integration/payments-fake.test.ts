// The payments fake, driven by the real Stripe SDK over real HTTP, with a real receiver that
// verifies webhook signatures with the SDK's own constructEvent. Needs nothing else running.
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startPaymentsFake, type PaymentsFake, type PaymentsFakeEvent } from '../../scripts/stand-ins/payments-fake.mjs';

const KEY = 'sk_test_crestline';
const SECRET = 'whsec_crestline_fake_test_secret';
const FAKE_SCRIPT = path.join(import.meta.dirname, '../../scripts/stand-ins/payments-fake.mjs');
/** Card payments confirmed server-side: no redirecting methods, so no return_url (as with real Stripe). */
const CARDS_ONLY = { payment_method_types: ['card'] };

/** One POST the receiver got: the exact bytes, the signature header, and what it answered. */
interface Delivery { raw: Buffer; signature: string; event: PaymentsFakeEvent; answered: number; at: number }
/** Answer `status` to the next `times` deliveries that `match`. */
interface Rule { match: (e: PaymentsFakeEvent) => boolean; times: number; status: number }

const deliveries: Delivery[] = [];
const rules: Rule[] = [];
let receiver: Server;
let fake: PaymentsFake;
let stripe: Stripe;

function startReceiver(): Promise<Server> {
  const server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const raw = Buffer.concat(chunks);
      const event = JSON.parse(raw.toString('utf8')) as PaymentsFakeEvent;
      const rule = rules.find((r) => r.times > 0 && r.match(event));
      if (rule) rule.times--;
      const answered = rule?.status ?? 200;
      deliveries.push({ raw, signature: String(req.headers['stripe-signature']), event, answered, at: Date.now() });
      res.writeHead(answered).end();
    });
  });
  return new Promise((resolve) => server.listen(0, '127.0.0.1', () => resolve(server)));
}

const portOf = (server: Server) => (server.address() as AddressInfo).port;
const sdk = (port: number, key = KEY) => new Stripe(key, { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0 });

/** The id of the PaymentIntent an event is about (its own, or the one its charge/refund belongs to). */
const intentOf = (e: PaymentsFakeEvent) => (e.data.object.object === 'payment_intent' ? e.data.object.id : e.data.object.payment_intent);
const answeredFor = (piId: string) => deliveries.filter((d) => intentOf(d.event) === piId);
const okFor = (piId: string) => answeredFor(piId).filter((d) => d.answered === 200);

async function waitFor<T>(find: () => T | undefined, what: string, ms = 10_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const found = find();
    if (found !== undefined) return found;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}
const delivered = (piId: string, type: string) =>
  waitFor(() => okFor(piId).find((d) => d.event.type === type), `${type} for ${piId}`);

/** Expects the promise to reject with an instance of `type`, and returns the error. */
async function rejection<E>(promise: Promise<unknown>, type: abstract new (...args: never[]) => E): Promise<E> {
  const err = await promise.then(() => undefined, (e: unknown) => e);
  expect(err).toBeInstanceOf(type);
  return err as E;
}

async function paidIntent(amount: number, metadata: Record<string, string> = {}) {
  const pi = await stripe.paymentIntents.create({ amount, currency: 'usd', payment_method: 'pm_card_visa', confirm: true, metadata, ...CARDS_ONLY });
  expect(pi.status).toBe('succeeded');
  return pi;
}

beforeAll(async () => {
  receiver = await startReceiver();
  fake = await startPaymentsFake({ webhookUrl: `http://127.0.0.1:${portOf(receiver)}/hook`, webhookSecret: SECRET });
  stripe = sdk(fake.port);
});

afterAll(async () => {
  await fake?.close();
  await new Promise((r) => receiver?.close(r));
});

describe('payments fake: PaymentIntents', () => {
  it('takes a deposit with pm_card_visa: succeeded, a charge, and a signed payment_intent.succeeded', async () => {
    const pi = await stripe.paymentIntents.create({
      amount: 4500, currency: 'usd', payment_method: 'pm_card_visa', confirm: true,
      description: 'Deposit', metadata: { exam_id: '12' }, automatic_payment_methods: { enabled: true, allow_redirects: 'never' },
    });
    expect(pi).toMatchObject({ object: 'payment_intent', status: 'succeeded', amount: 4500, amount_received: 4500, currency: 'usd', livemode: false, metadata: { exam_id: '12' } });
    expect(pi.id).toMatch(/^pi_\w+$/);
    expect(pi.client_secret).toMatch(new RegExp(`^${pi.id}_secret_`));
    expect(pi.payment_method).toMatch(/^pm_\w+$/);
    expect(pi.payment_method).not.toBe('pm_card_visa'); // like Stripe, the test token becomes a new PaymentMethod
    expect(pi.lastResponse.requestId).toMatch(/^req_\w+$/);

    const charge = await stripe.charges.retrieve(pi.latest_charge as string);
    expect(charge).toMatchObject({ object: 'charge', status: 'succeeded', paid: true, amount: 4500, amount_refunded: 0, refunded: false, payment_intent: pi.id });
    expect((await stripe.paymentIntents.retrieve(pi.id)).status).toBe('succeeded');

    const d = await delivered(pi.id, 'payment_intent.succeeded');
    expect(d.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    const event = stripe.webhooks.constructEvent(d.raw, d.signature, SECRET);
    expect(event).toMatchObject({ object: 'event', type: 'payment_intent.succeeded', livemode: false, pending_webhooks: 1 });
    expect(event.id).toMatch(/^evt_\w+$/);
    const object = event.data.object as Stripe.PaymentIntent;
    expect(object).toMatchObject({ id: pi.id, status: 'succeeded', latest_charge: charge.id, metadata: { exam_id: '12' } });
    expect(event.request?.id).toMatch(/^req_/);
    // Events for one intent arrive in the order they happened.
    expect(okFor(pi.id).map((x) => x.event.type)).toEqual(['payment_intent.created', 'charge.succeeded', 'payment_intent.succeeded']);
    // The signature binds the secret: another secret fails.
    expect(() => stripe.webhooks.constructEvent(d.raw, d.signature, 'whsec_someone_else')).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it('waits without confirm, charges on confirm, and cancels only what has not succeeded', async () => {
    const bare = await stripe.paymentIntents.create({ amount: 2000, currency: 'USD' });
    expect(bare).toMatchObject({ status: 'requires_payment_method', currency: 'usd', latest_charge: null, payment_method: null, automatic_payment_methods: { enabled: true } });
    const withCard = await stripe.paymentIntents.create({ amount: 2000, currency: 'usd', payment_method: 'pm_card_mastercard' });
    expect(withCard.status).toBe('requires_confirmation');
    // Automatic payment methods may redirect, so Stripe wants a return_url to confirm server-side.
    const noReturn = await rejection(stripe.paymentIntents.confirm(withCard.id), Stripe.errors.StripeInvalidRequestError);
    expect(noReturn).toMatchObject({ statusCode: 400, param: 'return_url' });
    expect((await stripe.paymentIntents.retrieve(withCard.id)).status).toBe('requires_confirmation');
    const confirmed = await stripe.paymentIntents.confirm(withCard.id, { return_url: 'https://crestline.example/deposit/done' });
    expect(confirmed).toMatchObject({ status: 'succeeded', amount_received: 2000 });
    expect((await stripe.charges.retrieve(confirmed.latest_charge as string)).payment_method_details?.card?.brand).toBe('mastercard');

    const refused = await rejection(stripe.paymentIntents.cancel(confirmed.id), Stripe.errors.StripeInvalidRequestError);
    expect(refused.code).toBe('payment_intent_unexpected_state');
    const canceled = await stripe.paymentIntents.cancel(bare.id, { cancellation_reason: 'abandoned' });
    expect(canceled).toMatchObject({ status: 'canceled', cancellation_reason: 'abandoned' });
    const again = await rejection(stripe.paymentIntents.confirm(bare.id, { payment_method: 'pm_card_visa' }), Stripe.errors.StripeInvalidRequestError);
    expect(again.code).toBe('payment_intent_unexpected_state');
    const d = await delivered(bare.id, 'payment_intent.canceled');
    expect(stripe.webhooks.constructEvent(d.raw, d.signature, SECRET).data.object).toMatchObject({ id: bare.id, status: 'canceled' });
  });

  it.each([
    ['pm_card_chargeDeclined', 'generic_decline', 'Your card was declined.'],
    ['pm_card_chargeDeclinedInsufficientFunds', 'insufficient_funds', 'Your card has insufficient funds.'],
  ])('declines %s with card_declined/%s and leaves the intent payable', async (method, declineCode, message) => {
    const pi = await stripe.paymentIntents.create({ amount: 3000, currency: 'usd', metadata: { exam_id: '7' }, ...CARDS_ONLY });
    const err = await rejection(stripe.paymentIntents.confirm(pi.id, { payment_method: method }), Stripe.errors.StripeCardError);
    expect(err).toMatchObject({ statusCode: 402, type: 'StripeCardError', code: 'card_declined', decline_code: declineCode, message });
    expect(err.payment_intent).toMatchObject({ id: pi.id, status: 'requires_payment_method', last_payment_error: { code: 'card_declined', decline_code: declineCode } });
    expect(err.charge).toMatch(/^ch_/);

    const after = await stripe.paymentIntents.retrieve(pi.id);
    expect(after).toMatchObject({ status: 'requires_payment_method', payment_method: null, amount_received: 0, latest_charge: err.charge });
    expect(after.last_payment_error).toMatchObject({ type: 'card_error', code: 'card_declined', decline_code: declineCode, message });
    expect(await stripe.charges.retrieve(err.charge as string)).toMatchObject({ status: 'failed', paid: false, failure_code: 'card_declined' });

    const d = await delivered(pi.id, 'payment_intent.payment_failed');
    const event = stripe.webhooks.constructEvent(d.raw, d.signature, SECRET);
    expect((event.data.object as Stripe.PaymentIntent).last_payment_error?.decline_code).toBe(declineCode);
    expect(okFor(pi.id).some((x) => x.event.type === 'payment_intent.succeeded')).toBe(false);

    // The patient can pay with another card afterwards.
    expect((await stripe.paymentIntents.confirm(pi.id, { payment_method: 'pm_card_visa' })).status).toBe('succeeded');
  });

  it('answers bad input with Stripe errors that name the parameter', async () => {
    const missing = await rejection(stripe.paymentIntents.retrieve('pi_doesnotexist'), Stripe.errors.StripeInvalidRequestError);
    expect(missing).toMatchObject({ statusCode: 404, code: 'resource_missing', message: "No such payment_intent: 'pi_doesnotexist'" });
    const cases: [Record<string, unknown>, string, string | undefined][] = [
      [{ currency: 'usd' }, 'amount', 'parameter_missing'],
      [{ amount: 0, currency: 'usd' }, 'amount', 'parameter_invalid_integer'],
      [{ amount: 12.5, currency: 'usd' }, 'amount', 'parameter_invalid_integer'],
      [{ amount: 100, currency: 'dollars' }, 'currency', undefined],
      [{ amount: 100, currency: 'usd', capture_method: 'manual' }, 'capture_method', undefined],
      [{ amount: 100, currency: 'usd', payment_method: 'pm_card_nosuch' }, 'payment_method', 'resource_missing'],
      [{ amount: 100, currency: 'usd', colour: 'red' }, 'colour', 'parameter_unknown'],
      [{ amount: 100, currency: 'usd', payment_method: 'pm_card_visa', confirm: true }, 'return_url', undefined],
    ];
    const before = fake.events().length;
    for (const [params, param, code] of cases) {
      const err = await rejection(stripe.paymentIntents.create(params as unknown as Stripe.PaymentIntentCreateParams), Stripe.errors.StripeInvalidRequestError);
      expect({ statusCode: err.statusCode, param: err.param, code: err.code }, JSON.stringify(params)).toEqual({ statusCode: 400, param, code });
    }
    expect(fake.events().length).toBe(before); // nothing was created
  });

  it('reads bracket notation from a raw form body and never answers with a stack trace', async () => {
    const post = (body: string, auth = `Bearer ${KEY}`) =>
      fetch(`${fake.url}/v1/payment_intents`, { method: 'POST', headers: { Authorization: auth, 'Content-Type': 'application/x-www-form-urlencoded' }, body });
    const ok = await post('amount=1200&currency=usd&metadata[exam_id]=12&metadata[site]=north&payment_method_types[]=card');
    expect(ok.status).toBe(200);
    expect(ok.headers.get('request-id')).toMatch(/^req_/);
    expect(await ok.json()).toMatchObject({ amount: 1200, metadata: { exam_id: '12', site: 'north' }, payment_method_types: ['card'] });

    // `[]` lists are read, not dropped: a type the fake cannot charge is refused by name.
    const sepa = await post('amount=1200&currency=usd&payment_method_types[]=card&payment_method_types[]=sepa_debit');
    expect(sepa.status).toBe(400);
    expect((await sepa.json()).error).toMatchObject({ param: 'payment_method_types', message: expect.stringContaining('sepa_debit') });
    // …in a query string too (curl style), here asking for the charge inline.
    const paid = await paidIntent(1300);
    const expanded = await fetch(`${fake.url}/v1/payment_intents/${paid.id}?expand[]=latest_charge`, { headers: { Authorization: `Bearer ${KEY}` } });
    expect((await expanded.json()).latest_charge).toMatchObject({ object: 'charge', id: paid.latest_charge, amount: 1300 });

    for (const body of ['amount=1&metadata[exam_id=1', 'amount=5&currency=usd&metadata=x&metadata[a]=b', 'amount[]=1&currency=usd']) {
      const res = await post(body);
      const text = await res.text();
      expect(res.status, body).toBe(400);
      expect(JSON.parse(text).error.type).toBe('invalid_request_error');
      expect(text).not.toMatch(/\n\s+at |\.mjs:\d+/);
    }
    const unknown = await fetch(`${fake.url}/v1/customers`, { headers: { Authorization: `Bearer ${KEY}` } });
    expect(unknown.status).toBe(404);
    expect((await unknown.json()).error.message).toContain('Unrecognized request URL (GET: /v1/customers)');
  });
});

describe('payments fake: API keys and idempotency', () => {
  it('refuses a key without the test prefix, and a request with no key', async () => {
    const liveKey = 'sk_live_51NotAllowedHere9876';
    const err = await rejection(sdk(fake.port, liveKey).paymentIntents.create({ amount: 100, currency: 'usd' }), Stripe.errors.StripeAuthenticationError);
    expect(err.statusCode).toBe(401);
    expect(err.message).toMatch(/^Invalid API Key provided: sk_live_\*+9876$/);
    expect(err.message).not.toContain(liveKey);
    for (const target of ['/v1/payment_intents/pi_x', '/_fake/events']) {
      const res = await fetch(fake.url + target);
      expect(res.status, target).toBe(401);
      expect((await res.json()).error.message).toMatch(/^You did not provide an API key/);
    }
  });

  it('replays a retried create with the same key and creates one intent only', async () => {
    const idempotencyKey = randomUUID();
    const params = { amount: 5100, currency: 'usd', metadata: { exam_id: '31' } };
    const createdBefore = fake.events().filter((e) => e.type === 'payment_intent.created').length;
    const first = await stripe.paymentIntents.create(params, { idempotencyKey });
    const second = await stripe.paymentIntents.create(params, { idempotencyKey });
    expect(second.id).toBe(first.id);
    expect(second.client_secret).toBe(first.client_secret);
    expect(second.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect(first.lastResponse.headers['idempotent-replayed']).toBeUndefined();
    expect(fake.events().filter((e) => e.type === 'payment_intent.created').length).toBe(createdBefore + 1);

    const changed = await rejection(stripe.paymentIntents.create({ ...params, amount: 5200 }, { idempotencyKey }), Stripe.errors.StripeIdempotencyError);
    expect(changed.statusCode).toBe(400);
    expect(changed.message).toContain(idempotencyKey);
    expect(fake.events().filter((e) => e.type === 'payment_intent.created').length).toBe(createdBefore + 1);

    // A refusal of the parameters is not saved: the corrected request may reuse its key.
    const fixKey = randomUUID();
    const refused = await rejection(stripe.paymentIntents.create({ ...params, amount: 0 }, { idempotencyKey: fixKey }), Stripe.errors.StripeInvalidRequestError);
    expect(refused.param).toBe('amount');
    expect((await stripe.paymentIntents.create(params, { idempotencyKey: fixKey })).status).toBe('requires_payment_method');

    // Keys belong to one API key: another key may use the same value for its own request.
    const other = await sdk(fake.port, 'sk_test_other_tenant').paymentIntents.create({ ...params, amount: 5200 }, { idempotencyKey });
    expect(other.id).not.toBe(first.id);
    expect(other.amount).toBe(5200);
  });

  it('replays a declined confirm as the same 402 without charging again', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 800, currency: 'usd', ...CARDS_ONLY });
    const idempotencyKey = randomUUID();
    const confirm = () => stripe.paymentIntents.confirm(pi.id, { payment_method: 'pm_card_chargeDeclined' }, { idempotencyKey });
    const first = await rejection(confirm(), Stripe.errors.StripeCardError);
    const failedBefore = fake.events().filter((e) => e.type === 'charge.failed').length;
    const second = await rejection(confirm(), Stripe.errors.StripeCardError);
    expect(second.charge).toBe(first.charge);
    expect(second.headers?.['idempotent-replayed']).toBe('true');
    expect(fake.events().filter((e) => e.type === 'charge.failed').length).toBe(failedBefore);
  });
});

describe('payments fake: refunds', () => {
  it('refunds part, refuses more than remains, refunds the rest, and reports charge.refunded', async () => {
    const pi = await paidIntent(10_000, { exam_id: '44' });
    const partial = await stripe.refunds.create({ payment_intent: pi.id, amount: 2500, reason: 'requested_by_customer', metadata: { note: 'partial' } });
    expect(partial).toMatchObject({ object: 'refund', amount: 2500, status: 'succeeded', payment_intent: pi.id, charge: pi.latest_charge, currency: 'usd', metadata: { note: 'partial' } });
    expect(await stripe.charges.retrieve(pi.latest_charge as string)).toMatchObject({ amount_refunded: 2500, refunded: false });

    const tooMuch = await rejection(stripe.refunds.create({ payment_intent: pi.id, amount: 8000 }), Stripe.errors.StripeInvalidRequestError);
    expect(tooMuch).toMatchObject({ statusCode: 400, param: 'amount' });
    expect(tooMuch.message).toBe('Refund amount ($80.00) is greater than unrefunded amount on charge ($75.00)');

    const rest = await stripe.refunds.create({ payment_intent: pi.id });
    expect(rest.amount).toBe(7500);
    expect(await stripe.charges.retrieve(pi.latest_charge as string)).toMatchObject({ amount_refunded: 10_000, refunded: true });
    const done = await rejection(stripe.refunds.create({ charge: pi.latest_charge as string, amount: 1 }), Stripe.errors.StripeInvalidRequestError);
    expect(done.code).toBe('charge_already_refunded');
    expect(await stripe.refunds.retrieve(partial.id)).toEqual(expect.objectContaining({ id: partial.id, amount: 2500 }));

    await waitFor(() => (okFor(pi.id).filter((d) => d.event.type === 'charge.refunded').length === 2 ? true : undefined), 'two charge.refunded');
    const refunded = okFor(pi.id).filter((d) => d.event.type === 'charge.refunded')
      .map((d) => stripe.webhooks.constructEvent(d.raw, d.signature, SECRET).data.object as Stripe.Charge);
    expect(refunded.map((c) => [c.id, c.payment_intent, c.amount_refunded, c.refunded])).toEqual([
      [pi.latest_charge, pi.id, 2500, false],
      [pi.latest_charge, pi.id, 10_000, true],
    ]);
  });

  it('refuses to refund an intent that did not succeed', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 900, currency: 'usd' });
    const err = await rejection(stripe.refunds.create({ payment_intent: pi.id }), Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 400, param: 'payment_intent' });
    const missing = await rejection(stripe.refunds.create({ payment_intent: 'pi_nosuch' }), Stripe.errors.StripeInvalidRequestError);
    expect(missing.code).toBe('resource_missing');
    expect(fake.events().some((e) => e.type.startsWith('refund.') && e.data.object.payment_intent === pi.id)).toBe(false);
  });
});

describe('payments fake: webhooks', () => {
  it('signs the exact body: a tampered body fails constructEvent', async () => {
    const pi = await paidIntent(1500);
    const d = await delivered(pi.id, 'payment_intent.succeeded');
    expect(() => stripe.webhooks.constructEvent(d.raw, d.signature, SECRET)).not.toThrow();
    const tampered = Buffer.from(d.raw.toString('utf8').replace('"amount": 1500', '"amount": 1'));
    expect(tampered.equals(d.raw)).toBe(false);
    expect(() => stripe.webhooks.constructEvent(tampered, d.signature, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it('retries a delivery the receiver answered 500, and keeps the intent\'s events in order', async () => {
    rules.push({ match: (e) => e.type === 'payment_intent.created' && (e.data.object.metadata as Record<string, string> | undefined)?.case === 'retry', times: 1, status: 500 });
    const pi = await paidIntent(2200, { case: 'retry' });
    await delivered(pi.id, 'payment_intent.succeeded');
    const attempts = answeredFor(pi.id).map((d) => [d.event.type, d.answered]);
    expect(attempts).toEqual([
      ['payment_intent.created', 500],
      ['payment_intent.created', 200],
      ['charge.succeeded', 200],
      ['payment_intent.succeeded', 200],
    ]);
    const [failed, retried] = answeredFor(pi.id);
    expect(retried.event.id).toBe(failed.event.id);
    expect(retried.at - failed.at).toBeGreaterThanOrEqual(400); // a pause, not a hot loop
    expect(stripe.webhooks.constructEvent(retried.raw, retried.signature, SECRET).id).toBe(failed.event.id);
    await waitFor(() => (fake.events().find((e) => e.id === failed.event.id)?.pending_webhooks === 0 ? true : undefined), 'pending_webhooks 0');
  });

  it('resends an event with the same id and body, adding no event', async () => {
    const pi = await paidIntent(3300);
    const original = await delivered(pi.id, 'payment_intent.succeeded');
    const count = fake.events().length;
    expect(await fake.resend(original.event.id)).toBe(200);
    const copies = okFor(pi.id).filter((d) => d.event.id === original.event.id);
    expect(copies).toHaveLength(2);
    expect(copies[1].raw.equals(original.raw)).toBe(true);
    expect(stripe.webhooks.constructEvent(copies[1].raw, copies[1].signature, SECRET).id).toBe(original.event.id);
    expect(fake.events().length).toBe(count);

    const auth = { Authorization: `Bearer ${KEY}` };
    const viaHttp = await fetch(`${fake.url}/_fake/events/${original.event.id}/resend`, { method: 'POST', headers: auth });
    expect(await viaHttp.json()).toEqual({ object: 'webhook_delivery', event: original.event.id, receiver_status: 200 });
    expect(okFor(pi.id).filter((d) => d.event.id === original.event.id)).toHaveLength(3);
    expect((await fetch(`${fake.url}/_fake/events/evt_nosuch/resend`, { method: 'POST', headers: auth })).status).toBe(404);
    const list = await (await fetch(`${fake.url}/_fake/events?type=payment_intent.succeeded`, { headers: auth })).json();
    expect(list.data.map((e: PaymentsFakeEvent) => e.id)).toContain(original.event.id);
    expect(list.data.every((e: PaymentsFakeEvent) => e.type === 'payment_intent.succeeded')).toBe(true);
  });

  it('keeps serving when the receiver is down, logs no data, and stops retrying on close()', async () => {
    const gone = await startReceiver();
    const deadUrl = `http://127.0.0.1:${portOf(gone)}/hook`;
    await new Promise((r) => gone.close(r));
    const lines: string[] = [];
    const lonely = await startPaymentsFake({ webhookUrl: deadUrl, webhookSecret: SECRET, log: (l) => lines.push(l) });
    try {
      const pi = await sdk(lonely.port).paymentIntents.create({
        amount: 700, currency: 'usd', payment_method: 'pm_card_visa', confirm: true, metadata: { patient_name: 'Ada Lovelace' }, ...CARDS_ONLY,
      });
      expect(pi.status).toBe('succeeded');
      expect(lonely.events().map((e) => e.type)).toEqual(['payment_intent.created', 'charge.succeeded', 'payment_intent.succeeded']);
      expect(lonely.events().every((e) => e.pending_webhooks === 1)).toBe(true);
      await expect(lonely.resend(lonely.events()[0].id)).rejects.toThrow();
      await waitFor(() => (lines.some((l) => l.startsWith('webhook ')) ? true : undefined), 'a failed delivery attempt');
    } finally {
      const started = Date.now();
      await lonely.close();
      expect(Date.now() - started).toBeLessThan(1000);
    }
    expect(lines).toContain('POST /v1/payment_intents 200');
    for (const line of lines) expect(line).toMatch(/^(GET|POST) \/\S* \d{3}$|^webhook [a-z_.]+ evt_\w+ (attempt \d+|resend) -> \w+$/);
    expect(lines.join('\n')).not.toMatch(/Ada|patient_name|sk_test/);
    // Retries stop with close(): the first pause is 0.5 s, so a live retry would log by now.
    const before = lines.length;
    await new Promise((r) => setTimeout(r, 700));
    expect(lines.length).toBe(before);
  });

  it('only records events when started without a webhookUrl', async () => {
    const quiet = await startPaymentsFake();
    try {
      const pi = await sdk(quiet.port).paymentIntents.create({ amount: 700, currency: 'usd' });
      expect(quiet.events()).toEqual([expect.objectContaining({ type: 'payment_intent.created', pending_webhooks: 0, data: { object: expect.objectContaining({ id: pi.id }) } })]);
      await expect(quiet.resend(quiet.events()[0].id)).rejects.toThrow(/webhookUrl/);
    } finally {
      await quiet.close();
    }
  });
});

describe('payments fake: command line', () => {
  it('prints its address, serves the SDK, and stops cleanly on SIGTERM', async () => {
    const child = spawn(process.execPath, [FAKE_SCRIPT, '--port', '0', '--webhook', `http://127.0.0.1:${portOf(receiver)}/hook`, '--secret', SECRET], { stdio: ['ignore', 'pipe', 'pipe'] });
    try {
      const line = await new Promise<string>((resolve, reject) => {
        let out = '';
        child.stdout.on('data', (c: Buffer) => { out += c; if (out.includes('\n')) resolve(out); });
        child.once('exit', (code) => reject(new Error(`exited with ${code} before listening`)));
      });
      const m = /^payments fake listening on http:\/\/127\.0\.0\.1:(\d+)\n$/.exec(line);
      expect(m, line).not.toBeNull();
      const pi = await sdk(Number(m![1])).paymentIntents.create({ amount: 100, currency: 'usd', payment_method: 'pm_card_visa', confirm: true, ...CARDS_ONLY });
      await delivered(pi.id, 'payment_intent.succeeded');
      const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
      child.kill('SIGTERM');
      expect(await exited).toBe(0);
    } finally {
      if (child.exitCode === null) child.kill('SIGKILL');
    }
  });
});
