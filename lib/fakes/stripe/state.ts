// The fake's whole world as one JSON document, written atomically (temp file + rename) after every
// change so a restart (or a crash between requests) loses nothing, including undelivered webhooks.
import fs from 'node:fs';
import path from 'node:path';
import type Stripe from 'stripe';

export type CardBehaviour = 'succeed' | 'decline';

export interface DeliveryAttempt {
  /** epoch milliseconds */
  at: number;
  /** HTTP status from the app, or null when it was unreachable */
  status: number | null;
  error: string | null;
}

export interface StoredEvent {
  event: Stripe.Event;
  delivery: {
    status: 'pending' | 'delivered' | 'failed' | 'no_endpoint';
    attempts: DeliveryAttempt[];
    /** epoch milliseconds of the next try while pending */
    nextAttemptAt: number | null;
  };
}

export interface CheckoutExtras {
  trialPeriodDays: number | null;
  subscriptionMetadata: Record<string, string>;
  subscriptionDescription: string | null;
  lastError: string | null;
}

export interface FakeState {
  version: 1;
  customers: Record<string, Stripe.Customer>;
  products: Record<string, Stripe.Product>;
  prices: Record<string, Stripe.Price>;
  paymentMethods: Record<string, Stripe.PaymentMethod>;
  /** what a charge on each stored card does */
  cardBehaviour: Record<string, CardBehaviour>;
  subscriptions: Record<string, Stripe.Subscription>;
  invoices: Record<string, Stripe.Invoice>;
  invoiceItems: Record<string, Stripe.InvoiceItem>;
  checkoutSessions: Record<string, Stripe.Checkout.Session>;
  checkoutLineItems: Record<string, Stripe.LineItem[]>;
  checkoutExtras: Record<string, CheckoutExtras>;
  portalSessions: Record<string, Stripe.BillingPortal.Session>;
  /** per-customer clock offsets in seconds (like Stripe test clocks): /_fake/advance moves them */
  clocks: Record<string, number>;
  /** in creation order */
  events: StoredEvent[];
}

export function emptyState(): FakeState {
  return {
    version: 1,
    customers: {},
    products: {},
    prices: {},
    paymentMethods: {},
    cardBehaviour: {},
    subscriptions: {},
    invoices: {},
    invoiceItems: {},
    checkoutSessions: {},
    checkoutLineItems: {},
    checkoutExtras: {},
    portalSessions: {},
    clocks: {},
    events: [],
  };
}

export function loadState(file: string | null): FakeState | null {
  if (!file || !fs.existsSync(file)) return null;
  const parsed = JSON.parse(fs.readFileSync(file, 'utf8')) as Partial<FakeState>;
  if (parsed.version !== 1) throw new Error(`fake Stripe: unsupported state file version in ${file}`);
  return { ...emptyState(), ...parsed } as FakeState;
}

let tmpCounter = 0;

export function saveState(file: string | null, state: FakeState): void {
  if (!file) return;
  fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  tmpCounter += 1;
  const tmp = `${file}.${process.pid}.${tmpCounter}.tmp`;
  fs.writeFileSync(tmp, JSON.stringify(state));
  fs.renameSync(tmp, file);
}
