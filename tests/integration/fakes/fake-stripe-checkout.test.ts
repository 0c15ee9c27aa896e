// The official Stripe SDK (stripe@23, API 2026-10-28.endive) against the local fake: customers,
// checkout through the hosted page, signed webhooks, object shapes and Stripe-shaped errors.
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import type { FakeStripeHandle } from '@/lib/fakes/stripe/server';
import { DECLINE_CARD, GOOD_CARD, SECRET, postForm, startFake, startReceiver, subscribe, type Receiver } from './stripe-support';

let handle: FakeStripeHandle;
let stripe: Stripe;
let receiver: Receiver;

beforeAll(async () => {
  receiver = await startReceiver();
  ({ handle, stripe } = await startFake({ webhookUrl: receiver.url, webhookSecret: SECRET }));
});

afterAll(async () => {
  await handle.close();
  await receiver.close();
});

// Let the previous test's deliveries land before clearing, so no event leaks into the next test.
afterEach(async () => {
  await handle.waitForWebhooks(10_000);
});

beforeEach(async () => {
  await fetch(`${handle.url}/_fake/reset`, { method: 'POST' });
  receiver.events.length = 0;
  receiver.hits.length = 0;
});

describe('customers and catalogue', () => {
  it('creates, retrieves, updates and lists customers with Stripe metadata rules', async () => {
    const created = await stripe.customers.create({ email: 'owner@northgate.test', name: 'Northgate', metadata: { firm_id: 'f_1', tier: 'x' } });
    expect(created.id).toMatch(/^cus_[A-Za-z0-9]{14}$/);
    expect(created.object).toBe('customer');
    expect(created.metadata).toEqual({ firm_id: 'f_1', tier: 'x' });

    // Stripe merges metadata on update and an empty string deletes a key.
    const updated = await stripe.customers.update(created.id, { name: 'Northgate Ltd', metadata: { tier: '', region: 'eu' } });
    expect(updated.name).toBe('Northgate Ltd');
    expect(updated.metadata).toEqual({ firm_id: 'f_1', region: 'eu' });

    const again = await stripe.customers.retrieve(created.id);
    expect(again.deleted).toBeUndefined();
    expect((again as Stripe.Customer).email).toBe('owner@northgate.test');

    await stripe.customers.create({ email: 'someone-else@firm.test' });
    const byEmail = await stripe.customers.list({ email: 'owner@northgate.test' });
    expect(byEmail.data.map((c) => c.id)).toEqual([created.id]);
  });

  it('serves the seeded per-seat monthly price and lets the app look it up by lookup key', async () => {
    const price = await stripe.prices.retrieve('price_stochos_seat', { expand: ['product'] });
    expect(price.unit_amount).toBe(2900);
    expect(price.recurring?.interval).toBe('month');
    expect(price.lookup_key).toBe('stochos_seat_monthly');
    expect((price.product as Stripe.Product).unit_label).toBe('seat');
    // The SDK turns decimal strings into its Decimal type; the value must survive that.
    expect(String(price.unit_amount_decimal)).toBe('2900');

    const found = await stripe.prices.list({ lookup_keys: ['stochos_seat_monthly'] });
    expect(found.data.map((p) => p.id)).toEqual(['price_stochos_seat']);

    const product = await stripe.products.create({ name: 'Reviewer seat' });
    const other = await stripe.prices.create({ product: product.id, currency: 'eur', unit_amount: 1500, recurring: { interval: 'month' }, lookup_key: 'reviewer' });
    expect(other.id).toMatch(/^price_/);
    const listed = await stripe.prices.list({ product: product.id });
    expect(listed.data.map((p) => p.id)).toEqual([other.id]);
  });

  it('pages through lists the way the SDK auto-paginates', async () => {
    const ids: string[] = [];
    for (let i = 0; i < 5; i += 1) ids.push((await stripe.customers.create({ email: `c${i}@page.test` })).id);
    const seen: string[] = [];
    for await (const c of stripe.customers.list({ limit: 2 })) seen.push(c.id);
    expect(seen).toEqual([...ids].reverse());
  });
});

