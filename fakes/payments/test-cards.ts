/**
 * The provider's documented test cards (its "testing" page: card numbers and the matching test
 * PaymentMethod ids such as `pm_card_visa`) and what the fake does with each. Any other number
 * that passes the Luhn check is refused as a live card used in test mode, as the provider does.
 */

/** What confirming a payment with the card does. */
export type CardBehaviour =
  | { kind: 'succeed' }
  | { kind: 'decline'; code: string; declineCode?: string; message: string }
  /** 3-D Secure: `always` for every payment; `unless_set_up` for one-off payments (the fake never sets cards up). */
  | { kind: 'authenticate'; when: 'always' | 'unless_set_up' };

export interface TestCard {
  number: string;
  /** The test PaymentMethod id that stands for this card (`payment_method=pm_card_visa`). */
  paymentMethod: string;
  brand: 'visa' | 'mastercard' | 'amex';
  funding: 'credit' | 'debit';
  country: string;
  behaviour: CardBehaviour;
}

const DECLINED = 'Your card was declined.';

export const TEST_CARDS: readonly TestCard[] = [
  {
    number: '4242424242424242',
    paymentMethod: 'pm_card_visa',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'succeed' },
  },
  {
    number: '4000056655665556',
    paymentMethod: 'pm_card_visa_debit',
    brand: 'visa',
    funding: 'debit',
    country: 'US',
    behaviour: { kind: 'succeed' },
  },
  {
    number: '5555555555554444',
    paymentMethod: 'pm_card_mastercard',
    brand: 'mastercard',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'succeed' },
  },
  {
    number: '378282246310005',
    paymentMethod: 'pm_card_amex',
    brand: 'amex',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'succeed' },
  },
  {
    number: '4000000000000002',
    paymentMethod: 'pm_card_chargeDeclined',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'decline', code: 'card_declined', declineCode: 'generic_decline', message: DECLINED },
  },
  {
    number: '4000000000009995',
    paymentMethod: 'pm_card_chargeDeclinedInsufficientFunds',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'decline', code: 'card_declined', declineCode: 'insufficient_funds', message: 'Your card has insufficient funds.' },
  },
  {
    number: '4000000000009987',
    paymentMethod: 'pm_card_chargeDeclinedLostCard',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'decline', code: 'card_declined', declineCode: 'lost_card', message: DECLINED },
  },
  {
    number: '4000000000009979',
    paymentMethod: 'pm_card_chargeDeclinedStolenCard',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'decline', code: 'card_declined', declineCode: 'stolen_card', message: DECLINED },
  },
  {
    number: '4000000000000069',
    paymentMethod: 'pm_card_chargeDeclinedExpiredCard',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'decline', code: 'expired_card', message: 'Your card has expired.' },
  },
  {
    number: '4000000000000127',
    paymentMethod: 'pm_card_chargeDeclinedIncorrectCvc',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'decline', code: 'incorrect_cvc', message: "Your card's security code is incorrect." },
  },
  {
    number: '4000000000000119',
    paymentMethod: 'pm_card_chargeDeclinedProcessingError',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: {
      kind: 'decline',
      code: 'processing_error',
      message: 'An error occurred while processing your card. Try again in a little bit.',
    },
  },
  {
    number: '4000002500003155',
    paymentMethod: 'pm_card_authenticationRequiredOnSetup',
    brand: 'visa',
    funding: 'credit',
    country: 'IE',
    behaviour: { kind: 'authenticate', when: 'unless_set_up' },
  },
  {
    number: '4000002760003184',
    paymentMethod: 'pm_card_authenticationRequired',
    brand: 'visa',
    funding: 'credit',
    country: 'DE',
    behaviour: { kind: 'authenticate', when: 'always' },
  },
  {
    number: '4000000000003220',
    paymentMethod: 'pm_card_threeDSecure2Required',
    brand: 'visa',
    funding: 'credit',
    country: 'US',
    behaviour: { kind: 'authenticate', when: 'always' },
  },
];

/** The decline of a payment that needed authentication it could not get (off-session, or refused). */
export const AUTHENTICATION_REQUIRED: CardBehaviour = {
  kind: 'decline',
  code: 'authentication_required',
  declineCode: 'authentication_required',
  message: 'Your card was declined. This transaction requires authentication.',
};

/** Luhn checksum (ISO/IEC 7812-1 annex B; common practice, no source beyond the standard). */
export function passesLuhn(digits: string): boolean {
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return sum % 10 === 0;
}

export function testCardByNumber(number: string): TestCard | undefined {
  return TEST_CARDS.find((c) => c.number === number);
}

export function testCardByPaymentMethod(id: string): TestCard | undefined {
  return TEST_CARDS.find((c) => c.paymentMethod === id);
}
