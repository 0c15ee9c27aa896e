// Subscriptions: updates with Stripe's proration behaviours, cancellation, and the clock that moves
// them to their next period (/_fake/advance).
import type Stripe from 'stripe';
import { cardDeclined, invalidRequest } from './errors';
import { newId } from './ids';
import { invoiceItemObject, type LineSpec, planFromPrice } from './objects';
import type { Params } from './params';
import { nextBoundary } from './period';
import { type AdvanceResult, clone, type FakeCore, type ItemChange, NO_REQUEST, previousAttributes, productName, type ProrationBehavior, type RequestContext, unitLabel } from './core';
import { chargeInvoice, draftInvoice, finalizeInvoice, pendingItemLines, retryOpenInvoices, syncSubscriptionStatus } from './invoices';
import { prorationLines, readItemChanges, readProrationDate } from './proration';

export function updateSubscription(core: FakeCore, id: string, p: Params, ctx: RequestContext): Stripe.Subscription {
  return core.tx(() => {
    const sub = core.subscription(id);
    if (sub.status === 'canceled') {
      throw invalidRequest('A canceled subscription can only update its cancellation_details and metadata.', 'status');
    }
    const changes = readItemChanges(core, sub, p.list('items'));
    const behaviour = p.enumOf('proration_behavior', ['create_prorations', 'always_invoice', 'none'] as const) ?? 'create_prorations';
    const at = readProrationDate(core, sub, p, 'proration_date');
    const paymentBehavior = p.enumOf('payment_behavior', ['allow_incomplete', 'default_incomplete', 'error_if_incomplete', 'pending_if_incomplete'] as const);
    const cancelAtPeriodEnd = p.bool('cancel_at_period_end');
    const cancelAtRaw = p.str('cancel_at');
    const defaultPm = p.str('default_payment_method');
    if (defaultPm) {
      const pm = core.paymentMethod(defaultPm, 'default_payment_method');
      if (pm.customer !== sub.customer) throw invalidRequest('The payment method must be attached to the customer.', 'default_payment_method');
    }
    if (cancelAtRaw !== undefined && cancelAtRaw !== '') {
      throw invalidRequest('The local fake Stripe supports cancel_at_period_end, not cancel_at timestamps.', 'cancel_at');
    }
    const before = clone(sub);
    if (defaultPm) sub.default_payment_method = defaultPm;
    if (p.has('description')) sub.description = p.str('description') || null;
    sub.metadata = p.applyMetadata(sub.metadata);
    applyCancelAtPeriodEnd(core, sub, cancelAtPeriodEnd ?? (cancelAtRaw === '' ? false : undefined));
    applyItemChanges(core, sub, changes, behaviour, at, paymentBehavior === 'error_if_incomplete', ctx, before);
    return sub;
  });
}

