import { endpoint } from '../../../server/http/endpoint';
import { HttpError } from '../../../server/http/errors';
import { applyEvent, verifyEvent } from '../../../server/payments/webhook';

const MAX_BYTES = 256 * 1024;

/**
 * Payment-service notifications. Public (the provider has no session); trusted only through
 * the signature, which is checked against the raw body before anything is read from it.
 */
export const POST = endpoint({ roles: 'public' }, async ({ context }) => {
  const raw = await context.request.text();
  if (raw.length > MAX_BYTES) throw new HttpError(413, 'PAYLOAD_TOO_LARGE', 'The notification is too large.');
  const event = verifyEvent(raw, context.request.headers.get('stripe-signature'));
  const { outcome } = await applyEvent(event);
  return { received: true, outcome };
});
