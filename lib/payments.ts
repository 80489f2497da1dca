// What the app and the server both know about paying: the payments API's test payment methods that Fieldfold
// offers (ids only — a card number never reaches Fieldfold's server), and the plain words for why a payment
// failed. The ids are the API's documented test payment methods (docs.stripe.com/testing, "Test card numbers"
// and "Declined payments"); they only work against the test-mode API or the local fake.

export const TEST_PAYMENT_METHODS = [
  { id: 'pm_card_visa', label: 'Test card that pays', detail: 'Visa ending 4242, for testing' },
  { id: 'pm_card_chargeDeclined', label: 'Test card that is declined', detail: 'Visa ending 0002, for testing' },
  { id: 'pm_card_chargeDeclinedInsufficientFunds', label: 'Test card without enough funds', detail: 'Visa ending 9995, for testing' },
] as const;

export type TestPaymentMethodId = (typeof TEST_PAYMENT_METHODS)[number]['id'];

export const TEST_PAYMENT_METHOD_IDS: readonly TestPaymentMethodId[] = TEST_PAYMENT_METHODS.map((m) => m.id);

export function isTestPaymentMethod(id: unknown): id is TestPaymentMethodId {
  return typeof id === 'string' && (TEST_PAYMENT_METHOD_IDS as readonly string[]).includes(id);
}

/** The API's decline codes Fieldfold explains, in the words a grower reads on the invoice screen. */
const DECLINE_WORDS: Record<string, string> = {
  insufficient_funds: 'The card was declined because it does not have enough funds. Try another card, or pay once funds are available.',
  generic_decline: 'The card was declined. The bank gave no reason; try another card or ask the bank.',
  expired_card: 'The card was declined because it has expired. Try another card.',
};

/** A payment failure in plain words, from the API's error code and decline code. */
export function paymentFailureInWords(code: string | null, declineCode: string | null): string {
  if (declineCode && DECLINE_WORDS[declineCode]) return DECLINE_WORDS[declineCode];
  if (code === 'expired_card') return DECLINE_WORDS.expired_card;
  if (code === 'card_declined') return DECLINE_WORDS.generic_decline;
  return 'The payment did not go through. Nothing was charged; try again or use another card.';
}
