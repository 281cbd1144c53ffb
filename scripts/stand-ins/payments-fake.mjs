#!/usr/bin/env node
// A local stand-in for the part of Stripe's REST API that Crestline calls (PaymentIntents,
// refunds, signed webhook events), for machines with no internet: development, CI, the demo.
// The real `stripe` SDK is pointed at it with { host, port, protocol: 'http' }; in production the
// SDK gets a real key and talks to Stripe, with no code change. State lives in memory only.
//
//   node scripts/stand-ins/payments-fake.mjs --port 12111 \
//     --webhook http://127.0.0.1:4321/api/payments/webhook --secret whsec_xxx
//
// Never logs request bodies, metadata or keys: one line per request (method, path, status).
import http from 'node:http';
import { realpathSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { FakeStripeError, badParam, internal, invalid, noSuch, unrecognizedUrl } from './payments-fake/errors.mjs';
import { fingerprint, parseForm } from './payments-fake/form.mjs';
import { newId } from './payments-fake/ids.mjs';
import { createLedger } from './payments-fake/ledger.mjs';
import { createWebhooks } from './payments-fake/webhooks.mjs';

/** Put in events when a request names no Stripe-Version (the SDK always does). */
const DEFAULT_API_VERSION = '2026-10-28.endive';
const MAX_BODY_BYTES = 1024 * 1024;
const NO_KEY = "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY'). See https://stripe.com/docs/api#authentication for details, or we can help at https://support.stripe.com/.";

/**
 * @typedef {{ host?: string, port?: number, webhookUrl?: string, webhookSecret?: string,
 *   apiKeyPrefix?: string, log?: (line: string) => void }} PaymentsFakeOptions
 * @typedef {import('./payments-fake/webhooks.mjs').StripeEvent} StripeEvent
 */

/**
 * Starts the fake and resolves once it listens.
 * @param {PaymentsFakeOptions} [options]
 * @returns {Promise<{ url: string, port: number, close(): Promise<void>, events(): StripeEvent[],
 *   resend(eventId: string): Promise<number> }>}
 */
export async function startPaymentsFake({ host = '127.0.0.1', port = 0, webhookUrl, webhookSecret, apiKeyPrefix = 'sk_test_', log = () => {} } = {}) {
  if (webhookUrl && !webhookSecret) throw new Error('payments fake: webhookSecret is required with webhookUrl');
  if (webhookUrl) new URL(webhookUrl); // throws now on a malformed URL rather than at the first event
  const ledger = createLedger();
  const hooks = createWebhooks({ webhookUrl, webhookSecret, log });
  /** Saved first answers, per API key and Idempotency-Key. @type {Map<string, { endpoint: string, print: string, status: number, text: string, requestId: string }>} */
  const saved = new Map();

  /** @typedef {{ params: any, id: string, emit: (type: string, object: any, intentId: string) => void }} RouteContext */
  /** @type {{ method: string, path: RegExp, idempotent?: boolean, run: (c: RouteContext) => any }[]} */
  const routes = [
    { method: 'POST', path: /^\/v1\/payment_intents$/, idempotent: true, run: (c) => ledger.createIntent(c.params, c) },
    { method: 'GET', path: /^\/v1\/payment_intents\/([^/]+)$/, run: (c) => ledger.retrieveIntent(c.id, c.params) },
    { method: 'POST', path: /^\/v1\/payment_intents\/([^/]+)\/confirm$/, idempotent: true, run: (c) => ledger.confirmIntent(c.id, c.params, c) },
    { method: 'POST', path: /^\/v1\/payment_intents\/([^/]+)\/cancel$/, idempotent: true, run: (c) => ledger.cancelIntent(c.id, c.params, c) },
    { method: 'POST', path: /^\/v1\/refunds$/, idempotent: true, run: (c) => ledger.createRefund(c.params, c) },
    { method: 'GET', path: /^\/v1\/refunds\/([^/]+)$/, run: (c) => ledger.retrieveRefund(c.id, c.params) },
    { method: 'GET', path: /^\/v1\/charges\/([^/]+)$/, run: (c) => ledger.retrieveCharge(c.id, c.params) },
    // Test hooks, behind the same API key. Not Stripe's; named so no one mistakes them for it.
    {
      method: 'GET', path: /^\/_fake\/events$/,
      run: (c) => ({ object: 'list', data: hooks.list().filter((e) => !c.params.type || e.type === c.params.type), has_more: false, url: '/_fake/events' }),
    },
    { method: 'POST', path: /^\/_fake\/events\/([^/]+)\/resend$/, run: (c) => resendRoute(c.id) },
  ];

  async function resendRoute(id) {
    if (!hooks.has(id)) throw noSuch('event', id, 'id');
    if (!hooks.configured) throw invalid('This payments fake was started without a webhookUrl, so there is nowhere to resend events.');
    try {
      return { object: 'webhook_delivery', event: id, receiver_status: await hooks.resend(id) };
    } catch (err) {
      throw new FakeStripeError(502, { type: 'api_error', message: `The webhook receiver could not be reached (${err?.code ?? 'error'}).` });
    }
  }

  /** @param {http.IncomingMessage} req @param {http.ServerResponse} res */
  async function handle(req, res) {
    const requestId = newId('req', 14);
    const method = req.method ?? 'GET';
    const url = new URL(req.url ?? '/', 'http://fake.invalid');
    const apiVersion = single(req.headers['stripe-version']) ?? DEFAULT_API_VERSION;
    const idemKey = method === 'POST' ? single(req.headers['idempotency-key']) : undefined;
    const send = (status, text, extra = {}) => {
      res.writeHead(status, {
        'Content-Type': 'application/json', 'Content-Length': Buffer.byteLength(text), 'Cache-Control': 'no-cache, no-store',
        'Request-Id': requestId, 'Stripe-Version': apiVersion, ...(idemKey ? { 'Idempotency-Key': idemKey } : {}), ...extra,
      });
      res.end(text);
      log(`${method} ${url.pathname} ${status}`);
    };
    /** @typedef {{ status: number, text: string, validation: boolean }} Outcome */
    /** @returns {Outcome} */
    const ok = (value) => ({ status: 200, text: json(value), validation: false });
    /** Any fault becomes Stripe's error shape, never a stack trace. @returns {Outcome} */
    const fault = (err) => {
      if (!(err instanceof FakeStripeError)) log(`${method} ${url.pathname} internal fault: ${err?.name ?? 'Error'}`);
      const e = err instanceof FakeStripeError ? err : internal();
      return { status: e.status, text: json({ error: e.body }), validation: e.validation };
    };
    /**
     * Runs `fn`. A synchronous one (every /v1 route) is answered without yielding, so nothing
     * can slip in between the idempotency check and saving the answer.
     * @returns {Outcome | Promise<Outcome>}
     */
    const answer = (fn) => {
      try {
        const value = fn();
        return value instanceof Promise ? value.then(ok, fault) : ok(value);
      } catch (err) {
        return fault(err);
      }
    };

    const body = await readBody(req);
    const apiKey = keyFrom(req.headers.authorization);
    if (!apiKey || !apiKey.startsWith(apiKeyPrefix) || apiKey.length === apiKeyPrefix.length) {
      const message = apiKey ? `Invalid API Key provided: ${mask(apiKey)}` : NO_KEY;
      return send(401, json({ error: { type: 'invalid_request_error', message } }), { 'WWW-Authenticate': 'Basic realm="Stripe"' });
    }
    const route = routes.find((r) => r.method === method && r.path.test(url.pathname));
    const pre = /** @type {Outcome} */ (answer(() => {
      if (!route) throw unrecognizedUrl(method, url.pathname);
      if (body === null) throw badParam(`The request body is larger than ${MAX_BODY_BYTES} bytes.`, undefined);
      if (method === 'POST' && /json/i.test(req.headers['content-type'] ?? '')) {
        throw badParam('Stripe\'s API takes form-encoded bodies (application/x-www-form-urlencoded), not JSON.', undefined);
      }
      if (idemKey !== undefined && idemKey.length > 255) throw badParam('Idempotency-Key must be 255 characters or fewer.', undefined);
      return null;
    }));
    if (pre.status !== 200 || !route) return send(pre.status, pre.text);

    let params;
    let id = '';
    const parsed = /** @type {Outcome} */ (answer(() => {
      params = parseForm(method === 'GET' ? url.search.slice(1) : body ?? '');
      id = decodePathPart(route.path.exec(url.pathname)?.[1] ?? '');
      return null;
    }));
    if (parsed.status !== 200) return send(parsed.status, parsed.text);

    // Idempotency (POSTs to Stripe's routes): the same key and parameters get the first answer
    // again, byte for byte, and change nothing; the same key with anything else is refused.
    const slot = `${apiKey}\n${idemKey}`;
    const endpoint = `${method} ${url.pathname}`;
    const print = fingerprint(params);
    const prior = route.idempotent && idemKey ? saved.get(slot) : undefined;
    if (prior) {
      const message = prior.endpoint !== endpoint
        ? `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${prior.endpoint}' vs '${endpoint}'). Try using a key other than '${idemKey}' if you meant to execute a different request.`
        : prior.print !== print
          ? `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idemKey}' if you meant to execute a different request.`
          : null;
      if (message) return send(400, json({ error: { type: 'idempotency_error', message } }));
      return send(prior.status, prior.text, { 'Idempotent-Replayed': 'true', 'Original-Request': prior.requestId });
    }

    /** @type {RouteContext} */
    const ctx = {
      params, id,
      emit: (type, object, intentId) => hooks.emit(type, object, {
        queueKey: intentId, apiVersion, request: { id: requestId, idempotency_key: idemKey ?? null },
      }),
    };
    let result = answer(() => route.run(ctx));
    if (result instanceof Promise) result = await result; // only the async test hooks; never between check and save
    // Stripe saves an answer once the work has begun (declines and 500s included), but not a
    // refusal of the parameters: a corrected retry with the same key then runs.
    if (route.idempotent && idemKey && !result.validation) {
      saved.set(slot, { endpoint, print, status: result.status, text: result.text, requestId });
    }
    send(result.status, result.text);
  }

  const server = http.createServer((req, res) => {
    handle(req, res).catch(() => {
      if (!res.headersSent) res.writeHead(500, { 'Content-Type': 'application/json' });
      res.end(json({ error: internal().body }));
    });
  });
  await new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => { server.off('error', reject); resolve(undefined); });
  });
  const address = /** @type {import('node:net').AddressInfo} */ (server.address());
  const shownHost = address.address.includes(':') ? `[${address.address}]` : address.address;

  return {
    url: `http://${shownHost}:${address.port}`,
    port: address.port,
    events: () => hooks.list(),
    resend: (eventId) => hooks.resend(eventId),
    close() {
      hooks.close();
      return new Promise((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections(); // the SDK keeps sockets alive; do not wait for them
      });
    },
  };
}