describe('hosted checkout', () => {
  async function newSession(seats = 3) {
    const customer = await stripe.customers.create({ email: 'owner@firm.test', metadata: { firm_id: 'firm_9' } });
    const session = await stripe.checkout.sessions.create({
      mode: 'subscription',
      customer: customer.id,
      line_items: [{ price: 'price_stochos_seat', quantity: seats }],
      success_url: 'http://127.0.0.1:3000/app/billing?session={CHECKOUT_SESSION_ID}',
      cancel_url: 'http://127.0.0.1:3000/app/billing?canceled=1',
      client_reference_id: 'firm_9',
      metadata: { firm_id: 'firm_9' },
      subscription_data: { metadata: { firm_id: 'firm_9' } },
    });
    return { customer, session };
  }

  it('creates an open session whose url is an accessible card page', async () => {
    const { customer, session } = await newSession(3);
    expect(session.id).toMatch(/^cs_test_/);
    expect(session.status).toBe('open');
    expect(session.payment_status).toBe('unpaid');
    expect(session.customer).toBe(customer.id);
    expect(session.amount_total).toBe(3 * 2900);
    expect(session.url).toBe(`${handle.url}/checkout/${session.id}`);

    const page = await fetch(session.url!);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('Local test payment page — no real money moves');
    // Every input has a label pointing at it.
    const inputs = [...html.matchAll(/<input id="([a-z_]+)"/g)].map((m) => m[1]);
    expect(inputs).toEqual(expect.arrayContaining(['card_number', 'card_expiry', 'card_cvc']));
    for (const id of inputs) expect(html).toContain(`<label for="${id}">`);
    expect(html).toContain('href="http://127.0.0.1:3000/app/billing?canceled=1"');
    expect(html).toContain('€87.00');
  });

  it('shows the decline, lets the buyer retry, then completes and redirects to success_url', async () => {
    const { session } = await newSession(3);

    const declined = await postForm(session.url!, DECLINE_CARD);
    expect(declined.status).toBe(402);
    const declinedHtml = await declined.text();
    expect(declinedHtml).toContain('role="alert">Your card was declined.');
    expect(declinedHtml).toMatch(/id="card_number"[^>]*aria-invalid="true"/);
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe('open');

    const unknown = await postForm(session.url!, { ...GOOD_CARD, card_number: '5555 5555 5555 4444' });
    expect(unknown.status).toBe(402);
    expect(await unknown.text()).toContain('Use a test card number');

    const ok = await postForm(session.url!, GOOD_CARD);
    expect(ok.status).toBe(303);
    expect(ok.headers.get('location')).toBe(`http://127.0.0.1:3000/app/billing?session=${session.id}`);

    const done = await stripe.checkout.sessions.retrieve(session.id, { expand: ['subscription', 'line_items'] });
    expect(done.status).toBe('complete');
    expect(done.payment_status).toBe('paid');
    expect(done.line_items?.data[0].quantity).toBe(3);
    const sub = done.subscription as Stripe.Subscription;
    expect(sub.id).toMatch(/^sub_/);
    expect(sub.status).toBe('active');
    expect(sub.metadata).toEqual({ firm_id: 'firm_9' });

    // A second submit of the same page does not charge twice.
    const replay = await postForm(session.url!, GOOD_CARD);
    expect(replay.status).toBe(303);
    expect((await stripe.invoices.list({ customer: done.customer as string })).data).toHaveLength(1);
  });

  it('returns this API version’s subscription shape: periods on the item, one month apart', async () => {
    const { subscription: sub, customer } = await subscribe(stripe, 4);
    const item = sub.items.data[0];
    expect(item.id).toMatch(/^si_/);
    expect(item.object).toBe('subscription_item');
    expect(item.quantity).toBe(4);
    expect(item.price.id).toBe('price_stochos_seat');
    expect(typeof item.current_period_start).toBe('number');
    expect(typeof item.current_period_end).toBe('number');
    // Since the 2025 API versions the subscription itself has no period fields.
    expect('current_period_end' in sub).toBe(false);
    expect('current_period_start' in sub).toBe(false);

    // One calendar month: same UTC day of month (clamped to the month's end) and time of day.
    const start = new Date(item.current_period_start * 1000);
    const end = new Date(item.current_period_end * 1000);
    const monthsApart = (end.getUTCFullYear() - start.getUTCFullYear()) * 12 + end.getUTCMonth() - start.getUTCMonth();
    expect(monthsApart).toBe(1);
    const lastDayOfEndMonth = new Date(Date.UTC(end.getUTCFullYear(), end.getUTCMonth() + 1, 0)).getUTCDate();
    expect(end.getUTCDate()).toBe(Math.min(start.getUTCDate(), lastDayOfEndMonth));
    expect(end.getUTCHours() * 3600 + end.getUTCMinutes() * 60 + end.getUTCSeconds()).toBe(
      start.getUTCHours() * 3600 + start.getUTCMinutes() * 60 + start.getUTCSeconds(),
    );

    const invoice = await stripe.invoices.retrieve(sub.latest_invoice as string);
    expect(invoice.status).toBe('paid');
    expect(invoice.billing_reason).toBe('subscription_create');
    expect(invoice.amount_due).toBe(4 * 2900);
    expect(invoice.amount_paid).toBe(4 * 2900);
    expect(invoice.parent?.subscription_details?.subscription).toBe(sub.id);
    expect(invoice.lines.data[0].pricing?.price_details?.price).toBe('price_stochos_seat');
    expect(invoice.number).toMatch(/^[0-9A-F]{8}-0001$/);

    const listed = await stripe.subscriptions.list({ customer: customer.id });
    expect(listed.data.map((s) => s.id)).toEqual([sub.id]);
    const expanded = await stripe.subscriptions.retrieve(sub.id, { expand: ['latest_invoice', 'customer', 'default_payment_method'] });
    expect((expanded.latest_invoice as Stripe.Invoice).id).toBe(invoice.id);
    expect((expanded.customer as Stripe.Customer).email).toBe(customer.email);
    expect((expanded.default_payment_method as Stripe.PaymentMethod).card?.last4).toBe('4242');
  });

  it('delivers signed webhooks in a realistic order that the SDK verifies', async () => {
    const { session, subscription } = await subscribe(stripe, 2);
    await receiver.waitFor((evs) => evs.some((e) => e.type === 'invoice.payment_succeeded'));
    const types = receiver.events.map((e) => e.type);
    expect(types.indexOf('customer.subscription.created')).toBeLessThan(types.indexOf('checkout.session.completed'));
    expect(types.indexOf('checkout.session.completed')).toBeLessThan(types.indexOf('invoice.paid'));
    expect(receiver.hits.every((h) => h.status === 200)).toBe(true);

    const completed = receiver.events.find((e) => e.type === 'checkout.session.completed') as Stripe.CheckoutSessionCompletedEvent;
    expect(completed.id).toMatch(/^evt_/);
    expect(completed.object).toBe('event');
    expect(completed.api_version).toBe(Stripe.API_VERSION);
    expect(completed.livemode).toBe(false);
    expect(completed.data.object.id).toBe(session.id);
    expect(completed.data.object.subscription).toBe(subscription.id);
    expect(completed.data.object.client_reference_id).toBe('firm_1');
    expect(completed.data.object.metadata).toEqual({ firm_id: 'firm_1' });

    const paid = receiver.events.find((e) => e.type === 'invoice.paid') as Stripe.InvoicePaidEvent;
    expect(paid.data.object.amount_paid).toBe(2 * 2900);

    // The header is exactly what the SDK's own test helper makes for the same timestamp and payload.
    const hit = receiver.hits[0];
    const t = Number(/t=(\d+)/.exec(hit.signature)![1]);
    expect(hit.signature).toBe(stripe.webhooks.generateTestHeaderString({ payload: hit.raw, secret: SECRET, timestamp: t }));
    // And a wrong secret fails the check, so the receiver really verifies.
    expect(() => stripe.webhooks.constructEvent(hit.raw, hit.signature, 'whsec_wrong')).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it('creates the customer when the session only has an e-mail, and supports a trial', async () => {
    const session = await stripe.checkout.sessions.create({
      mode: 'subscription',
      line_items: [{ price: 'price_stochos_seat', quantity: 2 }],
      success_url: 'http://127.0.0.1:3000/ok',
      subscription_data: { trial_period_days: 14 },
    });
    expect(session.amount_total).toBe(0);
    const html = await (await fetch(session.url!)).text();
    expect(html).toContain('<label for="email">');
    expect(html).toContain('14-day trial');
    const missing = await postForm(session.url!, GOOD_CARD);
    expect(missing.status).toBe(402);
    expect(await missing.text()).toContain('Enter a valid e-mail address.');
    const ok = await postForm(session.url!, { ...GOOD_CARD, email: 'new-owner@firm.test' });
    expect(ok.status).toBe(303);
    const done = await stripe.checkout.sessions.retrieve(session.id, { expand: ['subscription', 'customer'] });
    expect((done.customer as Stripe.Customer).email).toBe('new-owner@firm.test');
    const sub = done.subscription as Stripe.Subscription;
    expect(sub.status).toBe('trialing');
    expect(sub.trial_end! - sub.trial_start!).toBe(14 * 86_400);
    expect(sub.items.data[0].current_period_end).toBe(sub.trial_end);
    expect(done.payment_status).toBe('no_payment_required');
  });

  it('expires a session on request and then refuses payment', async () => {
    const { session } = await newSession(1);
    const expired = await stripe.checkout.sessions.expire(session.id);
    expect(expired.status).toBe('expired');
    const res = await postForm(session.url!, GOOD_CARD);
    expect(res.status).toBe(402);
    expect(await res.text()).toContain('expired');
  });
});

describe('errors in Stripe’s shape', () => {
  it('raises StripeInvalidRequestError naming the parameter for out-of-range quantities', async () => {
    const customer = await stripe.customers.create({ email: 'x@firm.test' });
    const base = { mode: 'subscription' as const, customer: customer.id, success_url: 'http://127.0.0.1:3000/ok' };
    for (const quantity of [0, 501]) {
      const err = await stripe.checkout.sessions
        .create({ ...base, line_items: [{ price: 'price_stochos_seat', quantity }] })
        .then(() => null, (e: unknown) => e);
      expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
      expect((err as Stripe.errors.StripeInvalidRequestError).param).toBe('line_items[0][quantity]');
      expect((err as Stripe.errors.StripeInvalidRequestError).statusCode).toBe(400);
    }
    const { subscription } = await subscribe(stripe, 2);
    const err = await stripe.subscriptions
      .update(subscription.id, { items: [{ id: subscription.items.data[0].id, quantity: 0 }] })
      .then(() => null, (e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect((err as Stripe.errors.StripeInvalidRequestError).param).toBe('items[0][quantity]');
    // Nothing changed.
    expect((await stripe.subscriptions.retrieve(subscription.id)).items.data[0].quantity).toBe(2);
  });

  it('answers unknown ids with 404 resource_missing and unknown parameters references with 400', async () => {
    const missing = await stripe.customers.retrieve('cus_doesnotexist0').then(() => null, (e: unknown) => e);
    expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect((missing as Stripe.errors.StripeError).statusCode).toBe(404);
    expect((missing as Stripe.errors.StripeError).code).toBe('resource_missing');

    const badPrice = await stripe.checkout.sessions
      .create({ mode: 'subscription', success_url: 'http://127.0.0.1:3000/ok', line_items: [{ price: 'price_nope', quantity: 1 }] })
      .then(() => null, (e: unknown) => e);
    expect((badPrice as Stripe.errors.StripeError).statusCode).toBe(400);
    expect((badPrice as Stripe.errors.StripeError).param).toBe('line_items[0][price]');

    const noUrl = await stripe.checkout.sessions
      .create({ mode: 'subscription', line_items: [{ price: 'price_stochos_seat', quantity: 1 }] })
      .then(() => null, (e: unknown) => e);
    expect((noUrl as Stripe.errors.StripeError).param).toBe('success_url');

    const badExpand = await stripe.customers.list({ expand: ['data.nonsense'] }).then(() => null, (e: unknown) => e);
    await stripe.customers.create({ email: 'e@firm.test' });
    const badExpand2 = await stripe.customers.list({ expand: ['data.nonsense'] }).then(() => null, (e: unknown) => e);
    expect(badExpand).toBeNull(); // nothing to expand in an empty list
    expect(badExpand2).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it('refuses requests without a test key', async () => {
    const live = new Stripe('sk_live_not_allowed', { host: '127.0.0.1', port: handle.port, protocol: 'http', maxNetworkRetries: 0 });
    const err = await live.customers.list().then(() => null, (e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
  });

  it('replays a POST with the same idempotency key instead of doing it twice', async () => {
    const a = await stripe.customers.create({ email: 'idem@firm.test' }, { idempotencyKey: 'key-1' });
    const b = await stripe.customers.create({ email: 'idem@firm.test' }, { idempotencyKey: 'key-1' });
    expect(b.id).toBe(a.id);
    expect((await stripe.customers.list({ email: 'idem@firm.test' })).data).toHaveLength(1);
    const clash = await stripe.customers.create({ email: 'other@firm.test' }, { idempotencyKey: 'key-1' }).then(() => null, (e: unknown) => e);
    expect(clash).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
  });
});
