// Stripe events: recorded, then POSTed to the receiver signed exactly as Stripe signs them, so
// the app verifies them with the real `stripe.webhooks.constructEvent`. Delivery happens after the
// API response, one event at a time per PaymentIntent (so a receiver sees an intent's events in
// the order they happened), and a failed attempt is retried with a growing pause.
import { createHmac } from 'node:crypto';
import http from 'node:http';
import https from 'node:https';
import { newId, unixNow } from './ids.mjs';

/** Pauses before the 2nd…6th attempt; after the 6th the event is left undelivered. */
export const RETRY_DELAYS_MS = [500, 1000, 2000, 4000, 8000];
const ATTEMPT_TIMEOUT_MS = 10_000;

/**
 * The Stripe-Signature header: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw body>">`,
 * keyed with the endpoint's whole signing secret (`whsec_…` included), as Stripe does.
 * @param {string} payload the exact body that is sent
 * @param {string} secret
 * @param {number} [t]
 */
export function signatureHeader(payload, secret, t = unixNow()) {
  const v1 = createHmac('sha256', secret).update(`${t}.${payload}`, 'utf8').digest('hex');
  return `t=${t},v1=${v1}`;
}

/**
 * @typedef {{ id: string, object: 'event', api_version: string, created: number, type: string,
 *   data: { object: Record<string, any> }, livemode: false, pending_webhooks: number,
 *   request: { id: string | null, idempotency_key: string | null } }} StripeEvent
 * @typedef {{ event: StripeEvent, payload: string, delivered: boolean }} EventRecord
 */

/**
 * @param {{ webhookUrl?: string, webhookSecret?: string, log: (line: string) => void }} opts
 */
export function createWebhooks({ webhookUrl, webhookSecret, log }) {
  const target = webhookUrl ? new URL(webhookUrl) : null;
  /** @type {EventRecord[]} */ const records = [];
  /** @type {Map<string, EventRecord>} */ const byId = new Map();
  /** @type {Map<string, Promise<void>>} */ const queues = new Map(); // PaymentIntent id → tail of its deliveries
  /** @type {Map<NodeJS.Timeout, () => void>} */ const pauses = new Map();
  /** @type {Set<http.ClientRequest>} */ const inFlight = new Set();
  let closed = false;

  /** One POST of the stored body with a fresh signature. Resolves to the receiver's status. */
  function post(payload) {
    return new Promise((resolve, reject) => {
      if (!target || !webhookSecret) return reject(new Error('no webhookUrl configured'));
      const lib = target.protocol === 'https:' ? https : http;
      const req = lib.request(target, {
        method: 'POST',
        agent: false, // no pooled sockets left behind after close()
        timeout: ATTEMPT_TIMEOUT_MS,
        headers: {
          'Content-Type': 'application/json; charset=utf-8',
          'Content-Length': Buffer.byteLength(payload),
          'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)',
          'Stripe-Signature': signatureHeader(payload, webhookSecret),
        },
      }, (res) => {
        res.on('error', reject);
        res.on('end', () => resolve(res.statusCode ?? 0));
        res.resume();
      });
      inFlight.add(req);
      req.on('close', () => inFlight.delete(req));
      req.on('timeout', () => req.destroy(new Error('timed out')));
      req.on('error', reject);
      req.end(payload);
    });
  }

  /** A pause that close() cuts short. */
  function pause(ms) {
    return new Promise(/** @param {(v?: unknown) => void} resolve */ (resolve) => {
      const timer = setTimeout(() => { pauses.delete(timer); resolve(); }, ms);
      pauses.set(timer, resolve);
    });
  }

  /** @param {EventRecord} rec */
  async function deliver(rec) {
    for (let attempt = 1; !closed; attempt++) {
      const outcome = await post(rec.payload).then(String, (err) => err.code ?? err.message);
      log(`webhook ${rec.event.type} ${rec.event.id} attempt ${attempt} -> ${outcome}`);
      if (/^2\d\d$/.test(outcome)) {
        rec.delivered = true;
        return;
      }
      if (attempt > RETRY_DELAYS_MS.length) return;
      await pause(RETRY_DELAYS_MS[attempt - 1]);
    }
  }

  return {
    /**
     * Records an event with a snapshot of `object` and queues it for delivery.
     * @param {string} type
     * @param {Record<string, any>} object
     * @param {{ queueKey: string, apiVersion: string, request: StripeEvent['request'] }} meta
     */
    emit(type, object, { queueKey, apiVersion, request }) {
      /** @type {StripeEvent} */
      const event = {
        id: newId('evt'), object: 'event', api_version: apiVersion, created: unixNow(),
        data: { object: structuredClone(object) }, livemode: false,
        pending_webhooks: target ? 1 : 0, request, type,
      };
      // The body is fixed now: every delivery and resend sends these same bytes.
      const rec = { event, payload: JSON.stringify(event, null, 2), delivered: false };
      records.push(rec);
      byId.set(event.id, rec);
      if (!target || closed) return;
      const tail = (queues.get(queueKey) ?? Promise.resolve()).then(() => deliver(rec));
      queues.set(queueKey, tail);
      tail.then(() => { if (queues.get(queueKey) === tail) queues.delete(queueKey); });
    },

    /** Events in the order they happened; pending_webhooks is 0 once delivered. */
    list() {
      return records.map((r) => ({ ...structuredClone(r.event), pending_webhooks: target && !r.delivered ? 1 : 0 }));
    },

    has(id) {
      return byId.has(id);
    },

    /** Sends one event again now (one attempt, fresh signature); resolves to the receiver's status. */
    async resend(id) {
      const rec = byId.get(id);
      if (!rec) throw new Error(`No such event: '${id}'`);
      const status = await post(rec.payload);
      log(`webhook ${rec.event.type} ${rec.event.id} resend -> ${status}`);
      if (status >= 200 && status < 300) rec.delivered = true;
      return status;
    },

    get configured() {
      return Boolean(target && webhookSecret);
    },

    /** Stops retries and drops deliveries in progress. */
    close() {
      closed = true;
      for (const [timer, wake] of pauses) { clearTimeout(timer); wake(); }
      pauses.clear();
      for (const req of inFlight) req.destroy();
    },
  };
}
