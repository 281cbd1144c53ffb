// The fake's in-memory money: PaymentIntents, the charges that confirming them creates, and
// refunds against those charges. Each operation checks its parameters, changes state, emits the
// events Stripe would, and returns the object Stripe would answer with.
import { FakeStripeError, docUrl, invalid, badParam, noSuch } from './errors.mjs';
import { TEST_CARDS, paymentMethodObject } from './cards.mjs';
import { newId, unixNow } from './ids.mjs';
import * as p from './params.mjs';

/** @typedef {import('./form.mjs').FormParams} FormParams */
/** @typedef {Record<string, any>} StripeObject */
/**
 * How an operation reports a state change: the event type, a snapshot source, and the
 * PaymentIntent the change belongs to (webhooks for one intent are delivered in order).
 * @typedef {{ emit: (type: string, object: StripeObject, intentId: string) => void }} OpContext
 */

const CONFIRMABLE = ['requires_payment_method', 'requires_confirmation'];
const CANCELABLE = ['requires_payment_method', 'requires_capture', 'requires_confirmation', 'requires_action', 'processing'];
const CREATE_PARAMS = [
  'amount', 'currency', 'payment_method', 'confirm', 'description', 'metadata', 'receipt_email', 'capture_method',
  'automatic_payment_methods', 'payment_method_types', 'expand', 'return_url', 'off_session', 'statement_descriptor_suffix',
];
const CONFIRM_PARAMS = ['payment_method', 'receipt_email', 'return_url', 'off_session', 'expand'];

/** Formats minor units the way Stripe's messages do ("$15.00"). */
function money(amount, currency) {
  try {
    const f = new Intl.NumberFormat('en-US', { style: 'currency', currency: currency.toUpperCase() });
    return f.format(amount / 10 ** (f.resolvedOptions().maximumFractionDigits ?? 2));
  } catch {
    return `${amount} ${currency}`;
  }
}

