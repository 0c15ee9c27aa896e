import 'server-only';
import type { Knex } from 'knex';
import type Stripe from 'stripe';
import { writeTransaction } from '@/db/knex';
import {
  firmIdByCustomer,
  getInvoiceRow,
  getSubscriptionRow,
  hasStripeEvent,
  insertStripeEvent,
  upsertInvoice,
  upsertSubscription,
  type SubscriptionRow,
} from '@/db/billing';
import { recordAudit } from '@/db/audit';
import { checkoutFields, invoiceFields, subscriptionFields, type InvoiceFields, type SubscriptionFields } from './stripe-objects';
import { DAY_MS, GRACE_DAYS } from '@/lib/core/billing/plan';

// Applies Stripe webhook events to the database. Each event id is stored in the same transaction as the change it
// makes, so a replay changes nothing. Events can arrive out of order (Stripe retries failed deliveries later):
// every subscription and invoice row keeps the `created` time of the last event applied, and an older event never
// overwrites a newer state.

export const HANDLED_EVENTS = [
  'checkout.session.completed',
  'customer.subscription.created',
  'customer.subscription.updated',
  'customer.subscription.deleted',
  'invoice.paid',
  'invoice.payment_failed',
] as const;
type Handled = (typeof HANDLED_EVENTS)[number];

export type EventOutcome = 'applied' | 'stale' | 'duplicate' | 'ignored' | 'unknown_customer' | 'firm_mismatch';

export type BillingNotice =
  | { kind: 'receipt'; firmId: string; invoice: InvoiceFields }
  | { kind: 'payment_failed'; firmId: string; invoice: InvoiceFields; graceEndsAt: string };

export interface EventResult {
  outcome: EventOutcome;
  firmId: string | null;
  notices: BillingNotice[];
}

export interface ProcessDeps {
  /** Reads a subscription fresh from Stripe; null when it cannot (the event's own copy is used then). */
  fetchSubscription: (id: string) => Promise<Stripe.Subscription | null>;
  now: () => number;
  log: (line: string) => void;
}

const isHandled = (type: string): type is Handled => (HANDLED_EVENTS as readonly string[]).includes(type);

function customerOf(event: Stripe.Event): string | null {
  const o = event.data.object as { customer?: string | { id: string } | null };
  if (!o.customer) return null;
  return typeof o.customer === 'string' ? o.customer : o.customer.id;
}

const sameState = (row: SubscriptionRow, f: SubscriptionFields) =>
  row.status === f.status && row.quantity === f.quantity && row.cancelAtPeriodEnd === f.cancelAtPeriodEnd && row.currentPeriodEnd === f.currentPeriodEnd && row.priceId === f.priceId;

/**
 * Network reads happen before the write transaction (SQLite has one connection; never hold it across a call):
 * - two subscription updates stamped with the same second cannot be ordered by `created`; when the stored state and
 *   the event disagree, Stripe's current copy settles it;
 * - checkout.session.completed arriving before customer.subscription.created fetches the subscription it names.
 */
async function freshSubscriptionFor(event: Stripe.Event, deps: ProcessDeps): Promise<Stripe.Subscription | null> {
  if (event.type === 'customer.subscription.updated') {
    const f = subscriptionFields(event.data.object as Stripe.Subscription);
    const row = await getSubscriptionRow(f.id);
    if (row && row.lastEventCreated === event.created && row.lastEventType === 'customer.subscription.updated' && !sameState(row, f)) {
      return deps.fetchSubscription(f.id);
    }
  }
  if (event.type === 'checkout.session.completed') {
    const c = checkoutFields(event.data.object as Stripe.Checkout.Session);
    if (c.subscriptionId && !(await getSubscriptionRow(c.subscriptionId))) return deps.fetchSubscription(c.subscriptionId);
  }
  return null;
}

