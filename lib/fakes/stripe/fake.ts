// The fake Stripe account: objects, billing rules, clocks and the event log. The HTTP layer
// (server.ts) and the hosted pages (pages.ts) call into this class; webhooks.ts delivers the events.
//
// Every public operation runs as a transaction: on a thrown error the state rolls back, on success it
// is persisted atomically before the response leaves and the webhook deliverer is woken.
import Stripe from 'stripe';
import { checkCard, type CardInput, type CheckedCard, DECLINED_MESSAGE, TEST_CARDS, normaliseNumber, parseExpiry } from './cards';
import { FakeStripeError, invalidRequest, noSuch, cardDeclined } from './errors';
import { checkoutSessionId, invoicePrefix, newId, randomToken } from './ids';
import {
  checkoutLineItemObject,
  checkoutSessionObject,
  customerObject,
  invoiceItemObject,
  invoiceLineObject,
  invoiceObject,
  type LineSpec,
  paymentMethodObject,
  planFromPrice,
  portalSessionObject,
  priceObject,
  productObject,
  subscriptionItemObject,
  subscriptionObject,
} from './objects';
import type { Params } from './params';
import { boundary, nextBoundary, prorate } from './period';
import { type CardBehaviour, type FakeState, type StoredEvent, emptyState, loadState, saveState } from './state';

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

/** How long an unpaid invoice waits before the next automatic attempt (a plausible value; common practice, no source). */
const RETRY_AFTER_SECONDS = 3 * 86_400;

const clone = <T>(value: T): T => structuredClone(value);

function customerIdOf(object: { object?: string; id: string; customer?: unknown }): string | undefined {
  if (object.object === 'customer') return object.id;
  return typeof object.customer === 'string' ? object.customer : undefined;
}

