// Stripe objects for the billing tests, built with the fake's typed builders (the pinned API version's shapes).
import type Stripe from 'stripe';
import { randomUUID } from 'node:crypto';
import {
  checkoutSessionObject,
  customerObject,
  invoiceLineObject,
  invoiceObject,
  priceObject,
  subscriptionItemObject,
  subscriptionObject,
} from '@/lib/fakes/stripe/objects';

export const T0 = 1_800_000_000; // seconds; a fixed moment for stamped events
const MONTH = 30 * 86_400;

export const price = priceObject({
  id: 'price_test_seat',
  created: T0 - 1000,
  product: 'prod_test_seat',
  currency: 'eur',
  unitAmount: 2900,
  interval: 'month',
  intervalCount: 1,
  lookupKey: 'stochos_seat_monthly',
  nickname: null,
  metadata: {},
});

export function customer(id: string): Stripe.Customer {
  return customerObject({ id, created: T0, email: 'owner@test-firm.example', name: 'Test firm', description: null, phone: null, metadata: {}, invoicePrefix: 'ABCD1234' });
}

export function subscription(o: {
  id: string;
  customer: string;
  firmId: string | null;
  quantity: number;
  status?: Stripe.Subscription.Status;
  created?: number;
  periodStart?: number;
  periodEnd?: number;
  cancelAtPeriodEnd?: boolean;
}): Stripe.Subscription {
  const created = o.created ?? T0;
  const start = o.periodStart ?? created;
  const end = o.periodEnd ?? start + MONTH;
  const item = subscriptionItemObject({ id: `si_${o.id}`, created, subscription: o.id, price, quantity: o.quantity, periodStart: start, periodEnd: end, metadata: {} });
  const sub = subscriptionObject({
    id: o.id,
    created,
    customer: o.customer,
    currency: 'eur',
    items: [item],
    metadata: o.firmId ? { firm_id: o.firmId } : {},
    status: o.status ?? 'active',
    billingCycleAnchor: start,
    defaultPaymentMethod: null,
    trialStart: null,
    trialEnd: null,
    description: null,
  });
  if (o.cancelAtPeriodEnd) {
    sub.cancel_at_period_end = true;
    sub.cancel_at = end;
  }
  if (o.status === 'canceled') {
    sub.canceled_at = created;
    sub.ended_at = created;
  }
  return sub;
}

export function invoice(o: {
  id: string;
  customer: string;
  subscription: Stripe.Subscription;
  quantity: number;
  status: 'paid' | 'open';
  attempts?: number;
  created?: number;
}): Stripe.Invoice {
  const created = o.created ?? T0;
  const amount = 2900 * o.quantity;
  const line = invoiceLineObject(o.id, {
    id: `il_${o.id}`,
    amount,
    currency: 'eur',
    description: `${o.quantity} × Stochos seat`,
    price,
    quantity: o.quantity,
    periodStart: created,
    periodEnd: created + MONTH,
    subscription: o.subscription.id,
    subscriptionItem: o.subscription.items.data[0]!.id,
    invoiceItem: null,
    proration: false,
    creditedItems: null,
  });
  const inv = invoiceObject({
    id: o.id,
    created,
    customer: customer(o.customer),
    currency: 'eur',
    subscription: o.subscription,
    billingReason: 'subscription_cycle',
    lines: [line],
    periodStart: created,
    periodEnd: created + MONTH,
    number: `ABCD1234-${o.id.slice(-4)}`,
    hostedUrl: `http://127.0.0.1:1/invoices/${o.id}`,
    startingBalance: 0,
  });
  inv.status = o.status;
  inv.attempt_count = o.attempts ?? 1;
  inv.attempted = true;
  if (o.status === 'paid') {
    inv.amount_paid = amount;
    inv.amount_remaining = 0;
  }
  return inv;
}

export function checkoutSession(o: { customer: string; firmId: string; subscription: string }): Stripe.Checkout.Session {
  const s = checkoutSessionObject({
    id: `cs_test_${randomUUID().replace(/-/g, '')}`,
    created: T0,
    url: 'http://127.0.0.1:1/checkout/x',
    customer: o.customer,
    customerEmail: null,
    clientReferenceId: o.firmId,
    currency: 'eur',
    amountTotal: 8700,
    metadata: { firm_id: o.firmId },
    successUrl: 'http://localhost/app/billing',
    cancelUrl: null,
  });
  s.status = 'complete';
  s.subscription = o.subscription;
  return s;
}

let n = 0;
export function event(type: string, object: object, created: number): Stripe.Event {
  n += 1;
  return {
    id: `evt_test_${n}_${randomUUID().replace(/-/g, '').slice(0, 12)}`,
    object: 'event',
    api_version: '2026-10-28.endive',
    created,
    data: { object },
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type,
  } as unknown as Stripe.Event;
}