export function applyCancelAtPeriodEnd(core: FakeCore, sub: Stripe.Subscription, value: boolean | undefined): void {
  if (value === undefined) return;
  const now = core.now(sub.customer as string);
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
export function applyItemChanges(
  core: FakeCore,
  sub: Stripe.Subscription,
  changes: ItemChange[],
  behaviour: ProrationBehavior,
  at: number,
  errorIfIncomplete: boolean,
  ctx: RequestContext,
  before: Stripe.Subscription,
): void {
  const customer = core.customer(sub.customer as string);
  const prorations = behaviour === 'none' || sub.status === 'trialing' ? [] : prorationLines(core, sub, changes, at, false);
  const net = prorations.reduce((s, l) => s + l.amount, 0);
  if (errorIfIncomplete && behaviour === 'always_invoice' && net + customer.balance > 0) {
    const pm = core.defaultCard(customer.id, sub);
    if (!pm || core.state.cardBehaviour[pm.id] !== 'succeed') throw cardDeclined();
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
    core.state.invoiceItems[ii.id] = ii;
    core.emit('invoiceitem.created', ii, ctx);
  }
  let invoice: Stripe.Invoice | null = null;
  if (behaviour === 'always_invoice' && prorations.length > 0) {
    const pending = pendingItemLines(core, sub.id);
    invoice = draftInvoice(core, newId('in'), customer, sub, 'subscription_update', pending, at, at);
    sub.latest_invoice = invoice.id;
  }
  const prev = previousAttributes(before, sub);
  if (Object.keys(prev).length > 0) core.emit('customer.subscription.updated', sub, ctx, prev);
  if (invoice) {
    core.emit('invoice.created', invoice, ctx);
    finalizeInvoice(core, invoice, ctx);
    chargeInvoice(core, invoice, ctx);
    syncSubscriptionStatus(core, sub, ctx);
  }
}

export function cancelSubscription(core: FakeCore, id: string, ctx: RequestContext): Stripe.Subscription {
  return core.tx(() => {
    const sub = core.subscription(id);
    if (sub.status === 'canceled') {
      throw invalidRequest(`A canceled subscription can't be canceled again: ${id}`, 'id');
    }
    const now = core.now(sub.customer as string);
    sub.status = 'canceled';
    sub.canceled_at = now;
    sub.ended_at = now;
    sub.cancel_at = null;
    sub.cancel_at_period_end = false;
    sub.cancellation_details = { comment: null, feedback: null, feedback_option: null, reason: 'cancellation_requested' };
    core.emit('customer.subscription.deleted', sub, ctx);
    return sub;
  });
}

/**
 * Moves each selected subscription to its next period (like advancing a Stripe test clock to the
 * period end): ends subscriptions set to cancel at period end, otherwise retries open invoices,
 * starts the next period and raises and charges its invoice.
 */
export function advance(core: FakeCore, target: { customer?: string; subscription?: string }): AdvanceResult[] {
  return core.tx(() => {
    if (target.customer) core.customer(target.customer, 'customer');
    if (target.subscription) core.subscription(target.subscription, 'subscription');
    const subs = Object.values(core.state.subscriptions)
      .filter((s) => s.status !== 'canceled' && s.status !== 'incomplete_expired')
      .filter((s) => (!target.customer || s.customer === target.customer) && (!target.subscription || s.id === target.subscription))
      .sort((a, b) => a.items.data[0].current_period_end - b.items.data[0].current_period_end);
    return subs.map((sub) => advanceOne(core, sub));
  });
}

function advanceOne(core: FakeCore, sub: Stripe.Subscription): AdvanceResult {
  const customerId = sub.customer as string;
  const item0 = sub.items.data[0];
  const end = item0.current_period_end;
  const realNow = Math.floor(Date.now() / 1000);
  core.state.clocks[customerId] = Math.max(core.state.clocks[customerId] ?? 0, end - realNow);
  const ctx = NO_REQUEST;
  if (sub.cancel_at_period_end || (sub.cancel_at !== null && sub.cancel_at <= end)) {
    const before = clone(sub);
    sub.status = 'canceled';
    sub.ended_at = end;
    sub.canceled_at = sub.canceled_at ?? end;
    core.emit('customer.subscription.deleted', sub, ctx, previousAttributes(before, sub));
    return { subscription: sub.id, customer: customerId, outcome: 'canceled', status: sub.status, invoice: null, amount_due: null, period_start: null, period_end: null };
  }
  retryOpenInvoices(core, customerId, ctx, sub.id);
  const before = clone(sub);
  if (sub.status === 'trialing') sub.status = 'active';
  const customer = core.customer(customerId);
  const specs: LineSpec[] = pendingItemLines(core, sub.id);
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
      description: `${item.quantity} × ${productName(core.state, item.price)} (at ${unitLabel(item.price)})`,
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
  const invoice = draftInvoice(core, newId('in'), customer, sub, 'subscription_cycle', specs, before.items.data[0].current_period_start, end);
  sub.latest_invoice = invoice.id;
  core.emit('customer.subscription.updated', sub, ctx, previousAttributes(before, sub));
  core.emit('invoice.created', invoice, ctx);
  finalizeInvoice(core, invoice, ctx);
  const paid = chargeInvoice(core, invoice, ctx);
  syncSubscriptionStatus(core, sub, ctx);
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
