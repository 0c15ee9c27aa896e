// Stripe-looking random ids (cus_, sub_, si_, in_, cs_test_, evt_, ...). Randomness from node:crypto:
// ids only need to be unique; nothing here feeds a simulation.
import { randomBytes } from 'node:crypto';

const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

export function randomToken(length: number): string {
  const bytes = randomBytes(length * 2);
  let out = '';
  for (let i = 0; out.length < length && i < bytes.length; i += 1) {
    // 248 = 4 * 62: reject the top values so every character is equally likely.
    if (bytes[i] < 248) out += ALPHABET[bytes[i] % 62];
  }
  return out.length === length ? out : out + randomToken(length - out.length);
}

export function newId(prefix: string, length = 24): string {
  return `${prefix}_${randomToken(length)}`;
}

export function checkoutSessionId(): string {
  return `cs_test_${randomToken(58)}`;
}

export function invoicePrefix(): string {
  return randomBytes(4).toString('hex').toUpperCase();
}
