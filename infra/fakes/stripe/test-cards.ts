/** What a test card or test payment method does when it pays. */
export type CardOutcome = 'succeed' | 'decline';

/** Card numbers the hosted payment page accepts (Stripe's public test numbers). */
export const TEST_CARD_NUMBERS: Record<string, CardOutcome> = {
  '4242424242424242': 'succeed',
  '4000000000000002': 'decline',
};

/** Test payment methods and tokens `POST /v1/invoices/:id/pay` accepts, with Stripe's names. */
export const TEST_PAYMENT_METHODS: Record<string, CardOutcome> = {
  pm_card_visa: 'succeed',
  pm_card_mastercard: 'succeed',
  tok_visa: 'succeed',
  tok_mastercard: 'succeed',
  pm_card_chargeDeclined: 'decline',
  pm_card_visa_chargeDeclined: 'decline',
  tok_chargeDeclined: 'decline',
  tok_visa_chargeDeclined: 'decline',
};

/** Spaces and dashes are how people type card numbers; they do not count. */
export function normalizeCardNumber(input: string): string {
  return input.replace(/[\s-]/g, '');
}