export function createLedger() {
  /** @type {Map<string, StripeObject>} */ const intents = new Map();
  /** @type {Map<string, StripeObject>} */ const charges = new Map();
  /** @type {Map<string, StripeObject>} */ const refunds = new Map();
  /** @type {Map<string, import('./cards.mjs').TestCard>} */ const methods = new Map();

  const find = (map, noun, id, param, status = 404) => {
    const obj = map.get(id);
    if (!obj) throw noSuch(noun, id, param, status);
    return obj;
  };

  /** A copy of `obj` with the requested fields expanded from ids into objects. */
  function view(obj, fields = []) {
    const out = structuredClone(obj);
    for (const field of fields) {
      const id = out[field];
      const source = field === 'payment_intent' ? intents : charges;
      if (typeof id === 'string' && source.has(id)) out[field] = structuredClone(source.get(id));
    }
    return out;
  }

  /** Resolves a test token (a new pm_ id each time, as Stripe does) or a pm_ id made earlier. */
  function resolveMethod(id) {
    if (methods.has(id)) return id;
    const card = TEST_CARDS[id];
    if (!card) throw noSuch('PaymentMethod', id, 'payment_method', 400);
    const pmId = newId('pm');
    methods.set(pmId, card);
    return pmId;
  }

  function newCharge(pi, pmId, card, decline) {
    const ok = !decline;
    const charge = {
      id: newId('ch'), object: 'charge', amount: pi.amount, amount_captured: ok ? pi.amount : 0, amount_refunded: 0,
      balance_transaction: null, captured: ok, created: unixNow(), currency: pi.currency, customer: null,
      description: pi.description, failure_code: decline?.code ?? null, failure_message: decline?.message ?? null,
      livemode: false, metadata: { ...pi.metadata },
      outcome: ok
        ? { network_status: 'approved_by_network', reason: null, risk_level: 'normal', seller_message: 'Payment complete.', type: 'authorized' }
        : { network_status: 'declined_by_network', reason: decline.decline_code, risk_level: 'normal', seller_message: 'The bank did not return any further details with this decline.', type: 'issuer_declined' },
      paid: ok, payment_intent: pi.id, payment_method: pmId,
      payment_method_details: { type: 'card', card: { brand: card.brand, last4: card.last4, funding: card.funding ?? 'credit', country: 'US' } },
      receipt_email: pi.receipt_email, refunded: false, status: ok ? 'succeeded' : 'failed',
    };
    charges.set(charge.id, charge);
    return charge;
  }

  /** Charges the intent's card: succeeded, or a 402 card_error that leaves it requires_payment_method. */
  function attempt(pi, ctx, fields) {
    const pmId = pi.payment_method;
    const card = /** @type {import('./cards.mjs').TestCard} */ (methods.get(pmId));
    const charge = newCharge(pi, pmId, card, card.decline);
    pi.latest_charge = charge.id;
    if (!card.decline) {
      Object.assign(pi, { status: 'succeeded', amount_received: pi.amount, last_payment_error: null });
      ctx.emit('charge.succeeded', charge, pi.id);
      ctx.emit('payment_intent.succeeded', pi, pi.id);
      return view(pi, fields);
    }
    const { code, decline_code, message } = card.decline;
    pi.last_payment_error = {
      type: 'card_error', charge: charge.id, code, decline_code, doc_url: docUrl(code), message,
      payment_method: paymentMethodObject(pmId, card, charge.created),
    };
    Object.assign(pi, { status: 'requires_payment_method', payment_method: null });
    ctx.emit('charge.failed', charge, pi.id);
    ctx.emit('payment_intent.payment_failed', pi, pi.id);
    throw new FakeStripeError(402, { ...structuredClone(pi.last_payment_error), payment_intent: view(pi, fields) });
  }

  /** Checks the parameters shared by create and confirm; returns what they set. */
  function readConfirmParams(params) {
    const pm = p.str(params, 'payment_method', { max: 255 });
    const receipt = p.email(params, 'receipt_email');
    const returnUrl = p.str(params, 'return_url', { max: 2048 });
    p.bool(params, 'off_session');
    return { payment_method: pm === undefined ? undefined : resolveMethod(pm), receipt_email: receipt, return_url: returnUrl };
  }

  return {
    /** POST /v1/payment_intents */
    createIntent(/** @type {FormParams} */ params, /** @type {OpContext} */ ctx) {
      p.onlyKnown(params, CREATE_PARAMS);
      const amount = /** @type {number} */ (p.positiveInt(params, 'amount', { required: true }));
      const currency = p.currency(params);
      const capture = p.oneOf(params, 'capture_method', ['automatic', 'automatic_async', 'manual']) ?? 'automatic_async';
      if (capture === 'manual') {
        throw badParam('capture_method=manual is not supported by the payments fake: it captures automatically only (automatic or automatic_async).', 'capture_method');
      }
      const description = p.str(params, 'description', { max: 1000 }) ?? null;
      const metadata = p.metadata(params);
      const confirm = p.bool(params, 'confirm') ?? false;
      const types = readPaymentMethodTypes(params);
      // Since API version 2023-08-16 an intent without payment_method_types takes the methods
      // enabled in the Dashboard: automatic_payment_methods is on unless the caller says otherwise.
      const apm = readAutomaticPaymentMethods(params) ?? (types ? null : { enabled: true });
      p.str(params, 'statement_descriptor_suffix', { max: 22 });
      const fields = p.expand(params, ['latest_charge']);
      const set = readConfirmParams(params);
      if (confirm && !set.payment_method) {
        throw badParam('You cannot confirm this PaymentIntent because it\'s missing a payment method. Pass payment_method when you confirm it.', 'payment_method', 'parameter_missing');
      }
      if (confirm) requireReturnUrl(apm, set.return_url);
      const id = newId('pi');
      const pi = {
        id, object: 'payment_intent', amount, amount_capturable: 0, amount_received: 0, automatic_payment_methods: apm,
        canceled_at: null, cancellation_reason: null, capture_method: capture, client_secret: `${id}_secret_${newId('x').slice(2)}`,
        confirmation_method: 'automatic', created: unixNow(), currency, customer: null, description, last_payment_error: null,
        latest_charge: null, livemode: false, metadata, next_action: null, payment_method: set.payment_method ?? null,
        payment_method_types: ['card'], receipt_email: set.receipt_email ?? null,
        status: set.payment_method ? 'requires_confirmation' : 'requires_payment_method',
      };
      intents.set(id, pi);
      ctx.emit('payment_intent.created', pi, id);
      return confirm ? attempt(pi, ctx, fields) : view(pi, fields);
    },

    /** GET /v1/payment_intents/:id */
    retrieveIntent(id, params) {
      p.onlyKnown(params, ['expand', 'client_secret']);
      const fields = p.expand(params, ['latest_charge']);
      return view(find(intents, 'payment_intent', id, 'intent'), fields);
    },

    /** POST /v1/payment_intents/:id/confirm */
    confirmIntent(id, params, ctx) {
      p.onlyKnown(params, CONFIRM_PARAMS);
      const fields = p.expand(params, ['latest_charge']);
      const pi = find(intents, 'payment_intent', id, 'intent');
      const set = readConfirmParams(params);
      if (!CONFIRMABLE.includes(pi.status)) {
        throw invalid(`You cannot confirm this PaymentIntent because it has a status of ${pi.status}. Only a PaymentIntent with one of the following statuses may be confirmed: ${CONFIRMABLE.join(', ')}.`, { code: 'payment_intent_unexpected_state' });
      }
      if (!set.payment_method && !pi.payment_method) {
        throw invalid("You cannot confirm this PaymentIntent because it's missing a payment method. Confirm it again with payment_method.", { code: 'payment_intent_unexpected_state', param: 'payment_method' });
      }
      requireReturnUrl(pi.automatic_payment_methods, set.return_url);
      if (set.payment_method) pi.payment_method = set.payment_method;
      if (set.receipt_email) pi.receipt_email = set.receipt_email;
      return attempt(pi, ctx, fields);
    },

    /** POST /v1/payment_intents/:id/cancel */
    cancelIntent(id, params, ctx) {
      p.onlyKnown(params, ['cancellation_reason', 'expand']);
      const reason = p.oneOf(params, 'cancellation_reason', ['duplicate', 'fraudulent', 'requested_by_customer', 'abandoned']);
      const fields = p.expand(params, ['latest_charge']);
      const pi = find(intents, 'payment_intent', id, 'intent');
      if (!CANCELABLE.includes(pi.status)) {
        throw invalid(`You cannot cancel this PaymentIntent because it has a status of ${pi.status}. Only a PaymentIntent with one of the following statuses may be canceled: ${CANCELABLE.join(', ')}.`, { code: 'payment_intent_unexpected_state' });
      }
      Object.assign(pi, { status: 'canceled', canceled_at: unixNow(), cancellation_reason: reason ?? null });
      ctx.emit('payment_intent.canceled', pi, pi.id);
      return view(pi, fields);
    },

    /** POST /v1/refunds: by payment_intent or by charge; the amount defaults to what is left. */
    createRefund(params, ctx) {
      p.onlyKnown(params, ['payment_intent', 'charge', 'amount', 'metadata', 'reason', 'expand']);
      const piId = p.str(params, 'payment_intent', { max: 255 });
      const chId = p.str(params, 'charge', { max: 255 });
      const amount = p.positiveInt(params, 'amount');
      const metadata = p.metadata(params);
      const reason = p.oneOf(params, 'reason', ['duplicate', 'fraudulent', 'requested_by_customer']) ?? null;
      const fields = p.expand(params, ['charge', 'payment_intent']);
      if (!piId && !chId) {
        throw badParam('One of the following params should be provided for this request: payment_intent or charge.', 'payment_intent', 'parameter_missing');
      }
      let charge;
      if (piId) {
        const pi = find(intents, 'payment_intent', piId, 'payment_intent', 400);
        charge = pi.status === 'succeeded' ? charges.get(pi.latest_charge) : undefined;
        if (!charge) throw invalid(`This PaymentIntent (${piId}) does not have a successful charge to refund.`, { param: 'payment_intent' });
        if (chId && chId !== charge.id) throw badParam(`The charge ${chId} does not belong to PaymentIntent ${piId}.`, 'charge');
      } else {
        charge = find(charges, 'charge', chId, 'charge', 400);
        if (charge.status !== 'succeeded') throw invalid(`Charge ${chId} did not succeed, so there is nothing to refund.`, { param: 'charge' });
      }
      const remaining = charge.amount - charge.amount_refunded;
      if (remaining === 0) throw invalid(`Charge ${charge.id} has already been refunded.`, { code: 'charge_already_refunded' });
      if (amount !== undefined && amount > remaining) {
        throw invalid(`Refund amount (${money(amount, charge.currency)}) is greater than unrefunded amount on charge (${money(remaining, charge.currency)})`, { param: 'amount' });
      }
      const refund = {
        id: newId('re'), object: 'refund', amount: amount ?? remaining, balance_transaction: null, charge: charge.id,
        created: unixNow(), currency: charge.currency, metadata, payment_intent: charge.payment_intent, reason,
        receipt_number: null, source_transfer_reversal: null, status: 'succeeded', transfer_reversal: null,
      };
      refunds.set(refund.id, refund);
      charge.amount_refunded += refund.amount;
      charge.refunded = charge.amount_refunded === charge.amount;
      ctx.emit('charge.refunded', charge, charge.payment_intent);
      ctx.emit('refund.created', refund, charge.payment_intent);
      return view(refund, fields);
    },

    /** GET /v1/refunds/:id */
    retrieveRefund(id, params) {
      p.onlyKnown(params, ['expand']);
      return view(find(refunds, 'refund', id, 'refund'), p.expand(params, ['charge', 'payment_intent']));
    },

    /** GET /v1/charges/:id (handy to read amount_refunded) */
    retrieveCharge(id, params) {
      p.onlyKnown(params, ['expand']);
      return view(find(charges, 'charge', id, 'charge'), p.expand(params, ['payment_intent']));
    },
  };
}

