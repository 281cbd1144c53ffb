// Stripe's documented test PaymentMethods (docs.stripe.com/testing) and what confirming with each
// does. Real Stripe turns a `pm_card_…` token into a new PaymentMethod with its own `pm_…` id;
// so does the fake, and that id can be used again to confirm another intent.

/**
 * @typedef {{ brand: string, last4: string, funding?: string,
 *   decline?: { code: string, decline_code: string, message: string } }} TestCard
 */

const declined = (decline_code, message, code = 'card_declined') => ({ code, decline_code, message });
const GENERIC = declined('generic_decline', 'Your card was declined.');
const INSUFFICIENT = declined('insufficient_funds', 'Your card has insufficient funds.');

/** @type {Record<string, TestCard>} */
export const TEST_CARDS = {
  pm_card_visa: { brand: 'visa', last4: '4242' },
  pm_card_visa_debit: { brand: 'visa', last4: '5556', funding: 'debit' },
  pm_card_mastercard: { brand: 'mastercard', last4: '4444' },
  pm_card_amex: { brand: 'amex', last4: '8431' },
  pm_card_chargeDeclined: { brand: 'visa', last4: '0002', decline: GENERIC },
  pm_card_visa_chargeDeclined: { brand: 'visa', last4: '0002', decline: GENERIC },
  pm_card_chargeDeclinedInsufficientFunds: { brand: 'visa', last4: '9995', decline: INSUFFICIENT },
  pm_card_visa_chargeDeclinedInsufficientFunds: { brand: 'visa', last4: '9995', decline: INSUFFICIENT },
  pm_card_chargeDeclinedExpiredCard: {
    brand: 'visa', last4: '0069', decline: declined('expired_card', 'Your card has expired.', 'expired_card'),
  },
  pm_card_chargeDeclinedIncorrectCvc: {
    brand: 'visa', last4: '0127', decline: declined('incorrect_cvc', "Your card's security code is incorrect.", 'incorrect_cvc'),
  },
};

/**
 * The PaymentMethod object Stripe returns (and puts in a decline's `payment_method`).
 * @param {string} id
 * @param {TestCard} card
 * @param {number} created
 */
export function paymentMethodObject(id, card, created) {
  return {
    id,
    object: 'payment_method',
    billing_details: { address: null, email: null, name: null, phone: null },
    card: {
      brand: card.brand, country: 'US', exp_month: 12, exp_year: new Date().getFullYear() + 3,
      funding: card.funding ?? 'credit', last4: card.last4,
    },
    created,
    customer: null,
    livemode: false,
    metadata: {},
    type: 'card',
  };
}
