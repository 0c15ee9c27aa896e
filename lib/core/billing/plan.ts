// The plan's fixed terms, shared by the server, the billing page and the tests.
export const TRIAL_DAYS = 14;
export const TRIAL_SEATS = 3;
/** Days a past-due firm keeps working before authoring turns read-only. */
export const GRACE_DAYS = 7;
export const MIN_SEATS = 1;
export const MAX_SEATS = 500;
/** The seat price is found by this lookup key unless STRIPE_PRICE_ID names one. */
export const SEAT_PRICE_LOOKUP_KEY = 'stochos_seat_monthly';

export const DAY_MS = 86_400_000;
