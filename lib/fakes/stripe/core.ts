// The fake Stripe account's shared core: the state document, the per-customer clocks, transactions, the
// event log and lookups. The resources (customers.ts, catalogue.ts, checkout.ts, payment-methods.ts,
// invoices.ts, proration.ts, subscriptions.ts, portal.ts) are functions over this core; fake.ts puts them
// together as the FakeStripe the HTTP layer (server.ts) and the hosted pages (pages.ts) call.
//
// Every public operation runs as a transaction: on a thrown error the state rolls back, on success it
// is persisted atomically before the response leaves and the webhook deliverer is woken.
import Stripe from 'stripe';
import { invalidRequest, noSuch } from './errors';
import { newId } from './ids';
import { priceObject, productObject } from './objects';
import { type FakeState, type StoredEvent, emptyState, loadState, saveState } from './state';

export type ProrationBehavior = 'create_prorations' | 'always_invoice' | 'none';

export interface FakeStripeSettings {
  statePath: string | null;
  publicUrl: string;
  webhookUrl: string | null;
  webhookSecret: string | null;
  currency: string;
  seatUnitAmount: number;
  maxQuantity: number;
  retry: { baseMs: number; maxMs: number; maxAgeMs: number; timeoutMs: number };
  portalProrationBehavior: ProrationBehavior;
  log: (line: string) => void;
}

export interface RequestContext {
  requestId: string | null;
  idempotencyKey: string | null;
}

export const NO_REQUEST: RequestContext = { requestId: null, idempotencyKey: null };

export const SEAT_PRODUCT_ID = 'prod_stochos_seat';
export const SEAT_PRICE_ID = 'price_stochos_seat';
export const SEAT_LOOKUP_KEY = 'stochos_seat_monthly';

export const clone = <T>(value: T): T => structuredClone(value);

function customerIdOf(object: { object?: string; id: string; customer?: unknown }): string | undefined {
  if (object.object === 'customer') return object.id;
  return typeof object.customer === 'string' ? object.customer : undefined;
}

export function previousAttributes(before: object, after: object): Record<string, unknown> {
  const prev: Record<string, unknown> = {};
  const b = before as Record<string, unknown>;
  const a = after as Record<string, unknown>;
  for (const key of new Set([...Object.keys(b), ...Object.keys(a)])) {
    if (JSON.stringify(b[key]) !== JSON.stringify(a[key])) prev[key] = b[key] ?? null;
  }
  return prev;
}

export function newestFirst<T extends { created: number }>(items: T[]): T[] {
  return items
    .map((item, index) => ({ item, index }))
    .sort((x, y) => y.item.created - x.item.created || y.index - x.index)
    .map((x) => x.item);
}

export function validUrl(value: string, param: string): string {
  try {
    const u = new URL(value);
    if (u.protocol === 'http:' || u.protocol === 'https:') return value;
  } catch {
    // fall through
  }
  throw invalidRequest('Not a valid URL', param, 'url_invalid');
}

export function productName(state: FakeState, price: Stripe.Price): string {
  const id = typeof price.product === 'string' ? price.product : price.product.id;
  return state.products[id]?.name ?? id;
}

export interface ItemChange {
  item: Stripe.SubscriptionItem;
  quantity: number;
  price: Stripe.Price;
}

export interface AdvanceResult {
  subscription: string;
  customer: string;
  outcome: 'renewed' | 'payment_failed' | 'canceled';
  status: string;
  invoice: string | null;
  amount_due: number | null;
  period_start: number | null;
  period_end: number | null;
}

export type CheckoutOutcome =
  | { ok: true; redirect: string }
  | { ok: false; field: 'card_number' | 'card_expiry' | 'card_cvc' | 'email'; message: string };

export function unitLabel(price: Stripe.Price): string {
  const amount = ((price.unit_amount ?? 0) / 100).toFixed(2);
  const every = price.recurring ? ` / ${price.recurring.interval_count > 1 ? `${price.recurring.interval_count} ` : ''}${price.recurring.interval}` : '';
  return `${price.currency.toUpperCase()} ${amount}${every}`;
}

export class FakeCore {
  state: FakeState;
  private readonly wakers = new Set<() => void>();

  constructor(readonly settings: FakeStripeSettings) {
    this.state = loadState(settings.statePath) ?? emptyState();
    this.seed();
    this.persist();
  }

  /** Seconds since the epoch on `customer`'s clock (real time plus its offset from /_fake/advance). */
  now(customer?: string): number {
    return Math.floor(Date.now() / 1000) + (customer ? (this.state.clocks[customer] ?? 0) : 0);
  }

  persist(): void {
    saveState(this.settings.statePath, this.state);
  }

  onWake(fn: () => void): () => void {
    this.wakers.add(fn);
    return () => this.wakers.delete(fn);
  }

  /** Runs `fn` as one unit: rollback on error, persist and wake the deliverer on success. */
  tx<T>(fn: () => T): T {
    const backup = JSON.stringify(this.state);
    try {
      const result = fn();
      this.persist();
      for (const wake of this.wakers) wake();
      return result;
    } catch (err) {
      this.state = JSON.parse(backup) as FakeState;
      throw err;
    }
  }

