// Payment methods: cards put on file by the hosted pages and /_fake/card, and paying one invoice
// with a card entered on its hosted page.
import type Stripe from 'stripe';
import { type CardInput, checkCard, type CheckedCard, DECLINED_MESSAGE, normaliseNumber, parseExpiry, TEST_CARDS } from './cards';
import { invalidRequest } from './errors';
import { newId } from './ids';
import { paymentMethodObject } from './objects';
import { clone, type FakeCore, NO_REQUEST, previousAttributes, type RequestContext } from './core';
import { chargeInvoice, retryOpenInvoices, syncSubscriptionStatus } from './invoices';

export function storeCard(core: FakeCore, customer: string, card: CheckedCard): Stripe.PaymentMethod {
  const pm = paymentMethodObject({
    id: newId('pm'),
    created: core.now(customer),
    customer,
    brand: card.brand,
    last4: card.last4,
    expMonth: card.expMonth,
    expYear: card.expYear,
    name: card.name,
    // Same number, same fingerprint, as with real cards.
    fingerprint: Buffer.from(card.number).toString('base64url').slice(0, 16),
  });
  core.state.paymentMethods[pm.id] = pm;
  core.state.cardBehaviour[pm.id] = card.behaviour;
  return pm;
}

/**
 * Puts a card on file as the customer's (and their live subscriptions') default.
 * `retryOpen`: the portal's card update also retries unpaid invoices right away.
 */
export function replaceCard(core: FakeCore, customerId: string, card: CheckedCard, ctx: RequestContext, retryOpen: boolean): Stripe.PaymentMethod {
  return core.tx(() => {
    const customer = core.customer(customerId, 'customer');
    const pm = storeCard(core, customerId, card);
    core.emit('payment_method.attached', pm, ctx);
    const before = clone(customer);
    customer.invoice_settings.default_payment_method = pm.id;
    core.emit('customer.updated', customer, ctx, previousAttributes(before, customer));
    for (const sub of core.subscriptionsOf(customerId)) {
      if (sub.status === 'canceled') continue;
      const subBefore = clone(sub);
      sub.default_payment_method = pm.id;
      core.emit('customer.subscription.updated', sub, ctx, previousAttributes(subBefore, sub));
    }
    if (retryOpen) retryOpenInvoices(core, customerId, ctx);
    return pm;
  });
}

/** /_fake/card: any listed test number, expiry optional (defaults to 12 / next year + 3). */
export function setCardForTests(core: FakeCore, customerId: string, rawNumber: string, rawExpiry?: string): Stripe.PaymentMethod {
  const number = normaliseNumber(rawNumber);
  const known = TEST_CARDS[number];
  if (!known) throw invalidRequest(`Unknown test card number ${rawNumber}; use one of ${Object.keys(TEST_CARDS).join(', ')}.`, 'number');
  const exp = rawExpiry ? parseExpiry(rawExpiry) : null;
  if (rawExpiry && !exp) throw invalidRequest('Invalid expiry; use MM/YY.', 'expiry');
  return replaceCard(core, 
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

/** Pays one open invoice from its hosted page with a newly entered card. */
export function payInvoiceWithCard(core: FakeCore, invoiceId: string, input: CardInput): { ok: true } | { ok: false; field: string; message: string } {
  const invoice = core.invoice(invoiceId);
  if (invoice.status !== 'open') return { ok: true };
  const check = checkCard(input);
  if (!check.ok) return check;
  if (check.card.behaviour === 'decline') return { ok: false, field: 'card_number', message: DECLINED_MESSAGE };
  core.tx(() => {
    const customerId = invoice.customer as string;
    const pm = storeCard(core, customerId, check.card);
    core.emit('payment_method.attached', pm, NO_REQUEST);
    invoice.default_payment_method = pm.id;
    const subId = invoice.parent?.subscription_details?.subscription;
    const sub = typeof subId === 'string' ? core.state.subscriptions[subId] : undefined;
    // One-off card for this invoice: charge it directly rather than the card on file.
    const saved = sub?.default_payment_method;
    if (sub) sub.default_payment_method = pm.id;
    chargeInvoice(core, invoice, NO_REQUEST);
    if (sub) {
      sub.default_payment_method = saved ?? null;
      syncSubscriptionStatus(core, sub, NO_REQUEST);
    }
  });
  return { ok: true };
}
