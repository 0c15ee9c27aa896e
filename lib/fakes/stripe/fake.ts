// The fake Stripe account, put together from its resources over one shared core (core.ts): the HTTP
// layer (server.ts) and the hosted pages (pages.ts) call this class; webhooks.ts delivers the events.
// Each method hands over to the resource module that holds the rule, so a rule lives in one place.
import type Stripe from 'stripe';
import type { CardInput } from './cards';
import { FakeStripeError } from './errors';
import type { LineSpec } from './objects';
import type { Params } from './params';
import type { CardBehaviour } from './state';
import { type AdvanceResult, type CheckoutOutcome, FakeCore, type ProrationBehavior, type RequestContext } from './core';
import { createPrice, createProduct } from './catalogue';
import { completeCheckout, createCheckoutSession, expireCheckoutSession, refreshCheckout, successRedirect } from './checkout';
import { createCustomer, updateCustomer } from './customers';
import { previewInvoice } from './invoices';
import { payInvoiceWithCard, setCardForTests } from './payment-methods';
import { createPortalSession, portalChangeSeats, portalPreviewSeats, portalSetCancel, portalSubscription, portalUpdateCard } from './portal';
import { advance, cancelSubscription, updateSubscription } from './subscriptions';

type CardResult = { ok: true } | { ok: false; field: string; message: string };

export class FakeStripe extends FakeCore {
  // customers and catalogue
  createCustomer(p: Params, ctx: RequestContext): Stripe.Customer {
    return createCustomer(this, p, ctx);
  }
  updateCustomer(id: string, p: Params, ctx: RequestContext): Stripe.Customer {
    return updateCustomer(this, id, p, ctx);
  }
  createProduct(p: Params, ctx: RequestContext): Stripe.Product {
    return createProduct(this, p, ctx);
  }
  createPrice(p: Params, ctx: RequestContext): Stripe.Price {
    return createPrice(this, p, ctx);
  }

  // checkout sessions
  createCheckoutSession(p: Params): Stripe.Checkout.Session {
    return createCheckoutSession(this, p);
  }
  refreshCheckout(id: string): Stripe.Checkout.Session {
    return refreshCheckout(this, id);
  }
  expireCheckoutSession(id: string, ctx: RequestContext): Stripe.Checkout.Session {
    return expireCheckoutSession(this, id, ctx);
  }
  completeCheckout(id: string, form: CardInput & { email: string }): CheckoutOutcome {
    return completeCheckout(this, id, form);
  }
  successRedirect(session: Stripe.Checkout.Session): string {
    return successRedirect(session);
  }

  // payment methods and invoices
  setCardForTests(customerId: string, rawNumber: string, rawExpiry?: string): Stripe.PaymentMethod {
    return setCardForTests(this, customerId, rawNumber, rawExpiry);
  }
  payInvoiceWithCard(invoiceId: string, input: CardInput): CardResult {
    return payInvoiceWithCard(this, invoiceId, input);
  }
  previewInvoice(p: Params): Stripe.Invoice {
    return previewInvoice(this, p);
  }

  // subscriptions and the clock
  updateSubscription(id: string, p: Params, ctx: RequestContext): Stripe.Subscription {
    return updateSubscription(this, id, p, ctx);
  }
  cancelSubscription(id: string, ctx: RequestContext): Stripe.Subscription {
    return cancelSubscription(this, id, ctx);
  }
  advance(target: { customer?: string; subscription?: string }): AdvanceResult[] {
    return advance(this, target);
  }

  // billing portal
  createPortalSession(p: Params, ctx: RequestContext): Stripe.BillingPortal.Session {
    return createPortalSession(this, p, ctx);
  }
  portalSubscription(customerId: string): Stripe.Subscription | undefined {
    return portalSubscription(this, customerId);
  }
  portalChangeSeats(sessionId: string, seats: number): Stripe.Subscription {
    return portalChangeSeats(this, sessionId, seats);
  }
  portalPreviewSeats(sessionId: string, seats: number): { prorationNet: number; lines: LineSpec[]; newPeriodTotal: number; behaviour: ProrationBehavior } {
    return portalPreviewSeats(this, sessionId, seats);
  }
  portalSetCancel(sessionId: string, cancel: boolean): Stripe.Subscription {
    return portalSetCancel(this, sessionId, cancel);
  }
  portalUpdateCard(sessionId: string, input: CardInput): CardResult {
    return portalUpdateCard(this, sessionId, input);
  }
}

export {
  type AdvanceResult,
  type CheckoutOutcome,
  type FakeStripeSettings,
  type ItemChange,
  type ProrationBehavior,
  type RequestContext,
  NO_REQUEST,
  SEAT_LOOKUP_KEY,
  SEAT_PRICE_ID,
  SEAT_PRODUCT_ID,
  newestFirst,
} from './core';
export { FakeStripeError };
export type { CardBehaviour };
