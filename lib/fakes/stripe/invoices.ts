// Invoices: drafting, finalizing, charging the card on file, the statuses that follow from unpaid
// invoices, and invoices.createPreview.
import type Stripe from 'stripe';
import { invalidRequest } from './errors';
import { newId, randomToken } from './ids';
import { invoiceLineObject, invoiceObject, type LineSpec } from './objects';
import type { Params } from './params';
import { nextBoundary } from './period';
import { clone, type FakeCore, previousAttributes, productName, type RequestContext, unitLabel } from './core';
import { prorationLines, readItemChanges, readProrationDate } from './proration';

/** How long an unpaid invoice waits before the next automatic attempt (a plausible value; common practice, no source). */
const RETRY_AFTER_SECONDS = 3 * 86_400;

export function draftInvoice(
  core: FakeCore,
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
    created: core.now(customer.id),
    customer,
    currency: sub?.currency ?? core.settings.currency,
    subscription: sub,
    billingReason: reason,
    lines: specs.map((s) => invoiceLineObject(id, s)),
    periodStart,
    periodEnd,
    number: null,
    hostedUrl: `${core.settings.publicUrl}/invoices/${id}`,
    startingBalance: customer.balance,
  });
  for (const s of specs) {
    if (s.invoiceItem && core.state.invoiceItems[s.invoiceItem]) core.state.invoiceItems[s.invoiceItem].invoice = id;
  }
  core.state.invoices[id] = invoice;
  return invoice;
}

/** Finalizing numbers the invoice and applies the customer's credit balance (negative balance = credit). */
export function finalizeInvoice(core: FakeCore, invoice: Stripe.Invoice, ctx: RequestContext): void {
  const customer = core.customer(invoice.customer as string);
  const now = core.now(customer.id);
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
  core.emit('invoice.finalized', invoice, ctx);
}

/** Attempts to collect an open invoice with the card on file. Returns true when paid. */
export function chargeInvoice(core: FakeCore, invoice: Stripe.Invoice, ctx: RequestContext): boolean {
  const customerId = invoice.customer as string;
  const subId = invoice.parent?.subscription_details?.subscription;
  const sub = typeof subId === 'string' ? core.state.subscriptions[subId] : undefined;
  const now = core.now(customerId);
  let paid = invoice.amount_due === 0;
  if (!paid) {
    const pm = core.defaultCard(customerId, sub);
    paid = pm !== null && core.state.cardBehaviour[pm.id] === 'succeed';
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
    core.emit('invoice.paid', invoice, ctx);
    core.emit('invoice.payment_succeeded', invoice, ctx);
  } else {
    invoice.next_payment_attempt = now + RETRY_AFTER_SECONDS;
    core.emit('invoice.payment_failed', invoice, ctx);
  }
  syncDelinquency(core, customerId, ctx);
  return paid;
}

/** past_due while the subscription has an open invoice; back to active once everything is paid. */
export function syncSubscriptionStatus(core: FakeCore, sub: Stripe.Subscription, ctx: RequestContext): void {
  if (sub.status === 'canceled') return;
  const open = core.invoicesOf({ subscription: sub.id }).some((i) => i.status === 'open');
  const next = open ? 'past_due' : sub.status === 'past_due' ? 'active' : sub.status;
  if (next !== sub.status) {
    const before = clone(sub);
    sub.status = next;
    core.emit('customer.subscription.updated', sub, ctx, previousAttributes(before, sub));
  }
}

function syncDelinquency(core: FakeCore, customerId: string, ctx: RequestContext): void {
  const customer = core.state.customers[customerId];
  if (!customer) return;
  const delinquent = core.invoicesOf({ customer: customerId }).some((i) => i.status === 'open' && i.attempt_count > 0);
  if (customer.delinquent !== delinquent) {
    const before = clone(customer);
    customer.delinquent = delinquent;
    core.emit('customer.updated', customer, ctx, previousAttributes(before, customer));
  }
}

export function retryOpenInvoices(core: FakeCore, customerId: string, ctx: RequestContext, subId?: string): void {
  const open = core.invoicesOf({ customer: customerId, subscription: subId })
    .filter((i) => i.status === 'open')
    .reverse();
  for (const invoice of open) chargeInvoice(core, invoice, ctx);
  for (const sub of core.subscriptionsOf(customerId)) {
    if (!subId || sub.id === subId) syncSubscriptionStatus(core, sub, ctx);
  }
}

/** Invoice items of `subId` not yet on an invoice, as invoice lines. */
export function pendingItemLines(core: FakeCore, subId: string): LineSpec[] {
  return Object.values(core.state.invoiceItems)
    .filter((ii) => ii.invoice === null && ii.parent?.subscription_details?.subscription === subId)
    .map((ii) => lineFromInvoiceItem(core, ii));
}

function lineFromInvoiceItem(core: FakeCore, ii: Stripe.InvoiceItem): LineSpec {
  const priceId = ii.pricing?.price_details?.price;
  const price = core.price(typeof priceId === 'string' ? priceId : (priceId?.id ?? ''));
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

/** invoices.createPreview: the invoice that would result from the given subscription changes. */
export function previewInvoice(core: FakeCore, p: Params): Stripe.Invoice {
  const subId = p.str('subscription');
  let customerId = p.str('customer');
  let sub: Stripe.Subscription | undefined;
  if (subId) {
    sub = core.subscription(subId, 'subscription');
    if (customerId && sub.customer !== customerId) throw invalidRequest('The subscription does not belong to the customer.', 'subscription');
    customerId = sub.customer as string;
  } else if (customerId) {
    core.customer(customerId, 'customer');
    sub = core.subscriptionsOf(customerId).find((s) => s.status !== 'canceled');
  } else {
    throw invalidRequest('Missing required param: customer or subscription.', 'customer');
  }
  if (!sub || sub.status === 'canceled') {
    throw invalidRequest(`No upcoming invoices for customer: ${customerId}`, 'subscription', 'invoice_upcoming_none');
  }
  const customer = core.customer(customerId!);
  const details = p.child('subscription_details');
  const changes = details ? readItemChanges(core, sub, details.list('items')) : [];
  const behaviour = details?.enumOf('proration_behavior', ['create_prorations', 'always_invoice', 'none'] as const) ?? 'create_prorations';
  const at = details ? readProrationDate(core, sub, details, 'proration_date') : core.now(customerId);
  const cancelAtEnd = details?.bool('cancel_at_period_end') ?? sub.cancel_at_period_end;
  const prorations = behaviour === 'none' || sub.status === 'trialing' ? [] : prorationLines(core, sub, changes, at, true);
  const pending = Object.values(core.state.invoiceItems)
    .filter((ii) => ii.invoice === null && ii.parent?.subscription_details?.subscription === sub!.id)
    .map((ii) => ({ ...lineFromInvoiceItem(core, ii), id: `il_tmp_${randomToken(24)}` }));
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
          description: `${quantity} × ${productName(core.state, price)} (at ${unitLabel(price)})`,
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
    created: core.now(customerId),
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