  reset(): void {
    this.tx(() => {
      this.state = emptyState();
      this.seed();
    });
  }

  private seed(): void {
    const created = this.now();
    if (!this.state.products[SEAT_PRODUCT_ID]) {
      this.state.products[SEAT_PRODUCT_ID] = productObject({
        id: SEAT_PRODUCT_ID,
        created,
        name: 'Stochos seat',
        description: 'One author or checker seat, billed monthly.',
        unitLabel: 'seat',
        metadata: {},
      });
    }
    if (!this.state.prices[SEAT_PRICE_ID]) {
      this.state.prices[SEAT_PRICE_ID] = priceObject({
        id: SEAT_PRICE_ID,
        created,
        product: SEAT_PRODUCT_ID,
        currency: this.settings.currency,
        unitAmount: this.settings.seatUnitAmount,
        interval: 'month',
        intervalCount: 1,
        lookupKey: SEAT_LOOKUP_KEY,
        nickname: 'Seat, monthly',
        metadata: {},
      });
      this.state.products[SEAT_PRODUCT_ID].default_price = SEAT_PRICE_ID;
    }
  }

  emit(type: string, object: { id: string; object?: string }, ctx: RequestContext, previous?: Record<string, unknown>): Stripe.Event {
    const hasEndpoint = Boolean(this.settings.webhookUrl && this.settings.webhookSecret);
    const event = {
      id: newId('evt'),
      object: 'event',
      api_version: Stripe.API_VERSION,
      created: this.now(customerIdOf(object as { object?: string; id: string; customer?: unknown })),
      data: { object: clone(object), ...(previous ? { previous_attributes: previous } : {}) },
      livemode: false,
      pending_webhooks: hasEndpoint ? 1 : 0,
      request: { id: ctx.requestId, idempotency_key: ctx.idempotencyKey },
      type,
    } as unknown as Stripe.Event;
    const stored: StoredEvent = {
      event,
      delivery: { status: hasEndpoint ? 'pending' : 'no_endpoint', attempts: [], nextAttemptAt: hasEndpoint ? Date.now() : null },
    };
    this.state.events.push(stored);
    return event;
  }

  customer(id: string, param = 'id'): Stripe.Customer {
    const c = this.state.customers[id];
    if (!c) throw noSuch('customer', id, param);
    return c;
  }

  price(id: string, param = 'id'): Stripe.Price {
    const p = this.state.prices[id];
    if (!p) throw noSuch('price', id, param);
    return p;
  }

  product(id: string, param = 'id'): Stripe.Product {
    const p = this.state.products[id];
    if (!p) throw noSuch('product', id, param);
    return p;
  }

  subscription(id: string, param = 'id'): Stripe.Subscription {
    const s = this.state.subscriptions[id];
    if (!s) throw noSuch('subscription', id, param);
    return s;
  }

  invoice(id: string, param = 'id'): Stripe.Invoice {
    const i = this.state.invoices[id];
    if (!i) throw noSuch('invoice', id, param);
    return i;
  }

  checkoutSession(id: string): Stripe.Checkout.Session {
    const s = this.state.checkoutSessions[id];
    if (!s) throw noSuch('checkout.session', id);
    return s;
  }

  portalSession(id: string): Stripe.BillingPortal.Session {
    const s = this.state.portalSessions[id];
    if (!s) throw noSuch('billing_portal.session', id);
    return s;
  }

  paymentMethod(id: string, param = 'id'): Stripe.PaymentMethod {
    const p = this.state.paymentMethods[id];
    if (!p) throw noSuch('payment_method', id, param);
    return p;
  }

  /** Resolves any id the fake knows, for `expand`. */
  lookup(id: string): object | undefined {
    const s = this.state;
    const prefix = id.startsWith('cs_') ? 'cs' : id.split('_')[0];
    const table: Record<string, Record<string, object>> = {
      cus: s.customers,
      prod: s.products,
      price: s.prices,
      pm: s.paymentMethods,
      sub: s.subscriptions,
      in: s.invoices,
      ii: s.invoiceItems,
      cs: s.checkoutSessions,
      bps: s.portalSessions,
    };
    return table[prefix]?.[id];
  }

  subscriptionsOf(customer: string): Stripe.Subscription[] {
    return newestFirst(Object.values(this.state.subscriptions).filter((s) => s.customer === customer));
  }

  invoicesOf(filter: { customer?: string; subscription?: string }): Stripe.Invoice[] {
    return newestFirst(
      Object.values(this.state.invoices).filter(
        (i) =>
          (!filter.customer || i.customer === filter.customer) &&
          (!filter.subscription || i.parent?.subscription_details?.subscription === filter.subscription),
      ),
    );
  }

  defaultCard(customer: string, sub?: Stripe.Subscription): Stripe.PaymentMethod | null {
    const fromSub = typeof sub?.default_payment_method === 'string' ? sub.default_payment_method : null;
    const c = this.state.customers[customer];
    const fromCustomer = typeof c?.invoice_settings.default_payment_method === 'string' ? c.invoice_settings.default_payment_method : null;
    const id = fromSub ?? fromCustomer;
    return id ? (this.state.paymentMethods[id] ?? null) : null;
  }
}