const json = (value) => JSON.stringify(value, null, 2);
/** An id from the path; a malformed %-escape is kept as typed (and so is simply not found). */
const decodePathPart = (s) => { try { return decodeURIComponent(s); } catch { return s; } };
const single = (h) => (Array.isArray(h) ? h[0] : h);

/** The key from `Bearer sk_…` (the SDK) or `Basic base64(sk_…:)` (curl -u sk_…:). */
function keyFrom(header) {
  const m = /^(\w+)\s+(\S+)\s*$/.exec(header ?? '');
  if (!m) return undefined;
  if (/^bearer$/i.test(m[1])) return m[2];
  if (/^basic$/i.test(m[1])) return Buffer.from(m[2], 'base64').toString('utf8').split(':')[0] || undefined;
  return undefined;
}

/** Stripe shows only a wrong key's kind and last four characters. */
function mask(key) {
  const kind = /^[a-z]+_(?:test_|live_)?/.exec(key)?.[0] ?? '';
  return key.length <= kind.length + 4 ? '*'.repeat(key.length) : `${kind}${'*'.repeat(key.length - kind.length - 4)}${key.slice(-4)}`;
}

/** The body as text, or null when it is over the limit (read to the end either way). */
function readBody(req) {
  return new Promise((resolve, reject) => {
    /** @type {Buffer[]} */ const chunks = [];
    let size = 0;
    req.on('data', (chunk) => { size += chunk.length; if (size <= MAX_BODY_BYTES) chunks.push(chunk); });
    req.on('end', () => resolve(size > MAX_BODY_BYTES ? null : Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

// ---- command line -------------------------------------------------------------------------

const USAGE = `usage: node scripts/stand-ins/payments-fake.mjs [--port 12111] [--host 127.0.0.1]
       [--webhook <url> --secret <whsec_…>] [--api-key-prefix sk_test_] [--verbose]`;

async function main(argv) {
  let values;
  try {
    ({ values } = parseArgs({
      args: argv,
      options: {
        port: { type: 'string', default: '12111' }, host: { type: 'string', default: '127.0.0.1' },
        webhook: { type: 'string' }, secret: { type: 'string' }, 'api-key-prefix': { type: 'string', default: 'sk_test_' },
        verbose: { type: 'boolean', default: false }, help: { type: 'boolean', default: false },
      },
    }));
  } catch (err) {
    console.error(`payments fake: ${err.message}\n${USAGE}`);
    process.exit(2);
  }
  if (values.help) return console.log(USAGE);
  const port = Number(values.port);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    console.error(`payments fake: --port must be a number from 0 to 65535\n${USAGE}`);
    process.exit(2);
  }
  let fake;
  try {
    fake = await startPaymentsFake({
      host: values.host, port, webhookUrl: values.webhook, webhookSecret: values.secret, apiKeyPrefix: values['api-key-prefix'],
      log: values.verbose ? (line) => console.error(line) : undefined,
    });
  } catch (err) {
    console.error(err.code ? `payments fake: cannot listen on ${values.host}:${port}: ${err.code}` : err.message);
    process.exit(1);
  }
  console.log(`payments fake listening on ${fake.url}`);
  let stopping = false;
  const stop = () => {
    if (stopping) process.exit(1); // a second signal: do not wait
    stopping = true;
    fake.close().then(() => process.exit(0));
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

const invoked = (() => {
  try {
    return process.argv[1] ? pathToFileURL(realpathSync(process.argv[1])).href : '';
  } catch {
    return '';
  }
})();
if (invoked === import.meta.url) main(process.argv.slice(2));
