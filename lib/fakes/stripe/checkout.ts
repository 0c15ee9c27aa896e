// Checkout sessions: creation, expiry and the hosted page's payment, which creates the customer,
// the subscription and its first invoice.
import type Stripe from 'stripe';
import { type CardInput, checkCard, DECLINED_MESSAGE } from './cards';
import { invalidRequest } from './errors';
import { checkoutSessionId, invoicePrefix, newId } from './ids';
import { checkoutLineItemObject, checkoutSessionObject, customerObject, type LineSpec, subscriptionItemObject, subscriptionObject } from './objects';
import type { Params } from './params';
import { boundary } from './period';
import { type CheckoutOutcome, clone, type FakeCore, NO_REQUEST, productName, type RequestContext, unitLabel, validUrl } from './core';
import { chargeInvoice, draftInvoice, finalizeInvoice } from './invoices';
import { storeCard } from './payment-methods';

/** Session creation emits no event at Stripe either. */
export function createCheckoutSession(core: FakeCore, p: Params): Stripe.Checkout.Session {
  return core.tx(() => {
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
    if (customerId) core.customer(customerId, 'customer');
    const clientReferenceId = p.str('client_reference_id') || null;
    if (clientReferenceId && clientReferenceId.length > 200) {
      throw invalidRequest('client_reference_id must be at most 200 characters.', 'client_reference_id');
    }
    const lines = p.list('line_items');
    if (!lines || lines.length === 0) throw invalidRequest('Missing required param: line_items.', 'line_items');
    let currency: string | null = null;
    const items = lines.map((line) => {
      if (line.has('price_data')) throw invalidRequest('The local fake Stripe needs an existing price, not price_data.', line.name('price_data'));
      const price = core.price(line.reqStr('price'), line.name('price'));
      if (!price.recurring) {
        throw invalidRequest('You must provide at least one recurring price in `subscription` mode when using prices.', line.name('price'));
      }
      const quantity = line.int('quantity', { min: 1, max: core.settings.maxQuantity });
      if (quantity === undefined) throw invalidRequest(`Missing required param: ${line.name('quantity')}.`, line.name('quantity'));
      if (currency && price.currency !== currency) throw invalidRequest('All prices must use the same currency.', line.name('price'));
      currency = price.currency;
      return { price, quantity };
    });
    const subData = p.child('subscription_data');
    const trialDays = subData?.int('trial_period_days', { min: 1, max: 730 }) ?? null;
    const created = core.now(customerId ?? undefined);
    const id = checkoutSessionId();
    const total = trialDays ? 0 : items.reduce((s, x) => s + (x.price.unit_amount ?? 0) * x.quantity, 0);
    const session = checkoutSessionObject({
      id,
      created,
      url: `${core.settings.publicUrl}/checkout/${id}`,
      customer: customerId,
      customerEmail,
      clientReferenceId,
      currency: currency ?? core.settings.currency,
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
    core.state.checkoutSessions[id] = session;
    core.state.checkoutLineItems[id] = items.map((x) =>
      checkoutLineItemObject({ id: newId('li'), price: x.price, quantity: x.quantity, description: productName(core.state, x.price) }),
    );
    core.state.checkoutExtras[id] = {
      trialPeriodDays: trialDays,
      subscriptionMetadata: subData ? subData.applyMetadata({}) : {},
      subscriptionDescription: subData?.str('description') || null,
      lastError: null,
    };
    return session;
  });
}

/** Marks an open session past its expires_at as expired (Stripe does this in the background). */
export function refreshCheckout(core: FakeCore, id: string): Stripe.Checkout.Session {
  const session = core.checkoutSession(id);
  const customer = typeof session.customer === 'string' ? session.customer : undefined;
  if (session.status === 'open' && core.now(customer) >= session.expires_at) {
    core.tx(() => {
      session.status = 'expired';
      core.emit('checkout.session.expired', session, NO_REQUEST);
    });
  }
  return session;
}

export function expireCheckoutSession(core: FakeCore, id: string, ctx: RequestContext): Stripe.Checkout.Session {
  return core.tx(() => {
    const session = core.checkoutSession(id);
    if (session.status !== 'open') {
      throw invalidRequest('Only Checkout Sessions with a status in ["open"] can be expired.', 'session');
    }
    session.status = 'expired';
    core.emit('checkout.session.expired', session, ctx);
    return session;
  });
}

/** The hosted page's "Pay" button. Declines leave the session open so the buyer can retry. */
export function completeCheckout(core: FakeCore, id: string, form: CardInput & { email: string }): CheckoutOutcome {
  const session = refreshCheckout(core, id);
  if (session.status === 'complete') return { ok: true, redirect: successRedirect(session) };
  if (session.status !== 'open') return { ok: false, field: 'card_number', message: 'This checkout page has expired. Start again from Stochos.' };
  const extras = core.state.checkoutExtras[id];
  let email = session.customer_email;
  if (!session.customer && !email) {
    email = form.email.trim();
    if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) return { ok: false, field: 'email', message: 'Enter a valid e-mail address.' };
  }
  const check = checkCard(form);
  if (!check.ok) return checkoutError(core, id, check.field, check.message);
  if (check.card.behaviour === 'decline') return checkoutError(core, id, 'card_number', DECLINED_MESSAGE);

  core.tx(() => {
    let customerId = typeof session.customer === 'string' ? session.customer : null;
    if (!customerId) {
      customerId = newId('cus', 14);
      const c = customerObject({
        id: customerId,
        created: core.now(),
        email,
        name: check.card.name,
        description: null,
        phone: null,
        metadata: {},
        invoicePrefix: invoicePrefix(),
      });
      core.state.customers[customerId] = c;
      core.emit('customer.created', c, NO_REQUEST);
    }
    const customer = core.customer(customerId);
    const now = core.now(customerId);
    const pm = storeCard(core, customerId, check.card);
    customer.invoice_settings.default_payment_method = pm.id;
    if (!customer.currency) customer.currency = session.currency;
    core.emit('payment_method.attached', pm, NO_REQUEST);

    const lineItems = core.state.checkoutLineItems[id];
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
      currency: session.currency ?? core.settings.currency,
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
    core.state.subscriptions[subId] = sub;
    core.emit('customer.subscription.created', sub, NO_REQUEST);

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
    core.emit('checkout.session.completed', session, NO_REQUEST);

    const lines: LineSpec[] = items.map((item) => ({
      id: newId('il'),
      amount: trialDays ? 0 : (item.price.unit_amount ?? 0) * (item.quantity ?? 1),
      currency: sub.currency,
      description: trialDays
        ? `Trial period for ${productName(core.state, item.price)}`
        : `${item.quantity} × ${productName(core.state, item.price)} (at ${unitLabel(item.price)})`,
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
    const invoice = draftInvoice(core, invoiceId, customer, sub, 'subscription_create', lines, now, now);
    core.emit('invoice.created', invoice, NO_REQUEST);
    finalizeInvoice(core, invoice, NO_REQUEST);
    chargeInvoice(core, invoice, NO_REQUEST);
  });
  return { ok: true, redirect: successRedirect(session) };
}

function checkoutError(core: FakeCore, id: string, field: Exclude<CheckoutOutcome, { ok: true }>['field'], message: string): CheckoutOutcome {
  core.tx(() => {
    core.state.checkoutExtras[id].lastError = message;
  });
  return { ok: false, field, message };
}

export function successRedirect(session: Stripe.Checkout.Session): string {
  return (session.success_url ?? '').split('{CHECKOUT_SESSION_ID}').join(session.id);
}
