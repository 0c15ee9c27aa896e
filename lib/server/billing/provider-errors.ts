import 'server-only';
import Stripe from 'stripe';
import { AppError } from '@/lib/server/http/errors';

/**
 * Turns an error from the Stripe SDK into the app's error, with a sentence the owner can act on.
 * A declined card is the owner's to fix (409); an unreachable or refusing provider is ours (500, logged).
 */
export function providerError(err: unknown, doing: string): Error {
  if (err instanceof AppError) return err;
  if (err instanceof Stripe.errors.StripeCardError) {
    return new AppError('conflict', `${err.message} Nothing was changed. Update the card under “Manage in portal” and try again.`);
  }
  if (err instanceof Stripe.errors.StripeConnectionError || err instanceof Stripe.errors.StripeAPIError || err instanceof Stripe.errors.StripeRateLimitError) {
    console.error(`[billing] payment provider unavailable while ${doing}:`, err.message);
    return new AppError('internal', `The payment provider could not be reached while ${doing}. Nothing was charged; try again in a minute.`);
  }
  if (err instanceof Stripe.errors.StripeAuthenticationError || err instanceof Stripe.errors.StripePermissionError) {
    console.error(`[billing] payment provider refused our key while ${doing}:`, err.message);
    return new AppError('internal', `The payment provider refused Stochos' API key while ${doing}. The operator must check STRIPE_SECRET_KEY.`);
  }
  if (err instanceof Stripe.errors.StripeError) {
    console.error(`[billing] payment provider refused a request while ${doing}:`, err.type, err.code, err.message);
    return new AppError('internal', `The payment provider refused the request while ${doing}: ${err.message}`);
  }
  // Anything else is a bug of ours: let the one error mapper log it with a reference.
  return err instanceof Error ? err : new Error(String(err));
}