function previousAttributes(before: object, after: object): Record<string, unknown> {
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

function validUrl(value: string, param: string): string {
  try {
    const u = new URL(value);
    if (u.protocol === 'http:' || u.protocol === 'https:') return value;
  } catch {
    // fall through
  }
  throw invalidRequest('Not a valid URL', param, 'url_invalid');
}

function productName(state: FakeState, price: Stripe.Price): string {
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

export class FakeStripe {
  state: FakeState;
  private readonly wakers = new Set<() => void>();

  constructor(readonly settings: FakeStripeSettings) {
    this.state = loadState(settings.statePath) ?? emptyState();
    this.seed();
    this.persist();
  }

  // ---------- infrastructure ----------

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

  // ---------- lookups ----------

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

  // ---------- customers ----------

  createCustomer(p: Params, ctx: RequestContext): Stripe.Customer {
    return this.tx(() => {
      const id = newId('cus', 14);
      const c = customerObject({
        id,
        created: this.now(),
        email: p.str('email') || null,
        name: p.str('name') || null,
        description: p.str('description') || null,
        phone: p.str('phone') || null,
        metadata: p.applyMetadata({}),
        invoicePrefix: invoicePrefix(),
      });
      this.state.customers[id] = c;
      const pm = p.child('invoice_settings')?.str('default_payment_method');
      if (pm) {
        this.attachPaymentMethod(this.paymentMethod(pm, 'invoice_settings[default_payment_method]'), id);
        c.invoice_settings.default_payment_method = pm;
      }
      this.emit('customer.created', c, ctx);
      return c;
    });
  }

  updateCustomer(id: string, p: Params, ctx: RequestContext): Stripe.Customer {
    return this.tx(() => {
      const c = this.customer(id);
      const before = clone(c);
      if (p.has('email')) c.email = p.str('email') || null;
      if (p.has('name')) c.name = p.str('name') || null;
      if (p.has('description')) c.description = p.str('description') || null;
      if (p.has('phone')) c.phone = p.str('phone') || null;
      c.metadata = p.applyMetadata(c.metadata);
      const settings = p.child('invoice_settings');
      if (settings?.has('default_payment_method')) {
        const pm = settings.str('default_payment_method');
        if (pm) this.attachPaymentMethod(this.paymentMethod(pm, 'invoice_settings[default_payment_method]'), id);
        c.invoice_settings.default_payment_method = pm || null;
      }
      const prev = previousAttributes(before, c);
      if (Object.keys(prev).length > 0) this.emit('customer.updated', c, ctx, prev);
      return c;
    });
  }

  private attachPaymentMethod(pm: Stripe.PaymentMethod, customer: string): void {
    if (pm.customer && pm.customer !== customer) {
      throw invalidRequest('The payment method is attached to another customer.', 'payment_method');
    }
    pm.customer = customer;
  }

  // ---------- catalogue ----------

  createProduct(p: Params, ctx: RequestContext): Stripe.Product {
    return this.tx(() => {
      const id = p.str('id') || newId('prod', 14);
      if (this.state.products[id]) throw invalidRequest(`Product already exists.`, 'id', 'resource_already_exists');
      const product = productObject({
        id,
        created: this.now(),
        name: p.reqStr('name'),
        description: p.str('description') || null,
        unitLabel: p.str('unit_label') || null,
        metadata: p.applyMetadata({}),
      });
      if (p.has('active')) product.active = p.bool('active') ?? true;
      this.state.products[id] = product;
      this.emit('product.created', product, ctx);
      return product;
    });
  }

  createPrice(p: Params, ctx: RequestContext): Stripe.Price {
    return this.tx(() => {
      const currency = p.reqStr('currency').toLowerCase();
      const unitAmount = p.int('unit_amount', { min: 0 });
      if (unitAmount === undefined) throw invalidRequest('Missing required param: unit_amount.', 'unit_amount');
      let productId = p.str('product');
      const productData = p.child('product_data');
      if (!productId && productData) {
        productId = this.createProduct(productData, ctx).id;
      }
      if (!productId) throw invalidRequest('Missing required param: product.', 'product');
      this.product(productId, 'product');
      const recurring = p.child('recurring');
      const interval = recurring?.enumOf('interval', ['day', 'week', 'month', 'year'] as const) ?? null;
      if (recurring && !interval) throw invalidRequest('Missing required param: recurring[interval].', 'recurring[interval]');
      const lookupKey = p.str('lookup_key') || null;
      if (lookupKey) {
        const holder = Object.values(this.state.prices).find((x) => x.lookup_key === lookupKey);
        if (holder) {
          if (p.bool('transfer_lookup_key')) holder.lookup_key = null;
          else throw invalidRequest(`A price (\`${holder.id}\`) already uses that lookup key.`, 'lookup_key');
        }
      }
      const price = priceObject({
        id: newId('price'),
        created: this.now(),
        product: productId,
        currency,
        unitAmount,
        interval,
        intervalCount: recurring?.int('interval_count', { min: 1, max: 12 }) ?? 1,
        lookupKey,
        nickname: p.str('nickname') || null,
        metadata: p.applyMetadata({}),
      });
      this.state.prices[price.id] = price;
      this.emit('price.created', price, ctx);
      return price;
    });
  }

  // ---------- checkout ----------

  /** Session creation emits no event at Stripe either. */
  createCheckoutSession(p: Params): Stripe.Checkout.Session {
    return this.tx(() => {
      const mode = p.reqStr('mode');
      if (mode !== 'subscription') {
        throw invalidRequest('The local fake Stripe supports Checkout in mode=subscription only.', 'mode');
      }
      const uiMode = p.str('ui_mode');
      if (uiMode && uiMode !== 'hosted_page' && uiMode !== 'hosted') {
        throw invalidRequest('The local fake Stripe supports hosted Checkout pages only.', 'ui_mode');
      }
      const successUrl = validUrl(p.reqStr('success_url'), 'success_url');
      const cancelRaw = p.str('cancel_url');
      const cancelUrl = cancelRaw ? validUrl(cancelRaw, 'cancel_url') : null;
      const customerId = p.str('customer') || null;
      const customerEmail = p.str('customer_email') || null;
      if (customerId && customerEmail) {
        throw invalidRequest('You may only specify one of these parameters: customer, customer_email.', 'customer_email');
      }
      if (customerId) this.customer(customerId, 'customer');
      const clientReferenceId = p.str('client_reference_id') || null;
      if (clientReferenceId && clientReferenceId.length > 200) {
        throw invalidRequest('client_reference_id must be at most 200 characters.', 'client_reference_id');
      }
      const lines = p.list('line_items');
      if (!lines || lines.length === 0) throw invalidRequest('Missing required param: line_items.', 'line_items');
      let currency: string | null = null;
      const items = lines.map((line) => {
        if (line.has('price_data')) throw invalidRequest('The local fake Stripe needs an existing price, not price_data.', line.name('price_data'));
        const price = this.price(line.reqStr('price'), line.name('price'));
        if (!price.recurring) {
          throw invalidRequest('You must provide at least one recurring price in `subscription` mode when using prices.', line.name('price'));
        }
        const quantity = line.int('quantity', { min: 1, max: this.settings.maxQuantity });
        if (quantity === undefined) throw invalidRequest(`Missing required param: ${line.name('quantity')}.`, line.name('quantity'));
        if (currency && price.currency !== currency) throw invalidRequest('All prices must use the same currency.', line.name('price'));
        currency = price.currency;
        return { price, quantity };
      });
      const subData = p.child('subscription_data');
      const trialDays = subData?.int('trial_period_days', { min: 1, max: 730 }) ?? null;
      const created = this.now(customerId ?? undefined);
      const id = checkoutSessionId();
      const total = trialDays ? 0 : items.reduce((s, x) => s + (x.price.unit_amount ?? 0) * x.quantity, 0);
      const session = checkoutSessionObject({
        id,
        created,
        url: `${this.settings.publicUrl}/checkout/${id}`,
        customer: customerId,
        customerEmail,
        clientReferenceId,
        currency: currency ?? this.settings.currency,
        amountTotal: total,
        metadata: p.applyMetadata({}),
        successUrl,
        cancelUrl,
      });
      const expiresAt = p.int('expires_at');
      if (expiresAt !== undefined) {
        if (expiresAt < created + 30 * 60 || expiresAt > created + 24 * 3600) {
          throw invalidRequest('expires_at must be between 30 minutes and 24 hours from now.', 'expires_at');
        }
        session.expires_at = expiresAt;
      }
      this.state.checkoutSessions[id] = session;
      this.state.checkoutLineItems[id] = items.map((x) =>
        checkoutLineItemObject({ id: newId('li'), price: x.price, quantity: x.quantity, description: productName(this.state, x.price) }),
      );
      this.state.checkoutExtras[id] = {
        trialPeriodDays: trialDays,
        subscriptionMetadata: subData ? subData.applyMetadata({}) : {},
        subscriptionDescription: subData?.str('description') || null,
        lastError: null,
      };
      return session;
    });
  }

  /** Marks an open session past its expires_at as expired (Stripe does this in the background). */
  refreshCheckout(id: string): Stripe.Checkout.Session {
    const session = this.checkoutSession(id);
    const customer = typeof session.customer === 'string' ? session.customer : undefined;
    if (session.status === 'open' && this.now(customer) >= session.expires_at) {
      this.tx(() => {
        session.status = 'expired';
        this.emit('checkout.session.expired', session, NO_REQUEST);
      });
    }
    return session;
  }

  expireCheckoutSession(id: string, ctx: RequestContext): Stripe.Checkout.Session {
    return this.tx(() => {
      const session = this.checkoutSession(id);
      if (session.status !== 'open') {
        throw invalidRequest('Only Checkout Sessions with a status in ["open"] can be expired.', 'session');
      }
      session.status = 'expired';
      this.emit('checkout.session.expired', session, ctx);
      return session;
    });
  }

  /** The hosted page's "Pay" button. Declines leave the session open so the buyer can retry. */
  completeCheckout(id: string, form: CardInput & { email: string }): CheckoutOutcome {
    const session = this.refreshCheckout(id);
    if (session.status === 'complete') return { ok: true, redirect: this.successRedirect(session) };
    if (session.status !== 'open') return { ok: false, field: 'card_number', message: 'This checkout page has expired. Start again from Stochos.' };
    const extras = this.state.checkoutExtras[id];
    let email = session.customer_email;
    if (!session.customer && !email) {
      email = form.email.trim();
      if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) return { ok: false, field: 'email', message: 'Enter a valid e-mail address.' };
    }
    const check = checkCard(form);
    if (!check.ok) return this.checkoutError(id, check.field, check.message);
    if (check.card.behaviour === 'decline') return this.checkoutError(id, 'card_number', DECLINED_MESSAGE);

    this.tx(() => {
      let customerId = typeof session.customer === 'string' ? session.customer : null;
      if (!customerId) {
        customerId = newId('cus', 14);
        const c = customerObject({
          id: customerId,
          created: this.now(),
          email,
          name: check.card.name,
          description: null,
          phone: null,
          metadata: {},
          invoicePrefix: invoicePrefix(),
        });
        this.state.customers[customerId] = c;
        this.emit('customer.created', c, NO_REQUEST);
      }
      const customer = this.customer(customerId);
      const now = this.now(customerId);
      const pm = this.storeCard(customerId, check.card);
      customer.invoice_settings.default_payment_method = pm.id;
      if (!customer.currency) customer.currency = session.currency;
      this.emit('payment_method.attached', pm, NO_REQUEST);

      const lineItems = this.state.checkoutLineItems[id];
      const first = lineItems[0].price!;
      const interval = first.recurring?.interval ?? 'month';
      const count = first.recurring?.interval_count ?? 1;
      const trialDays = extras.trialPeriodDays;
      const trialEnd = trialDays ? now + trialDays * 86_400 : null;
      const anchor = trialEnd ?? now;
      const periodEnd = trialEnd ?? boundary(anchor, interval, count, 1);
      const subId = newId('sub');
      const items = lineItems.map((li) =>
        subscriptionItemObject({
          id: newId('si', 14),
          created: now,
          subscription: subId,
          price: clone(li.price!),
          quantity: li.quantity ?? 1,
          periodStart: now,
          periodEnd,
          metadata: {},
        }),
      );
      const sub = subscriptionObject({
        id: subId,
        created: now,
        customer: customerId,
        currency: session.currency ?? this.settings.currency,
        items,
        metadata: { ...extras.subscriptionMetadata },
        status: trialDays ? 'trialing' : 'active',
        billingCycleAnchor: anchor,
        defaultPaymentMethod: pm.id,
        trialStart: trialDays ? now : null,
        trialEnd,
        description: extras.subscriptionDescription,
      });
      const invoiceId = newId('in');
      sub.latest_invoice = invoiceId;
      this.state.subscriptions[subId] = sub;
      this.emit('customer.subscription.created', sub, NO_REQUEST);

      session.status = 'complete';
      session.payment_status = trialDays ? 'no_payment_required' : 'paid';
      session.customer = customerId;
      session.subscription = subId;
      session.invoice = invoiceId;
      session.customer_details = {
        address: null,
        business_name: null,
        email: customer.email,
        individual_name: null,
        name: check.card.name ?? customer.name ?? null,
        phone: null,
        tax_exempt: 'none',
        tax_ids: [],
      };
      extras.lastError = null;
      this.emit('checkout.session.completed', session, NO_REQUEST);

      const lines: LineSpec[] = items.map((item) => ({
        id: newId('il'),
        amount: trialDays ? 0 : (item.price.unit_amount ?? 0) * (item.quantity ?? 1),
        currency: sub.currency,
        description: trialDays
          ? `Trial period for ${productName(this.state, item.price)}`
          : `${item.quantity} × ${productName(this.state, item.price)} (at ${this.unitLabel(item.price)})`,
        price: item.price,
        quantity: item.quantity ?? 1,
        periodStart: now,
        periodEnd,
        subscription: subId,
        subscriptionItem: item.id,
        invoiceItem: null,
        proration: false,
        creditedItems: null,
      }));
      const invoice = this.draftInvoice(invoiceId, customer, sub, 'subscription_create', lines, now, now);
      this.emit('invoice.created', invoice, NO_REQUEST);
      this.finalizeInvoice(invoice, NO_REQUEST);
      this.chargeInvoice(invoice, NO_REQUEST);
    });
    return { ok: true, redirect: this.successRedirect(session) };
  }

  private checkoutError(id: string, field: Exclude<CheckoutOutcome, { ok: true }>['field'], message: string): CheckoutOutcome {
    this.tx(() => {
      this.state.checkoutExtras[id].lastError = message;
    });
    return { ok: false, field, message };
  }

  successRedirect(session: Stripe.Checkout.Session): string {
    return (session.success_url ?? '').split('{CHECKOUT_SESSION_ID}').join(session.id);
  }

  unitLabel(price: Stripe.Price): string {
    const amount = ((price.unit_amount ?? 0) / 100).toFixed(2);
    const every = price.recurring ? ` / ${price.recurring.interval_count > 1 ? `${price.recurring.interval_count} ` : ''}${price.recurring.interval}` : '';
    return `${price.currency.toUpperCase()} ${amount}${every}`;
  }

  // ---------- cards ----------

  private storeCard(customer: string, card: CheckedCard): Stripe.PaymentMethod {
    const pm = paymentMethodObject({
      id: newId('pm'),
      created: this.now(customer),
      customer,
      brand: card.brand,
      last4: card.last4,
      expMonth: card.expMonth,
      expYear: card.expYear,
      name: card.name,
      // Same number, same fingerprint, as with real cards.
      fingerprint: Buffer.from(card.number).toString('base64url').slice(0, 16),
    });
    this.state.paymentMethods[pm.id] = pm;
    this.state.cardBehaviour[pm.id] = card.behaviour;
    return pm;
  }

  /**
   * Puts a card on file as the customer's (and their live subscriptions') default.
   * `retryOpen`: the portal's card update also retries unpaid invoices right away.
   */
  replaceCard(customerId: string, card: CheckedCard, ctx: RequestContext, retryOpen: boolean): Stripe.PaymentMethod {
    return this.tx(() => {
      const customer = this.customer(customerId, 'customer');
      const pm = this.storeCard(customerId, card);
      this.emit('payment_method.attached', pm, ctx);
      const before = clone(customer);
      customer.invoice_settings.default_payment_method = pm.id;
      this.emit('customer.updated', customer, ctx, previousAttributes(before, customer));
      for (const sub of this.subscriptionsOf(customerId)) {
        if (sub.status === 'canceled') continue;
        const subBefore = clone(sub);
        sub.default_payment_method = pm.id;
        this.emit('customer.subscription.updated', sub, ctx, previousAttributes(subBefore, sub));
      }
      if (retryOpen) this.retryOpenInvoices(customerId, ctx);
      return pm;
    });
  }

  /** /_fake/card: any listed test number, expiry optional (defaults to 12 / next year + 3). */
  setCardForTests(customerId: string, rawNumber: string, rawExpiry?: string): Stripe.PaymentMethod {
    const number = normaliseNumber(rawNumber);
    const known = TEST_CARDS[number];
    if (!known) throw invalidRequest(`Unknown test card number ${rawNumber}; use one of ${Object.keys(TEST_CARDS).join(', ')}.`, 'number');
    const exp = rawExpiry ? parseExpiry(rawExpiry) : null;
    if (rawExpiry && !exp) throw invalidRequest('Invalid expiry; use MM/YY.', 'expiry');
    return this.replaceCard(
      customerId,
      {
        number,
        brand: known.brand,
        behaviour: known.behaviour,
        last4: number.slice(-4),
        expMonth: exp?.month ?? 12,
        expYear: exp?.year ?? new Date().getUTCFullYear() + 3,
        name: null,
      },
      NO_REQUEST,
      false,
    );
  }

  // ---------- invoices ----------

  private draftInvoice(
    id: string,
    customer: Stripe.Customer,
    sub: Stripe.Subscription | null,
    reason: Stripe.Invoice.BillingReason,
    specs: LineSpec[],
    periodStart: number,
    periodEnd: number,
  ): Stripe.Invoice {
    const invoice = invoiceObject({
      id,
      created: this.now(customer.id),
      customer,
      currency: sub?.currency ?? this.settings.currency,
      subscription: sub,
      billingReason: reason,
      lines: specs.map((s) => invoiceLineObject(id, s)),
      periodStart,
      periodEnd,
      number: null,
      hostedUrl: `${this.settings.publicUrl}/invoices/${id}`,
      startingBalance: customer.balance,
    });
    for (const s of specs) {
      if (s.invoiceItem && this.state.invoiceItems[s.invoiceItem]) this.state.invoiceItems[s.invoiceItem].invoice = id;
    }
    this.state.invoices[id] = invoice;
    return invoice;
  }

  /** Finalizing numbers the invoice and applies the customer's credit balance (negative balance = credit). */
  private finalizeInvoice(invoice: Stripe.Invoice, ctx: RequestContext): void {
    const customer = this.customer(invoice.customer as string);
    const now = this.now(customer.id);
    const starting = customer.balance;
    const total = invoice.total;
    const amountDue = Math.max(0, total + starting);
    const ending = total + starting >= 0 ? 0 : total + starting;
    customer.balance = ending;
    const seq = customer.next_invoice_sequence ?? 1;
    customer.next_invoice_sequence = seq + 1;
    Object.assign(invoice, {
      number: `${customer.invoice_prefix}-${String(seq).padStart(4, '0')}`,
      status: 'open',
      starting_balance: starting,
      ending_balance: ending,
      amount_due: amountDue,
      amount_remaining: amountDue,
      effective_at: now,
      status_transitions: { ...invoice.status_transitions, finalized_at: now },
    });
    this.emit('invoice.finalized', invoice, ctx);
  }

  /** Attempts to collect an open invoice with the card on file. Returns true when paid. */
  private chargeInvoice(invoice: Stripe.Invoice, ctx: RequestContext): boolean {
    const customerId = invoice.customer as string;
    const subId = invoice.parent?.subscription_details?.subscription;
    const sub = typeof subId === 'string' ? this.state.subscriptions[subId] : undefined;
    const now = this.now(customerId);
    let paid = invoice.amount_due === 0;
    if (!paid) {
      const pm = this.defaultCard(customerId, sub);
      paid = pm !== null && this.state.cardBehaviour[pm.id] === 'succeed';
      invoice.attempt_count += 1;
      invoice.attempted = true;
      invoice.default_payment_method = pm?.id ?? null;
    }
    if (paid) {
      Object.assign(invoice, {
        status: 'paid',
        amount_paid: invoice.amount_due,
        amount_remaining: 0,
        next_payment_attempt: null,
        status_transitions: { ...invoice.status_transitions, paid_at: now },
      });
      invoice.webhooks_delivered_at = now;
      this.emit('invoice.paid', invoice, ctx);
      this.emit('invoice.payment_succeeded', invoice, ctx);
    } else {
      invoice.next_payment_attempt = now + RETRY_AFTER_SECONDS;
      this.emit('invoice.payment_failed', invoice, ctx);
    }
    this.syncDelinquency(customerId, ctx);
    return paid;
  }

  /** past_due while the subscription has an open invoice; back to active once everything is paid. */
  private syncSubscriptionStatus(sub: Stripe.Subscription, ctx: RequestContext): void {
    if (sub.status === 'canceled') return;
    const open = this.invoicesOf({ subscription: sub.id }).some((i) => i.status === 'open');
    const next = open ? 'past_due' : sub.status === 'past_due' ? 'active' : sub.status;
    if (next !== sub.status) {
      const before = clone(sub);
      sub.status = next;
      this.emit('customer.subscription.updated', sub, ctx, previousAttributes(before, sub));
    }
  }

  private syncDelinquency(customerId: string, ctx: RequestContext): void {
    const customer = this.state.customers[customerId];
    if (!customer) return;
    const delinquent = this.invoicesOf({ customer: customerId }).some((i) => i.status === 'open' && i.attempt_count > 0);
    if (customer.delinquent !== delinquent) {
      const before = clone(customer);
      customer.delinquent = delinquent;
      this.emit('customer.updated', customer, ctx, previousAttributes(before, customer));
    }
  }

  private retryOpenInvoices(customerId: string, ctx: RequestContext, subId?: string): void {
    const open = this.invoicesOf({ customer: customerId, subscription: subId })
      .filter((i) => i.status === 'open')
      .reverse();
    for (const invoice of open) this.chargeInvoice(invoice, ctx);
    for (const sub of this.subscriptionsOf(customerId)) {
      if (!subId || sub.id === subId) this.syncSubscriptionStatus(sub, ctx);
    }
  }

  /** Pays one open invoice from its hosted page with a newly entered card. */
  payInvoiceWithCard(invoiceId: string, input: CardInput): { ok: true } | { ok: false; field: string; message: string } {
    const invoice = this.invoice(invoiceId);
    if (invoice.status !== 'open') return { ok: true };
    const check = checkCard(input);
    if (!check.ok) return check;
    if (check.card.behaviour === 'decline') return { ok: false, field: 'card_number', message: DECLINED_MESSAGE };
    this.tx(() => {
      const customerId = invoice.customer as string;
      const pm = this.storeCard(customerId, check.card);
      this.emit('payment_method.attached', pm, NO_REQUEST);
      invoice.default_payment_method = pm.id;
      const subId = invoice.parent?.subscription_details?.subscription;
      const sub = typeof subId === 'string' ? this.state.subscriptions[subId] : undefined;
      // One-off card for this invoice: charge it directly rather than the card on file.
      const saved = sub?.default_payment_method;
      if (sub) sub.default_payment_method = pm.id;
      this.chargeInvoice(invoice, NO_REQUEST);
      if (sub) {
        sub.default_payment_method = saved ?? null;
        this.syncSubscriptionStatus(sub, NO_REQUEST);
      }
    });
    return { ok: true };
  }

  // ---------- subscriptions ----------

  /** Proration lines for changing items at time `at`, without touching state. */
  prorationLines(sub: Stripe.Subscription, changes: ItemChange[], at: number, tmpIds: boolean): LineSpec[] {
    const lines: LineSpec[] = [];
    const when = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' }).format(
      new Date(at * 1000),
    );
    for (const { item, quantity, price } of changes) {
      const oldQty = item.quantity ?? 1;
      if (oldQty === quantity && item.price.id === price.id) continue;
      const start = item.current_period_start;
      const end = item.current_period_end;
      const lineId = () => (tmpIds ? `il_tmp_${randomToken(24)}` : newId('il'));
      const itemId = () => (tmpIds ? `ii_tmp_${randomToken(24)}` : newId('ii'));
      const lastPaid = this.invoicesOf({ subscription: sub.id }).find(
        (i) => i.status === 'paid' && i.lines.data.some((l) => l.parent?.subscription_item_details?.subscription_item === item.id && !l.parent.subscription_item_details.proration),
      );
      const creditedLine = lastPaid?.lines.data.find((l) => l.parent?.subscription_item_details?.subscription_item === item.id);
      lines.push({
        id: lineId(),
        amount: -prorate(item.price.unit_amount ?? 0, oldQty, start, end, at),
        currency: sub.currency,
        description: `Unused time on ${oldQty} × ${productName(this.state, item.price)} after ${when}`,
        price: item.price,
        quantity: oldQty,
        periodStart: at,
        periodEnd: end,
        subscription: sub.id,
        subscriptionItem: item.id,
        invoiceItem: itemId(),
        proration: true,
        creditedItems: lastPaid && creditedLine ? { invoice: lastPaid.id, invoice_line_items: [creditedLine.id] } : null,
      });
      lines.push({
        id: lineId(),
        amount: prorate(price.unit_amount ?? 0, quantity, start, end, at),
        currency: sub.currency,
        description: `Remaining time on ${quantity} × ${productName(this.state, price)} after ${when}`,
        price,
        quantity,
        periodStart: at,
        periodEnd: end,
        subscription: sub.id,
        subscriptionItem: item.id,
        invoiceItem: itemId(),
        proration: true,
        creditedItems: null,
      });
    }
    return lines;
  }

  /** Reads items[] of an update or preview into concrete changes, validating every parameter. */
  readItemChanges(sub: Stripe.Subscription, items: Params[] | undefined): ItemChange[] {
    if (!items) return [];
    return items.map((ip) => {
      const id = ip.str('id');
      if (ip.bool('deleted')) throw invalidRequest('The local fake Stripe cannot delete subscription items.', ip.name('deleted'));
      const item = id ? sub.items.data.find((x) => x.id === id) : sub.items.data.length === 1 && !ip.has('price') ? sub.items.data[0] : undefined;
      if (!item) {
        if (id) throw invalidRequest(`No such subscription item: '${id}'`, ip.name('id'), 'resource_missing');
        throw invalidRequest('The local fake Stripe cannot add items to a subscription; pass items[0][id].', ip.name('id'));
      }
      const priceId = ip.str('price');
      const price = priceId ? this.price(priceId, ip.name('price')) : item.price;
      if (priceId) {
        if (!price.recurring) throw invalidRequest('The price must be recurring.', ip.name('price'));
        if (price.currency !== sub.currency) throw invalidRequest('The price must use the subscription currency.', ip.name('price'));
        if (price.recurring.interval !== item.price.recurring?.interval || price.recurring.interval_count !== item.price.recurring?.interval_count) {
          throw invalidRequest('The local fake Stripe cannot change the billing interval.', ip.name('price'));
        }
      }
      const quantity = ip.int('quantity', { min: 1, max: this.settings.maxQuantity }) ?? item.quantity ?? 1;
      return { item, quantity, price };
    });
  }

  readProrationDate(sub: Stripe.Subscription, p: Params, key: string): number {
    const at = p.int(key);
    const item = sub.items.data[0];
    if (at === undefined) return this.now(sub.customer as string);
    if (at < item.current_period_start || at > item.current_period_end) {
      throw invalidRequest('proration_date must be within the current billing period.', p.name(key));
    }
    return at;
  }

  updateSubscription(id: string, p: Params, ctx: RequestContext): Stripe.Subscription {
    return this.tx(() => {
      const sub = this.subscription(id);
      if (sub.status === 'canceled') {
        throw invalidRequest('A canceled subscription can only update its cancellation_details and metadata.', 'status');
      }
      const changes = this.readItemChanges(sub, p.list('items'));
      const behaviour = p.enumOf('proration_behavior', ['create_prorations', 'always_invoice', 'none'] as const) ?? 'create_prorations';
      const at = this.readProrationDate(sub, p, 'proration_date');
      const paymentBehavior = p.enumOf('payment_behavior', ['allow_incomplete', 'default_incomplete', 'error_if_incomplete', 'pending_if_incomplete'] as const);
      const cancelAtPeriodEnd = p.bool('cancel_at_period_end');
      const cancelAtRaw = p.str('cancel_at');
      const defaultPm = p.str('default_payment_method');
      if (defaultPm) {
        const pm = this.paymentMethod(defaultPm, 'default_payment_method');
        if (pm.customer !== sub.customer) throw invalidRequest('The payment method must be attached to the customer.', 'default_payment_method');
      }
      if (cancelAtRaw !== undefined && cancelAtRaw !== '') {
        throw invalidRequest('The local fake Stripe supports cancel_at_period_end, not cancel_at timestamps.', 'cancel_at');
      }
      const before = clone(sub);
      if (defaultPm) sub.default_payment_method = defaultPm;
      if (p.has('description')) sub.description = p.str('description') || null;
      sub.metadata = p.applyMetadata(sub.metadata);
      this.applyCancelAtPeriodEnd(sub, cancelAtPeriodEnd ?? (cancelAtRaw === '' ? false : undefined));
      this.applyItemChanges(sub, changes, behaviour, at, paymentBehavior === 'error_if_incomplete', ctx, before);
      return sub;
    });
  }

  private applyCancelAtPeriodEnd(sub: Stripe.Subscription, value: boolean | undefined): void {
    if (value === undefined) return;
    const now = this.now(sub.customer as string);
    sub.cancel_at_period_end = value;
    sub.cancel_at = value ? sub.items.data[0].current_period_end : null;
    sub.canceled_at = value ? now : null;
    sub.cancellation_details = { comment: null, feedback: null, feedback_option: null, reason: value ? 'cancellation_requested' : null };
  }

  /**
   * Applies quantity/price changes with Stripe's proration behaviours and emits, in order:
   * invoiceitem.created (prorations), customer.subscription.updated, then for always_invoice the
   * invoice's created/finalized/paid (or payment_failed) events.
   */
  private applyItemChanges(
    sub: Stripe.Subscription,
    changes: ItemChange[],
    behaviour: ProrationBehavior,
    at: number,
    errorIfIncomplete: boolean,
    ctx: RequestContext,
    before: Stripe.Subscription,
  ): void {
    const customer = this.customer(sub.customer as string);
    const prorations = behaviour === 'none' || sub.status === 'trialing' ? [] : this.prorationLines(sub, changes, at, false);
    const net = prorations.reduce((s, l) => s + l.amount, 0);
    if (errorIfIncomplete && behaviour === 'always_invoice' && net + customer.balance > 0) {
      const pm = this.defaultCard(customer.id, sub);
      if (!pm || this.state.cardBehaviour[pm.id] !== 'succeed') throw cardDeclined();
    }
    for (const { item, quantity, price } of changes) {
      item.quantity = quantity;
      if (item.price.id !== price.id) {
        item.price = clone(price);
        item.plan = planFromPrice(price);
      }
    }
    for (const line of prorations) {
      const ii = invoiceItemObject({ created: at, customer: customer.id, line, subscriptionMetadata: sub.metadata, invoice: null });
      this.state.invoiceItems[ii.id] = ii;
      this.emit('invoiceitem.created', ii, ctx);
    }
    let invoice: Stripe.Invoice | null = null;
    if (behaviour === 'always_invoice' && prorations.length > 0) {
      const pending = this.pendingItemLines(sub.id);
      invoice = this.draftInvoice(newId('in'), customer, sub, 'subscription_update', pending, at, at);
      sub.latest_invoice = invoice.id;
    }
    const prev = previousAttributes(before, sub);
    if (Object.keys(prev).length > 0) this.emit('customer.subscription.updated', sub, ctx, prev);
    if (invoice) {
      this.emit('invoice.created', invoice, ctx);
      this.finalizeInvoice(invoice, ctx);
      this.chargeInvoice(invoice, ctx);
      this.syncSubscriptionStatus(sub, ctx);
    }
  }

  /** Invoice items of `subId` not yet on an invoice, as invoice lines. */
  private pendingItemLines(subId: string): LineSpec[] {
    return Object.values(this.state.invoiceItems)
      .filter((ii) => ii.invoice === null && ii.parent?.subscription_details?.subscription === subId)
      .map((ii) => this.lineFromInvoiceItem(ii));
  }

  private lineFromInvoiceItem(ii: Stripe.InvoiceItem): LineSpec {
    const priceId = ii.pricing?.price_details?.price;
    const price = this.price(typeof priceId === 'string' ? priceId : (priceId?.id ?? ''));
    const credited = ii.proration_details?.credited_items?.invoice_line_item_details ?? null;
    return {
      id: newId('il'),
      amount: ii.amount,
      currency: ii.currency,
      description: ii.description ?? '',
      price,
      quantity: ii.quantity,
      periodStart: ii.period.start,
      periodEnd: ii.period.end,
      subscription: ii.parent?.subscription_details?.subscription ?? null,
      subscriptionItem: ii.parent?.subscription_details?.subscription_item ?? null,
      invoiceItem: ii.id,
      proration: ii.proration,
      creditedItems: credited,
    };
  }

  cancelSubscription(id: string, ctx: RequestContext): Stripe.Subscription {
    return this.tx(() => {
      const sub = this.subscription(id);
      if (sub.status === 'canceled') {
        throw invalidRequest(`A canceled subscription can't be canceled again: ${id}`, 'id');
      }
      const now = this.now(sub.customer as string);
      sub.status = 'canceled';
      sub.canceled_at = now;
      sub.ended_at = now;
      sub.cancel_at = null;
      sub.cancel_at_period_end = false;
      sub.cancellation_details = { comment: null, feedback: null, feedback_option: null, reason: 'cancellation_requested' };
      this.emit('customer.subscription.deleted', sub, ctx);
      return sub;
    });
  }

  // ---------- preview ----------

  /** invoices.createPreview: the invoice that would result from the given subscription changes. */
  previewInvoice(p: Params): Stripe.Invoice {
    const subId = p.str('subscription');
    let customerId = p.str('customer');
    let sub: Stripe.Subscription | undefined;
    if (subId) {
      sub = this.subscription(subId, 'subscription');
      if (customerId && sub.customer !== customerId) throw invalidRequest('The subscription does not belong to the customer.', 'subscription');
      customerId = sub.customer as string;
    } else if (customerId) {
      this.customer(customerId, 'customer');
      sub = this.subscriptionsOf(customerId).find((s) => s.status !== 'canceled');
    } else {
      throw invalidRequest('Missing required param: customer or subscription.', 'customer');
    }
    if (!sub || sub.status === 'canceled') {
      throw invalidRequest(`No upcoming invoices for customer: ${customerId}`, 'subscription', 'invoice_upcoming_none');
    }
    const customer = this.customer(customerId!);
    const details = p.child('subscription_details');
    const changes = details ? this.readItemChanges(sub, details.list('items')) : [];
    const behaviour = details?.enumOf('proration_behavior', ['create_prorations', 'always_invoice', 'none'] as const) ?? 'create_prorations';
    const at = details ? this.readProrationDate(sub, details, 'proration_date') : this.now(customerId);
    const cancelAtEnd = details?.bool('cancel_at_period_end') ?? sub.cancel_at_period_end;
    const prorations = behaviour === 'none' || sub.status === 'trialing' ? [] : this.prorationLines(sub, changes, at, true);
    const pending = Object.values(this.state.invoiceItems)
      .filter((ii) => ii.invoice === null && ii.parent?.subscription_details?.subscription === sub!.id)
      .map((ii) => ({ ...this.lineFromInvoiceItem(ii), id: `il_tmp_${randomToken(24)}` }));
    const item0 = sub.items.data[0];
    let lines: LineSpec[];
    let periodStart: number;
    let periodEnd: number;
    let nextAttempt: number;
    let reason: Stripe.Invoice.BillingReason;
    if (behaviour === 'always_invoice' && prorations.length > 0) {
      // The invoice the change itself would raise, charged straight away.
      lines = [...pending, ...prorations];
      periodStart = at;
      periodEnd = at;
      nextAttempt = at;
      reason = 'subscription_update';
    } else {
      // The next renewal invoice: pending prorations plus the coming period at the new quantities.
      const renewal: LineSpec[] = [];
      if (!cancelAtEnd) {
        for (const item of sub.items.data) {
          const change = changes.find((c) => c.item.id === item.id);
          const price = change?.price ?? item.price;
          const quantity = change?.quantity ?? item.quantity ?? 1;
          const start = item.current_period_end;
          const end = nextBoundary(sub.billing_cycle_anchor, price.recurring?.interval ?? 'month', price.recurring?.interval_count ?? 1, start);
          renewal.push({
            id: `il_tmp_${randomToken(24)}`,
            amount: (price.unit_amount ?? 0) * quantity,
            currency: sub.currency,
            description: `${quantity} × ${productName(this.state, price)} (at ${this.unitLabel(price)})`,
            price,
            quantity,
            periodStart: start,
            periodEnd: end,
            subscription: sub.id,
            subscriptionItem: item.id,
            invoiceItem: null,
            proration: false,
            creditedItems: null,
          });
        }
      }
      lines = [...pending, ...prorations, ...renewal];
      periodStart = item0.current_period_start;
      periodEnd = item0.current_period_end;
      nextAttempt = item0.current_period_end;
      reason = sub.status === 'trialing' ? 'subscription_cycle' : 'upcoming';
    }
    const id = `upcoming_${newId('in')}`;
    const invoice = invoiceObject({
      id,
      created: this.now(customerId),
      customer,
      currency: sub.currency,
      subscription: sub,
      billingReason: reason,
      lines: lines.map((l) => invoiceLineObject(null, l)),
      periodStart,
      periodEnd,
      number: null,
      hostedUrl: null,
      startingBalance: customer.balance,
    });
    const total = invoice.total;
    invoice.ending_balance = total + customer.balance >= 0 ? 0 : total + customer.balance;
    invoice.next_payment_attempt = nextAttempt;
    // Stripe reports the moment it prorated at whenever the preview carries prorations, so the
    // app can pass the same proration_date to the real update and charge what it showed.
    if (invoice.parent?.subscription_details && (prorations.length > 0 || details?.has('proration_date'))) {
      invoice.parent.subscription_details.subscription_proration_date = at;
    }
    return invoice;
  }

  // ---------- billing portal ----------

  createPortalSession(p: Params, ctx: RequestContext): Stripe.BillingPortal.Session {
    return this.tx(() => {
      const customerId = p.reqStr('customer');
      this.customer(customerId, 'customer');
      const returnRaw = p.str('return_url');
      const returnUrl = returnRaw ? validUrl(returnRaw, 'return_url') : null;
      if (p.has('flow_data')) throw invalidRequest('The local fake Stripe does not support portal flows.', 'flow_data');
      const id = newId('bps');
      const session = portalSessionObject({
        id,
        created: this.now(customerId),
        customer: customerId,
        returnUrl,
        url: `${this.settings.publicUrl}/portal/${id}`,
      });
      this.state.portalSessions[id] = session;
      this.emit('billing_portal.session.created', session, ctx);
      return session;
    });
  }

  /** The subscription the portal shows: the newest one that is not canceled, else the newest. */
  portalSubscription(customerId: string): Stripe.Subscription | undefined {
    const subs = this.subscriptionsOf(customerId);
    return subs.find((s) => s.status !== 'canceled') ?? subs[0];
  }

  portalChangeSeats(sessionId: string, seats: number): Stripe.Subscription {
    const session = this.portalSession(sessionId);
    const sub = this.portalSubscription(session.customer);
    if (!sub || sub.status === 'canceled') throw invalidRequest('There is no active subscription to change.', 'subscription');
    if (!Number.isInteger(seats) || seats < 1 || seats > this.settings.maxQuantity) {
      throw invalidRequest(`Choose between 1 and ${this.settings.maxQuantity} seats.`, 'seats');
    }
    return this.tx(() => {
      const before = clone(sub);
      const item = sub.items.data[0];
      const at = this.now(sub.customer as string);
      this.applyItemChanges(sub, [{ item, quantity: seats, price: item.price }], this.settings.portalProrationBehavior, at, false, NO_REQUEST, before);
      return sub;
    });
  }

  /** Proration preview for the portal's confirmation step. */
  portalPreviewSeats(sessionId: string, seats: number): { prorationNet: number; lines: LineSpec[]; newPeriodTotal: number; behaviour: ProrationBehavior } {
    const session = this.portalSession(sessionId);
    const sub = this.portalSubscription(session.customer);
    if (!sub || sub.status === 'canceled') throw invalidRequest('There is no active subscription to change.', 'subscription');
    if (!Number.isInteger(seats) || seats < 1 || seats > this.settings.maxQuantity) {
      throw invalidRequest(`Choose between 1 and ${this.settings.maxQuantity} seats.`, 'seats');
    }
    const item = sub.items.data[0];
    const behaviour = this.settings.portalProrationBehavior;
    const lines =
      behaviour === 'none' || sub.status === 'trialing'
        ? []
        : this.prorationLines(sub, [{ item, quantity: seats, price: item.price }], this.now(sub.customer as string), true);
    return {
      prorationNet: lines.reduce((s, l) => s + l.amount, 0),
      lines,
      newPeriodTotal: (item.price.unit_amount ?? 0) * seats,
      behaviour,
    };
  }

  portalSetCancel(sessionId: string, cancel: boolean): Stripe.Subscription {
    const session = this.portalSession(sessionId);
    const sub = this.portalSubscription(session.customer);
    if (!sub || sub.status === 'canceled') throw invalidRequest('There is no active subscription to change.', 'subscription');
    return this.tx(() => {
      const before = clone(sub);
      this.applyCancelAtPeriodEnd(sub, cancel);
      const prev = previousAttributes(before, sub);
      if (Object.keys(prev).length > 0) this.emit('customer.subscription.updated', sub, NO_REQUEST, prev);
      return sub;
    });
  }

  portalUpdateCard(sessionId: string, input: CardInput): { ok: true } | { ok: false; field: string; message: string } {
    const session = this.portalSession(sessionId);
    const check = checkCard(input);
    if (!check.ok) return check;
    if (check.card.behaviour === 'decline') return { ok: false, field: 'card_number', message: DECLINED_MESSAGE };
    this.replaceCard(session.customer, check.card, NO_REQUEST, true);
    return { ok: true };
  }

  // ---------- clock ----------

  /**
   * Moves each selected subscription to its next period (like advancing a Stripe test clock to the
   * period end): ends subscriptions set to cancel at period end, otherwise retries open invoices,
   * starts the next period and raises and charges its invoice.
   */
  advance(target: { customer?: string; subscription?: string }): AdvanceResult[] {
    return this.tx(() => {
      if (target.customer) this.customer(target.customer, 'customer');
      if (target.subscription) this.subscription(target.subscription, 'subscription');
      const subs = Object.values(this.state.subscriptions)
        .filter((s) => s.status !== 'canceled' && s.status !== 'incomplete_expired')
        .filter((s) => (!target.customer || s.customer === target.customer) && (!target.subscription || s.id === target.subscription))
        .sort((a, b) => a.items.data[0].current_period_end - b.items.data[0].current_period_end);
      return subs.map((sub) => this.advanceOne(sub));
    });
  }

  private advanceOne(sub: Stripe.Subscription): AdvanceResult {
    const customerId = sub.customer as string;
    const item0 = sub.items.data[0];
    const end = item0.current_period_end;
    const realNow = Math.floor(Date.now() / 1000);
    this.state.clocks[customerId] = Math.max(this.state.clocks[customerId] ?? 0, end - realNow);
    const ctx = NO_REQUEST;
    if (sub.cancel_at_period_end || (sub.cancel_at !== null && sub.cancel_at <= end)) {
      const before = clone(sub);
      sub.status = 'canceled';
      sub.ended_at = end;
      sub.canceled_at = sub.canceled_at ?? end;
      this.emit('customer.subscription.deleted', sub, ctx, previousAttributes(before, sub));
      return { subscription: sub.id, customer: customerId, outcome: 'canceled', status: sub.status, invoice: null, amount_due: null, period_start: null, period_end: null };
    }
    this.retryOpenInvoices(customerId, ctx, sub.id);
    const before = clone(sub);
    if (sub.status === 'trialing') sub.status = 'active';
    const customer = this.customer(customerId);
    const specs: LineSpec[] = this.pendingItemLines(sub.id);
    for (const item of sub.items.data) {
      const interval = item.price.recurring?.interval ?? 'month';
      const count = item.price.recurring?.interval_count ?? 1;
      const start = item.current_period_end;
      const next = nextBoundary(sub.billing_cycle_anchor, interval, count, start);
      item.current_period_start = start;
      item.current_period_end = next;
      specs.push({
        id: newId('il'),
        amount: (item.price.unit_amount ?? 0) * (item.quantity ?? 1),
        currency: sub.currency,
        description: `${item.quantity} × ${productName(this.state, item.price)} (at ${this.unitLabel(item.price)})`,
        price: item.price,
        quantity: item.quantity ?? 1,
        periodStart: start,
        periodEnd: next,
        subscription: sub.id,
        subscriptionItem: item.id,
        invoiceItem: null,
        proration: false,
        creditedItems: null,
      });
    }
    // The invoice covers the period that just ended (its prorations) and bills the new one in advance.
    const invoice = this.draftInvoice(newId('in'), customer, sub, 'subscription_cycle', specs, before.items.data[0].current_period_start, end);
    sub.latest_invoice = invoice.id;
    this.emit('customer.subscription.updated', sub, ctx, previousAttributes(before, sub));
    this.emit('invoice.created', invoice, ctx);
    this.finalizeInvoice(invoice, ctx);
    const paid = this.chargeInvoice(invoice, ctx);
    this.syncSubscriptionStatus(sub, ctx);
    return {
      subscription: sub.id,
      customer: customerId,
      outcome: paid ? 'renewed' : 'payment_failed',
      status: sub.status,
      invoice: invoice.id,
      amount_due: invoice.amount_due,
      period_start: sub.items.data[0].current_period_start,
      period_end: sub.items.data[0].current_period_end,
    };
  }
}

export { FakeStripeError };
export type { CardBehaviour };
