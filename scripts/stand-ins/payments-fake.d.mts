// Types for payments-fake.mjs, so TypeScript (tests, scripts) can import it.

export interface PaymentsFakeOptions {
  /** Address to bind; loopback unless you mean otherwise. Default '127.0.0.1'. */
  host?: string;
  /** 0 (the default) picks a free port. */
  port?: number;
  /** Where events are POSTed. Without it, events are only recorded. */
  webhookUrl?: string;
  /** The endpoint signing secret (whsec_…); required with webhookUrl. */
  webhookSecret?: string;
  /** API keys must start with this. Default 'sk_test_'. */
  apiKeyPrefix?: string;
  /** One line per request (method, path, status) and per webhook attempt; never bodies or keys. */
  log?: (line: string) => void;
}

/** A Stripe event, as delivered. */
export interface PaymentsFakeEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  type: string;
  data: { object: { id: string; object: string; [field: string]: unknown } };
  livemode: false;
  /** 1 until the receiver has answered 2xx, then 0 (always 0 without a webhookUrl). */
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
}

export interface PaymentsFake {
  /** e.g. 'http://127.0.0.1:12111' */
  url: string;
  port: number;
  /** Stops listening, drops open connections and pending webhook retries. */
  close(): Promise<void>;
  /** Every event so far, oldest first. */
  events(): PaymentsFakeEvent[];
  /** Delivers one event again (same body, fresh signature); resolves to the receiver's HTTP status. */
  resend(eventId: string): Promise<number>;
}

export function startPaymentsFake(options?: PaymentsFakeOptions): Promise<PaymentsFake>;
