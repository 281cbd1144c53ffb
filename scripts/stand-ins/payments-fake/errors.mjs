// Errors in Stripe's wire shape: `{ error: { type, code, message, param, doc_url, … } }`.
// Handlers throw these; the server turns them into responses. Nothing else (no stack, no
// internal detail) ever reaches a client.

/**
 * @typedef {{ type: string, message: string, code?: string, param?: string, doc_url?: string,
 *   decline_code?: string, [extra: string]: unknown }} StripeErrorBody
 */

export class FakeStripeError extends Error {
  /**
   * @param {number} status HTTP status
   * @param {StripeErrorBody} body the object that goes under `error`
   * @param {{ validation?: boolean }} [opts] validation: the request was refused before any work
   *   began. Stripe saves no idempotent result for those, so a corrected retry with the same key runs.
   */
  constructor(status, body, { validation = false } = {}) {
    super(body.message);
    this.status = status;
    this.body = body;
    this.validation = validation;
  }
}

/** Stripe's docs link for an error code, e.g. card_declined → …/error-codes/card-declined. */
export function docUrl(code) {
  return `https://stripe.com/docs/error-codes/${code.replace(/_/g, '-')}`;
}

/**
 * A 400 invalid_request_error.
 * @param {string} message
 * @param {{ param?: string, code?: string, validation?: boolean }} [opts]
 */
export function invalid(message, { param, code, validation = false } = {}) {
  /** @type {StripeErrorBody} */
  const body = { type: 'invalid_request_error', message };
  if (code) Object.assign(body, { code, doc_url: docUrl(code) });
  if (param) body.param = param;
  return new FakeStripeError(400, body, { validation });
}

/** A parameter problem found before any work began (never saved for idempotent replay). */
export function badParam(message, param, code) {
  return invalid(message, { param, code, validation: true });
}

/**
 * Stripe answers an unknown id in the path with 404 and an unknown id in the body with 400,
 * both as resource_missing ("No such payment_intent: 'pi_…'").
 * @param {string} noun e.g. 'payment_intent', 'PaymentMethod'
 * @param {string} id
 * @param {string} param
 * @param {number} [status] 404 or 400
 */
export function noSuch(noun, id, param, status = 404) {
  return new FakeStripeError(
    status,
    { type: 'invalid_request_error', code: 'resource_missing', doc_url: docUrl('resource_missing'), message: `No such ${noun}: '${id}'`, param },
    { validation: true },
  );
}

/** 404 for a method and path this fake (and Stripe) does not serve. */
export function unrecognizedUrl(method, path) {
  return new FakeStripeError(
    404,
    { type: 'invalid_request_error', message: `Unrecognized request URL (${method}: ${path}). Please see https://stripe.com/docs or we can help at https://support.stripe.com/.` },
    { validation: true },
  );
}

/** 500 api_error for a fault in the fake itself: the message says so and nothing more. */
export function internal() {
  return new FakeStripeError(500, { type: 'api_error', message: 'An unexpected error occurred in the payments fake.' });
}
