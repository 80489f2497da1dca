// The payments API's test payment methods that Fieldfold offers (labelled for testing): ids the API accepts in
// test mode in place of a real card, each standing for one of its documented test card numbers. No card number
// ever reaches Fieldfold's server; the fake only knows these ids.
// Source: the API's testing guide, "Test card numbers" and "Declined payments" tables (docs.stripe.com/testing).

export interface TestCard {
  id: string;
  brand: 'visa';
  last4: string;
  outcome: { kind: 'succeeds' } | { kind: 'declined'; code: 'card_declined'; declineCode: string; message: string };
}

export const TEST_CARDS: Record<string, TestCard> = {
  // 4242 4242 4242 4242: succeeds.
  pm_card_visa: { id: 'pm_card_visa', brand: 'visa', last4: '4242', outcome: { kind: 'succeeds' } },
  // 4000 0000 0000 0002: always declined, decline code generic_decline.
  pm_card_chargeDeclined: {
    id: 'pm_card_chargeDeclined',
    brand: 'visa',
    last4: '0002',
    outcome: { kind: 'declined', code: 'card_declined', declineCode: 'generic_decline', message: 'Your card was declined.' },
  },
  // 4000 0000 0000 9995: declined, decline code insufficient_funds.
  pm_card_chargeDeclinedInsufficientFunds: {
    id: 'pm_card_chargeDeclinedInsufficientFunds',
    brand: 'visa',
    last4: '9995',
    outcome: { kind: 'declined', code: 'card_declined', declineCode: 'insufficient_funds', message: 'Your card has insufficient funds.' },
  },
};

/** The API's payment_method object for a test id (test cards expire far in the future). */
export function paymentMethodObject(card: TestCard, created: number) {
  return {
    id: card.id,
    object: 'payment_method' as const,
    allow_redisplay: 'unspecified' as const,
    billing_details: { address: null, email: null, name: null, phone: null, tax_id: null },
    card: {
      brand: card.brand,
      checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: 'unchecked' },
      country: 'US',
      display_brand: card.brand,
      exp_month: 12,
      exp_year: new Date(created * 1000).getUTCFullYear() + 3,
      funding: 'credit',
      last4: card.last4,
      networks: { available: [card.brand], preferred: null },
      three_d_secure_usage: { supported: true },
      wallet: null,
    },
    created,
    customer: null,
    livemode: false,
    metadata: {},
    type: 'card' as const,
  };
}
