// The test cards the hosted pages accept. Numbers are the ones Stripe documents for testing
// (4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined); anything else is refused with a hint.
import type { CardBehaviour } from './state';

export const TEST_CARDS: Record<string, { brand: string; behaviour: CardBehaviour }> = {
  '4242424242424242': { brand: 'visa', behaviour: 'succeed' },
  '4000000000000002': { brand: 'visa', behaviour: 'decline' },
};

export const DECLINED_MESSAGE = 'Your card was declined.';
export const USE_TEST_CARD_MESSAGE =
  'Use a test card number: 4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined.';

export interface CardInput {
  number: string;
  expiry: string;
  cvc: string;
  name: string;
}

export interface CheckedCard {
  number: string;
  brand: string;
  behaviour: CardBehaviour;
  last4: string;
  expMonth: number;
  expYear: number;
  name: string | null;
}

export type CardField = 'card_number' | 'card_expiry' | 'card_cvc';

export type CardCheck = { ok: true; card: CheckedCard } | { ok: false; field: CardField; message: string };

export function normaliseNumber(raw: string): string {
  return raw.replace(/[\s-]/g, '');
}

/** Parses "MM / YY", "MM/YY", "MMYY" or "MM/YYYY". */
export function parseExpiry(raw: string): { month: number; year: number } | null {
  const m = /^\s*(\d{1,2})\s*\/?\s*(\d{2}|\d{4})\s*$/.exec(raw);
  if (!m) return null;
  const month = Number(m[1]);
  const year = m[2].length === 2 ? 2000 + Number(m[2]) : Number(m[2]);
  if (month < 1 || month > 12) return null;
  return { month, year };
}

/** Checks the form the way a card page would, before any charge: format first, then the test number. */
export function checkCard(input: CardInput, today: Date = new Date()): CardCheck {
  const number = normaliseNumber(input.number);
  if (!/^\d{12,19}$/.test(number)) {
    return { ok: false, field: 'card_number', message: `Your card number is incomplete. ${USE_TEST_CARD_MESSAGE}` };
  }
  const expiry = parseExpiry(input.expiry);
  if (!expiry) return { ok: false, field: 'card_expiry', message: "Enter the card's expiry date as MM / YY." };
  const thisMonth = today.getUTCFullYear() * 12 + today.getUTCMonth();
  if (expiry.year * 12 + (expiry.month - 1) < thisMonth) {
    return { ok: false, field: 'card_expiry', message: "Your card's expiry date is in the past." };
  }
  if (!/^\d{3,4}$/.test(input.cvc.trim())) {
    return { ok: false, field: 'card_cvc', message: "Your card's security code is incomplete." };
  }
  const known = TEST_CARDS[number];
  if (!known) return { ok: false, field: 'card_number', message: USE_TEST_CARD_MESSAGE };
  return {
    ok: true,
    card: {
      number,
      brand: known.brand,
      behaviour: known.behaviour,
      last4: number.slice(-4),
      expMonth: expiry.month,
      expYear: expiry.year,
      name: input.name.trim() || null,
    },
  };
}
