import Stripe from 'stripe';
import { config } from '../config';
import { HttpError } from '../http/errors';

let client: Stripe | undefined;

/**
 * The Stripe SDK, pointed at Stripe itself or, when STRIPE_API_BASE is set, at the local
 * payments fake (same SDK, only host and port change).
 */
export function payments(): Stripe {
  if (client) return client;
  const { STRIPE_SECRET_KEY: key, STRIPE_API_BASE: base } = config();
  if (!key) throw new HttpError(503, 'DEPENDENCY_DOWN', 'Card payments are not set up on this server (no payment key). Nothing was charged.');
  const url = base ? new URL(base) : undefined;
  client = new Stripe(key, {
    maxNetworkRetries: 1,
    timeout: 15_000,
    ...(url ? { host: url.hostname, port: Number(url.port || (url.protocol === 'https:' ? 443 : 80)), protocol: url.protocol.replace(':', '') as 'http' | 'https' } : {}),
  });
  return client;
}

/** Test mode offers the provider's documented test payment methods instead of its card element. */
export function paymentsMode(): 'test' | 'live' | 'off' {
  const key = config().STRIPE_SECRET_KEY;
  if (!key) return 'off';
  return key.includes('_test_') ? 'test' : 'live';
}

/** True for errors that mean the provider could not be reached (so the outcome is unknown). */
export function providerUnreachable(error: unknown): boolean {
  return error instanceof Stripe.errors.StripeConnectionError || error instanceof Stripe.errors.StripeAPIError || (error as { type?: string })?.type === 'StripeConnectionError';
}

export const PAYMENTS_DOWN_MESSAGE =
  'The card payment service could not be reached. The booking is kept and nothing is lost; the payment will be confirmed or can be tried again in a minute.';
