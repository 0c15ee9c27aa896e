// Errors in Stripe's wire shape, so the official SDK raises its typed errors
// (400/404 -> StripeInvalidRequestError, 402 -> StripeCardError, 401 -> StripeAuthenticationError).

export type StripeErrorType =
  | 'invalid_request_error'
  | 'card_error'
  | 'api_error'
  | 'authentication_error'
  | 'idempotency_error';

export interface StripeErrorBody {
  type: StripeErrorType;
  message: string;
  code?: string;
  param?: string;
  decline_code?: string;
  doc_url?: string;
}

export class FakeStripeError extends Error {
  constructor(
    public readonly status: number,
    public readonly body: StripeErrorBody,
  ) {
    super(body.message);
  }
}

export function invalidRequest(message: string, param?: string, code?: string): FakeStripeError {
  return new FakeStripeError(400, { type: 'invalid_request_error', message, ...(param ? { param } : {}), ...(code ? { code } : {}) });
}

const NOUNS: Record<string, string> = {
  cus: 'customer',
  sub: 'subscription',
  si: 'subscription item',
  in: 'invoice',
  ii: 'invoiceitem',
  price: 'price',
  prod: 'product',
  cs: 'checkout.session',
  bps: 'billing_portal.session',
  pm: 'payment_method',
  evt: 'event',
};

export function noun(id: string): string {
  return NOUNS[id.split('_')[0]] ?? 'object';
}

/** 404 for an id in the path, 400 with the param name for an id given as a parameter (as Stripe does). */
export function noSuch(kind: string, id: string, param = 'id'): FakeStripeError {
  return new FakeStripeError(param === 'id' ? 404 : 400, {
    type: 'invalid_request_error',
    code: 'resource_missing',
    message: `No such ${kind}: '${id}'`,
    param,
  });
}

export function cardDeclined(param?: string): FakeStripeError {
  return new FakeStripeError(402, {
    type: 'card_error',
    code: 'card_declined',
    decline_code: 'generic_decline',
    message: 'Your card was declined.',
    ...(param ? { param } : {}),
  });
}