/** `automatic_payment_methods[enabled]=true`: tolerated and echoed; cards are the only method. */
function readAutomaticPaymentMethods(params) {
  const apm = params.automatic_payment_methods;
  if (apm === undefined || apm === '') return null;
  if (typeof apm !== 'object' || Array.isArray(apm)) throw badParam('Invalid automatic_payment_methods: must be a hash.', 'automatic_payment_methods');
  p.onlyKnown(apm, ['enabled', 'allow_redirects'], 'automatic_payment_methods');
  const enabled = p.bool(apm, 'enabled');
  if (enabled === undefined) throw badParam('Missing required param: automatic_payment_methods[enabled].', 'automatic_payment_methods[enabled]', 'parameter_missing');
  const redirects = p.oneOf(apm, 'allow_redirects', ['always', 'never']);
  return redirects ? { allow_redirects: redirects, enabled } : { enabled };
}

/**
 * Stripe refuses to confirm server-side, without a return_url, an intent whose automatic payment
 * methods may redirect the customer. Faking it here keeps that production failure out of our code.
 */
function requireReturnUrl(apm, returnUrl) {
  if (apm?.enabled && apm.allow_redirects !== 'never' && !returnUrl) {
    throw badParam('This PaymentIntent is configured to accept payment methods enabled in your Dashboard. Because some of these payment methods might redirect your customer off of your page, you must provide a `return_url`. If you don\'t want to accept redirect-based payment methods, set `automatic_payment_methods[enabled]` to `true` and `automatic_payment_methods[allow_redirects]` to `never` when creating Setup Intents and Payment Intents.', 'return_url');
  }
}

/** `payment_method_types[]=card`: the only type the fake can charge. @returns {string[] | undefined} */
function readPaymentMethodTypes(params) {
  const v = params.payment_method_types;
  if (v === undefined || v === '') return undefined;
  const list = Array.isArray(v) ? v : [v];
  for (const t of list) {
    if (t !== 'card') throw badParam(`The payment method type ${JSON.stringify(t)} is not supported by the payments fake; use card.`, 'payment_method_types');
  }
  return list;
}
