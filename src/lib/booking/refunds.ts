import type { PaymentPolicy } from '../schemas/settings';

export interface RefundDecision {
  /** What goes back to the patient, in cents. */
  refundCents: number;
  /** What the clinic keeps, in cents. */
  keptCents: number;
  /** Why, in words for the ledger and the cancellation e-mail. */
  reason: string;
}

/**
 * Applies the cancellation policy: cancelled at least `fullRefundHoursAhead` before the start,
 * everything paid comes back; later, the deposit is kept and any balance comes back.
 *
 * @example refundOnCancel({ policy: { fullRefundHoursAhead: 24 }, hoursAhead: 30, depositPaidCents: 5000, balancePaidCents: 0 }) → refund 5000
 */
export function refundOnCancel(input: {
  policy: PaymentPolicy;
  hoursAhead: number;
  depositPaidCents: number;
  balancePaidCents: number;
}): RefundDecision {
  const { policy, hoursAhead, depositPaidCents, balancePaidCents } = input;
  if (hoursAhead >= policy.fullRefundHoursAhead) {
    return {
      refundCents: depositPaidCents + balancePaidCents,
      keptCents: 0,
      reason: `Cancelled ${policy.fullRefundHoursAhead} hours or more before the appointment: full refund.`,
    };
  }
  return {
    refundCents: balancePaidCents,
    keptCents: depositPaidCents,
    reason: `Cancelled less than ${policy.fullRefundHoursAhead} hours before the appointment: the deposit is kept.`,
  };
}

const moneyFormats = new Map<string, Intl.NumberFormat>();

/** Formats integer cents with a currency code, e.g. formatMoney(7500, 'USD') → "$75.00". */
export function formatMoney(cents: number, currency: string): string {
  let format = moneyFormats.get(currency);
  if (!format) moneyFormats.set(currency, (format = new Intl.NumberFormat('en-US', { style: 'currency', currency })));
  return format.format(cents / 100);
}