export async function processStripeEvent(event: Stripe.Event, deps: ProcessDeps): Promise<EventResult> {
  if (!isHandled(event.type)) return { outcome: 'ignored', firmId: null, notices: [] };
  const customerId = customerOf(event);
  if (!customerId) {
    deps.log(`event ${event.id} (${event.type}) names no customer; acknowledged, nothing changed`);
    return { outcome: 'ignored', firmId: null, notices: [] };
  }
  const fresh = await freshSubscriptionFor(event, deps);

  return writeTransaction(async (trx) => {
    if (await hasStripeEvent(event.id, trx)) return { outcome: 'duplicate' as const, firmId: null, notices: [] };
    const firmId = await firmIdByCustomer(customerId, trx);
    if (!firmId) {
      deps.log(`event ${event.id} (${event.type}) is for unknown customer ${customerId}; acknowledged, nothing changed`);
      return { outcome: 'unknown_customer' as const, firmId: null, notices: [] };
    }
    const result = await apply(event, event.type as Handled, firmId, fresh, deps, trx);
    if (result.outcome === 'firm_mismatch') {
      deps.log(`event ${event.id} (${event.type}) names a firm other than customer ${customerId}'s; acknowledged, nothing changed`);
      return result;
    }
    await insertStripeEvent({ id: event.id, type: event.type, firmId, created: event.created, outcome: result.outcome }, trx);
    return result;
  });
}

async function apply(event: Stripe.Event, type: Handled, firmId: string, fresh: Stripe.Subscription | null, deps: ProcessDeps, trx: Knex.Transaction): Promise<EventResult> {
  const done = (outcome: EventOutcome, notices: BillingNotice[] = []): EventResult => ({ outcome, firmId, notices });
  switch (type) {
    case 'customer.subscription.created':
    case 'customer.subscription.updated':
    case 'customer.subscription.deleted': {
      const sub = fresh ?? (event.data.object as Stripe.Subscription);
      return done(await applySubscription(trx, firmId, subscriptionFields(sub), event.created, type, deps.now()));
    }
    case 'checkout.session.completed': {
      const c = checkoutFields(event.data.object as Stripe.Checkout.Session);
      if (c.mode !== 'subscription') return done('ignored');
      // The session's firm (set by Stochos when it opened checkout) must be the firm that owns the customer.
      if (c.firmId !== firmId) return done('firm_mismatch');
      if (fresh) {
        const outcome = await applySubscription(trx, firmId, subscriptionFields(fresh), event.created, type, deps.now());
        if (outcome === 'firm_mismatch') return done(outcome);
      }
      await recordAudit({ firmId, actorUserId: null, action: 'billing.checkout_completed', targetType: 'subscription', targetId: c.subscriptionId ?? undefined, detail: { session: c.id } }, trx);
      return done('applied');
    }
    case 'invoice.paid':
    case 'invoice.payment_failed': {
      const inv = invoiceFields(event.data.object as Stripe.Invoice);
      const outcome = await applyInvoice(trx, firmId, inv, event.created);
      if (outcome !== 'applied') return done(outcome);
      if (type === 'invoice.paid') {
        await recordAudit({ firmId, actorUserId: null, action: 'billing.invoice_paid', targetType: 'invoice', targetId: inv.id, detail: { number: inv.number, amount: inv.amountPaid, currency: inv.currency, seats: inv.seats } }, trx);
        return done('applied', inv.amountPaid > 0 ? [{ kind: 'receipt', firmId, invoice: inv }] : []);
      }
      const graceEndsAt = await graceEndFor(trx, inv.subscriptionId, event.created, deps.now());
      await recordAudit({ firmId, actorUserId: null, action: 'billing.payment_failed', targetType: 'invoice', targetId: inv.id, detail: { number: inv.number, amount: inv.amountDue, currency: inv.currency, graceEndsAt } }, trx);
      return done('applied', [{ kind: 'payment_failed', firmId, invoice: inv, graceEndsAt }]);
    }
  }
}

/** A moment reported by Stripe, never later than the app's own clock (a test clock may run ahead). */
const notAfterNow = (stripeSeconds: number, now: number) => new Date(Math.min(stripeSeconds * 1000, now)).toISOString();

async function graceEndFor(trx: Knex.Transaction, subscriptionId: string | null, created: number, now: number): Promise<string> {
  const row = subscriptionId ? await getSubscriptionRow(subscriptionId, trx) : null;
  const since = row?.status === 'past_due' && row.pastDueSince ? row.pastDueSince : notAfterNow(created, now);
  return new Date(Date.parse(since) + GRACE_DAYS * DAY_MS).toISOString();
}

