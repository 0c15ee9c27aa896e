// Billing portal: sessions and what the hosted portal page does (seats, cancel at period end, card).
import type Stripe from 'stripe';
import { type CardInput, checkCard, DECLINED_MESSAGE } from './cards';
import { invalidRequest } from './errors';
import { newId } from './ids';
import { type LineSpec, portalSessionObject } from './objects';
import type { Params } from './params';
import { clone, type FakeCore, NO_REQUEST, previousAttributes, type ProrationBehavior, type RequestContext, validUrl } from './core';
import { replaceCard } from './payment-methods';
import { prorationLines } from './proration';
import { applyCancelAtPeriodEnd, applyItemChanges } from './subscriptions';

export function createPortalSession(core: FakeCore, p: Params, ctx: RequestContext): Stripe.BillingPortal.Session {
  return core.tx(() => {
    const customerId = p.reqStr('customer');
    core.customer(customerId, 'customer');
    const returnRaw = p.str('return_url');
    const returnUrl = returnRaw ? validUrl(returnRaw, 'return_url') : null;
    if (p.has('flow_data')) throw invalidRequest('The local fake Stripe does not support portal flows.', 'flow_data');
    const id = newId('bps');
    const session = portalSessionObject({
      id,
      created: core.now(customerId),
      customer: customerId,
      returnUrl,
      url: `${core.settings.publicUrl}/portal/${id}`,
    });
    core.state.portalSessions[id] = session;
    core.emit('billing_portal.session.created', session, ctx);
    return session;
  });
}

/** The subscription the portal shows: the newest one that is not canceled, else the newest. */
export function portalSubscription(core: FakeCore, customerId: string): Stripe.Subscription | undefined {
  const subs = core.subscriptionsOf(customerId);
  return subs.find((s) => s.status !== 'canceled') ?? subs[0];
}

export function portalChangeSeats(core: FakeCore, sessionId: string, seats: number): Stripe.Subscription {
  const session = core.portalSession(sessionId);
  const sub = portalSubscription(core, session.customer);
  if (!sub || sub.status === 'canceled') throw invalidRequest('There is no active subscription to change.', 'subscription');
  if (!Number.isInteger(seats) || seats < 1 || seats > core.settings.maxQuantity) {
    throw invalidRequest(`Choose between 1 and ${core.settings.maxQuantity} seats.`, 'seats');
  }
  return core.tx(() => {
    const before = clone(sub);
    const item = sub.items.data[0];
    const at = core.now(sub.customer as string);
    applyItemChanges(core, sub, [{ item, quantity: seats, price: item.price }], core.settings.portalProrationBehavior, at, false, NO_REQUEST, before);
    return sub;
  });
}

/** Proration preview for the portal's confirmation step. */
export function portalPreviewSeats(core: FakeCore, sessionId: string, seats: number): { prorationNet: number; lines: LineSpec[]; newPeriodTotal: number; behaviour: ProrationBehavior } {
  const session = core.portalSession(sessionId);
  const sub = portalSubscription(core, session.customer);
  if (!sub || sub.status === 'canceled') throw invalidRequest('There is no active subscription to change.', 'subscription');
  if (!Number.isInteger(seats) || seats < 1 || seats > core.settings.maxQuantity) {
    throw invalidRequest(`Choose between 1 and ${core.settings.maxQuantity} seats.`, 'seats');
  }
  const item = sub.items.data[0];
  const behaviour = core.settings.portalProrationBehavior;
  const lines =
    behaviour === 'none' || sub.status === 'trialing'
      ? []
      : prorationLines(core, sub, [{ item, quantity: seats, price: item.price }], core.now(sub.customer as string), true);
  return {
    prorationNet: lines.reduce((s, l) => s + l.amount, 0),
    lines,
    newPeriodTotal: (item.price.unit_amount ?? 0) * seats,
    behaviour,
  };
}

export function portalSetCancel(core: FakeCore, sessionId: string, cancel: boolean): Stripe.Subscription {
  const session = core.portalSession(sessionId);
  const sub = portalSubscription(core, session.customer);
  if (!sub || sub.status === 'canceled') throw invalidRequest('There is no active subscription to change.', 'subscription');
  return core.tx(() => {
    const before = clone(sub);
    applyCancelAtPeriodEnd(core, sub, cancel);
    const prev = previousAttributes(before, sub);
    if (Object.keys(prev).length > 0) core.emit('customer.subscription.updated', sub, NO_REQUEST, prev);
    return sub;
  });
}

export function portalUpdateCard(core: FakeCore, sessionId: string, input: CardInput): { ok: true } | { ok: false; field: string; message: string } {
  const session = core.portalSession(sessionId);
  const check = checkCard(input);
  if (!check.ok) return check;
  if (check.card.behaviour === 'decline') return { ok: false, field: 'card_number', message: DECLINED_MESSAGE };
  replaceCard(core, session.customer, check.card, NO_REQUEST, true);
  return { ok: true };
}