export async function applySubscription(
  trx: Knex.Transaction,
  firmId: string,
  f: SubscriptionFields,
  created: number,
  type: string,
  now: number,
): Promise<EventOutcome> {
  if (f.firmIdInMetadata && f.firmIdInMetadata !== firmId) return 'firm_mismatch';
  const prev = await getSubscriptionRow(f.id, trx);
  if (prev) {
    if (prev.firmId !== firmId) return 'firm_mismatch';
    // A cancelled subscription stays cancelled; Stripe never revives one.
    if (prev.status === 'canceled' && f.status !== 'canceled') return 'stale';
    if (created < prev.lastEventCreated) return 'stale';
    // "created" is the first event of a subscription: anything stored with the same second is at least as new.
    if (created === prev.lastEventCreated && type === 'customer.subscription.created' && prev.lastEventType !== type) return 'stale';
  }
  const pastDueSince = f.status === 'past_due' ? (prev?.status === 'past_due' && prev.pastDueSince ? prev.pastDueSince : notAfterNow(created, now)) : null;
  await upsertSubscription(
    {
      id: f.id,
      firmId,
      customerId: f.customerId,
      status: f.status,
      itemId: f.itemId,
      priceId: f.priceId,
      unitAmount: f.unitAmount,
      currency: f.currency,
      interval: f.interval,
      quantity: f.quantity,
      currentPeriodStart: f.currentPeriodStart,
      currentPeriodEnd: f.currentPeriodEnd,
      cancelAtPeriodEnd: f.cancelAtPeriodEnd,
      canceledAt: f.canceledAt,
      endedAt: f.endedAt,
      pastDueSince,
      lastEventCreated: created,
      lastEventType: type,
      stripeCreatedAt: f.stripeCreatedAt,
    },
    trx,
  );
  const detail: Record<string, unknown> = {};
  if (!prev) Object.assign(detail, { started: true, seats: f.quantity, status: f.status });
  else {
    if (prev.quantity !== f.quantity) Object.assign(detail, { seatsFrom: prev.quantity, seatsTo: f.quantity });
    if (prev.status !== f.status) Object.assign(detail, { statusFrom: prev.status, statusTo: f.status });
    if (prev.cancelAtPeriodEnd !== f.cancelAtPeriodEnd) Object.assign(detail, { cancelAtPeriodEnd: f.cancelAtPeriodEnd, periodEnd: f.currentPeriodEnd });
  }
  if (Object.keys(detail).length) {
    await recordAudit({ firmId, actorUserId: null, action: 'billing.subscription_changed', targetType: 'subscription', targetId: f.id, detail }, trx);
  }
  return 'applied';
}

const TERMINAL_INVOICE = new Set(['paid', 'void', 'uncollectible']);

export async function applyInvoice(trx: Knex.Transaction, firmId: string, f: InvoiceFields, created: number): Promise<EventOutcome> {
  const prev = await getInvoiceRow(f.id, trx);
  if (prev) {
    if (prev.firmId !== firmId) return 'firm_mismatch';
    if (TERMINAL_INVOICE.has(prev.status) && prev.status !== f.status) return 'stale';
    if (created < prev.lastEventCreated) return 'stale';
  }
  await upsertInvoice(
    {
      id: f.id,
      firmId,
      subscriptionId: f.subscriptionId,
      number: f.number,
      status: f.status,
      billingReason: f.billingReason,
      total: f.total,
      amountDue: f.amountDue,
      amountPaid: f.amountPaid,
      currency: f.currency,
      seats: f.seats,
      periodStart: f.periodStart,
      periodEnd: f.periodEnd,
      hostedInvoiceUrl: f.hostedInvoiceUrl,
      attemptCount: Math.max(f.attemptCount, prev?.attemptCount ?? 0),
      lastEventCreated: created,
      stripeCreatedAt: f.stripeCreatedAt,
    },
    trx,
  );
  return 'applied';
}
