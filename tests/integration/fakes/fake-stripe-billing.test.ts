// The billing life of a subscription on the fake: seat changes with prorations, the invoice
// preview, the hosted portal, renewals with the clock endpoint, failed payments and cancellation.
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { boundary } from '@/lib/fakes/stripe/period';
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

const UNIT = 2900;

/** Proration as Stripe describes it: the full-period amount times the fraction of the period left. */
function expectedProration(quantity: number, start: number, end: number, at: number): number {
  const exact = (UNIT * quantity * (end - at)) / (end - start);
  return Math.sign(exact) * Math.round(Math.abs(exact));
}

interface AdvanceResponse {
  advanced: { subscription: string; outcome: string; status: string; invoice: string }[];
}

async function admin(path: string): Promise<AdvanceResponse> {
  const res = await fetch(`${handle.url}${path}`, { method: 'POST' });
  expect(res.status).toBe(200);
  return (await res.json()) as AdvanceResponse;
}

async function eventsOfType<T extends Stripe.Event>(type: string, count = 1): Promise<T[]> {
  await receiver.waitFor((evs) => evs.filter((e) => e.type === type).length >= count);
  return receiver.events.filter((e) => e.type === type) as T[];
}

describe('billing-period arithmetic', () => {
  it('keeps the anchor day and clamps to short months (calendar facts)', () => {
    const jan31 = Date.UTC(2027, 0, 31, 9, 30, 0) / 1000;
    const iso = (k: number) => new Date(boundary(jan31, 'month', 1, k) * 1000).toISOString();
    expect(iso(1)).toBe('2027-02-28T09:30:00.000Z');
    expect(iso(2)).toBe('2027-03-31T09:30:00.000Z');
    expect(iso(3)).toBe('2027-04-30T09:30:00.000Z');
    const leap = Date.UTC(2028, 0, 30) / 1000;
    expect(new Date(boundary(leap, 'month', 1, 1) * 1000).toISOString()).toBe('2028-02-29T00:00:00.000Z');
    expect(new Date(boundary(leap, 'year', 1, 1) * 1000).toISOString()).toBe('2029-01-30T00:00:00.000Z');
  });
});

describe('seat changes', () => {
  it('previews a quantity change with prorations, and the renewal invoice then matches the preview', async () => {
    const { subscription, customer } = await subscribe(stripe, 3);
    const item = subscription.items.data[0];
    const { current_period_start: start, current_period_end: end } = item;
    const at = start + Math.floor((end - start) / 4);

    const preview = await stripe.invoices.createPreview({
      customer: customer.id,
      subscription: subscription.id,
      subscription_details: { items: [{ id: item.id, quantity: 5 }], proration_date: at },
    });
    const credit = -expectedProration(3, start, end, at);
    const debit = expectedProration(5, start, end, at);
    expect(credit).toBeLessThan(0);
    const prorations = preview.lines.data.filter((l) => l.parent?.subscription_item_details?.proration);
    expect(prorations.map((l) => l.amount)).toEqual([credit, debit]);
    expect(prorations[0].description).toMatch(/^Unused time on 3 × Stochos seat after /);
    expect(prorations[1].description).toMatch(/^Remaining time on 5 × Stochos seat after /);
    expect(prorations.every((l) => l.period.start === at && l.period.end === end)).toBe(true);
    const renewal = preview.lines.data.find((l) => !l.parent?.subscription_item_details?.proration)!;
    expect(renewal.amount).toBe(5 * UNIT);
    expect(renewal.period).toEqual({ start: end, end: boundary(subscription.billing_cycle_anchor, 'month', 1, 2) });
    expect(preview.amount_due).toBe(credit + debit + 5 * UNIT);
    expect(preview.period_end).toBe(end);
    expect(preview.next_payment_attempt).toBe(end);
    expect(preview.parent?.subscription_details?.subscription_proration_date).toBe(at);
    // A preview changes nothing.
    expect((await stripe.subscriptions.retrieve(subscription.id)).items.data[0].quantity).toBe(3);

    const updated = await stripe.subscriptions.update(subscription.id, {
      items: [{ id: item.id, quantity: 5 }],
      proration_behavior: 'create_prorations',
      proration_date: at,
    });
    expect(updated.items.data[0].quantity).toBe(5);
    expect(updated.latest_invoice).toBe(subscription.latest_invoice); // create_prorations raises no invoice now
    const pending = await stripe.invoiceItems.list({ customer: customer.id, pending: true });
    expect(pending.data.map((ii) => ii.amount).sort((a, b) => a - b)).toEqual([credit, debit]);
    expect(pending.data.every((ii) => ii.proration)).toBe(true);

    const [changed] = await eventsOfType<Stripe.CustomerSubscriptionUpdatedEvent>('customer.subscription.updated');
    expect(changed.data.object.items.data[0].quantity).toBe(5);
    const previous = changed.data.previous_attributes as { items: Stripe.ApiList<Stripe.SubscriptionItem> };
    expect(previous.items.data[0].quantity).toBe(3);

    const { advanced } = await admin(`/_fake/advance?customer=${customer.id}`);
    expect(advanced[0].outcome).toBe('renewed');
    const renewed = await stripe.invoices.retrieve(advanced[0].invoice);
    expect(renewed.billing_reason).toBe('subscription_cycle');
    expect(renewed.status).toBe('paid');
    expect(renewed.amount_due).toBe(preview.amount_due);
    expect((await stripe.invoiceItems.list({ customer: customer.id, pending: true })).data).toHaveLength(0);
  });

  it('charges an upgrade at once with always_invoice, and credits a downgrade to the next invoice', async () => {
    const { subscription, customer } = await subscribe(stripe, 2);
    const item = subscription.items.data[0];
    const { current_period_start: start, current_period_end: end } = item;
    const at = start + Math.floor((end - start) / 3);

    const preview = await stripe.invoices.createPreview({
      customer: customer.id,
      subscription: subscription.id,
      subscription_details: { items: [{ id: item.id, quantity: 4 }], proration_date: at, proration_behavior: 'always_invoice' },
    });
    const upCharge = expectedProration(4, start, end, at) - expectedProration(2, start, end, at);
    expect(preview.amount_due).toBe(upCharge);
    expect(preview.lines.data).toHaveLength(2);

    const up = await stripe.subscriptions.update(subscription.id, {
      items: [{ id: item.id, quantity: 4 }],
      proration_behavior: 'always_invoice',
      proration_date: at,
    });
    const upInvoice = await stripe.invoices.retrieve(up.latest_invoice as string);
    expect(upInvoice.billing_reason).toBe('subscription_update');
    expect(upInvoice.status).toBe('paid');
    expect(upInvoice.amount_paid).toBe(upCharge);
    const paidEvents = await eventsOfType<Stripe.InvoicePaidEvent>('invoice.paid', 2);
    expect(paidEvents.map((e) => e.data.object.id)).toContain(upInvoice.id);

    // Back down to 1 seat at the same moment: a negative invoice, so nothing is charged and the
    // customer gets a credit balance (negative balance = credit, as in Stripe).
    const down = await stripe.subscriptions.update(subscription.id, {
      items: [{ id: item.id, quantity: 1 }],
      proration_behavior: 'always_invoice',
      proration_date: at,
    });
    const downInvoice = await stripe.invoices.retrieve(down.latest_invoice as string);
    const downTotal = expectedProration(1, start, end, at) - expectedProration(4, start, end, at);
    expect(downInvoice.total).toBe(downTotal);
    expect(downInvoice.amount_due).toBe(0);
    expect(downInvoice.ending_balance).toBe(downTotal);
    expect((await stripe.customers.retrieve(customer.id) as Stripe.Customer).balance).toBe(downTotal);

    const { advanced } = await admin(`/_fake/advance?customer=${customer.id}`);
    const renewal = await stripe.invoices.retrieve(advanced[0].invoice);
    expect(renewal.total).toBe(UNIT);
    expect(renewal.starting_balance).toBe(downTotal);
    expect(renewal.amount_due).toBe(Math.max(0, UNIT + downTotal));
  });

  it('reports the proration moment of a preview, and an update at that moment charges the quoted amount', async () => {
    const { subscription, customer } = await subscribe(stripe, 2);
    const item = subscription.items.data[0];
    const preview = await stripe.invoices.createPreview({
      customer: customer.id,
      subscription: subscription.id,
      subscription_details: { items: [{ id: item.id, quantity: 7 }], proration_behavior: 'always_invoice' },
    });
    const at = preview.parent?.subscription_details?.subscription_proration_date;
    expect(at).toBeGreaterThanOrEqual(item.current_period_start);
    expect(at).toBeLessThan(item.current_period_end);
    expect(preview.amount_due).toBe(expectedProration(7, item.current_period_start, item.current_period_end, at!) - expectedProration(2, item.current_period_start, item.current_period_end, at!));
    const updated = await stripe.subscriptions.update(subscription.id, {
      items: [{ id: item.id, quantity: 7 }],
      proration_behavior: 'always_invoice',
      payment_behavior: 'error_if_incomplete',
      proration_date: at,
    });
    expect((await stripe.invoices.retrieve(updated.latest_invoice as string)).amount_paid).toBe(preview.amount_due);
    const outside = await stripe.subscriptions
      .update(subscription.id, { items: [{ id: item.id, quantity: 6 }], proration_date: item.current_period_end + 10 })
      .then(() => null, (e: unknown) => e);
    expect((outside as Stripe.errors.StripeError).param).toBe('proration_date');
  });

  it('refuses an upgrade with error_if_incomplete when the card on file is declined, changing nothing', async () => {
    const { subscription, customer } = await subscribe(stripe, 2);
    await admin(`/_fake/card?customer=${customer.id}&number=4000000000000002`);
    const err = await stripe.subscriptions
      .update(subscription.id, {
        items: [{ id: subscription.items.data[0].id, quantity: 3 }],
        proration_behavior: 'always_invoice',
        payment_behavior: 'error_if_incomplete',
      })
      .then(() => null, (e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect((err as Stripe.errors.StripeCardError).code).toBe('card_declined');
    expect((await stripe.subscriptions.retrieve(subscription.id)).items.data[0].quantity).toBe(2);
  });
});

describe('billing portal', () => {
  it('changes seats after a confirmation step, then returns to the app', async () => {
    const { customer, subscription } = await subscribe(stripe, 3);
    const portal = await stripe.billingPortal.sessions.create({ customer: customer.id, return_url: 'http://127.0.0.1:3000/app/billing' });
    expect(portal.id).toMatch(/^bps_/);
    expect(portal.url).toBe(`${handle.url}/portal/${portal.id}`);

    const page = await (await fetch(portal.url)).text();
    expect(page).toContain('Local test payment page — no real money moves');
    expect(page).toContain('<label for="seats">Number of seats</label>');
    expect(page).toMatch(/id="seats"[^>]*value="3"/);
    expect(page).toContain('VISA ending 4242');
    expect(page).toContain('href="http://127.0.0.1:3000/app/billing"');

    const tooMany = await postForm(`${portal.url}/seats`, { seats: '501' });
    expect(tooMany.status).toBe(400);
    expect(await tooMany.text()).toContain('Choose between 1 and 500 seats.');

    const review = await postForm(`${portal.url}/seats`, { seats: '6' });
    expect(review.status).toBe(200);
    const reviewHtml = await review.text();
    expect(reviewHtml).toContain('Change seats from 3 to 6');
    expect(reviewHtml).toContain('Added to your next invoice');
    expect((await stripe.subscriptions.retrieve(subscription.id)).items.data[0].quantity).toBe(3);

    const confirm = await postForm(`${portal.url}/seats`, { seats: '6', confirm: '1' });
    expect(confirm.status).toBe(303);
    expect(confirm.headers.get('location')).toBe('http://127.0.0.1:3000/app/billing');
    expect((await stripe.subscriptions.retrieve(subscription.id)).items.data[0].quantity).toBe(6);
    const [updated] = await eventsOfType<Stripe.CustomerSubscriptionUpdatedEvent>('customer.subscription.updated');
    expect(updated.data.object.items.data[0].quantity).toBe(6);
  });

  it('schedules cancellation at period end and resumes it, each with a webhook', async () => {
    const { customer, subscription } = await subscribe(stripe, 2);
    const portal = await stripe.billingPortal.sessions.create({ customer: customer.id, return_url: 'http://127.0.0.1:3000/app/billing' });
    expect((await postForm(`${portal.url}/cancel`, {})).status).toBe(303);
    let sub = await stripe.subscriptions.retrieve(subscription.id);
    expect(sub.cancel_at_period_end).toBe(true);
    expect(sub.cancel_at).toBe(sub.items.data[0].current_period_end);
    expect(sub.status).toBe('active');
    expect(await (await fetch(portal.url)).text()).toContain('Keep subscription');

    expect((await postForm(`${portal.url}/resume`, {})).status).toBe(303);
    sub = await stripe.subscriptions.retrieve(subscription.id);
    expect(sub.cancel_at_period_end).toBe(false);
    expect(sub.cancel_at).toBeNull();
    const updates = await eventsOfType<Stripe.CustomerSubscriptionUpdatedEvent>('customer.subscription.updated', 2);
    expect(updates.map((e) => e.data.object.cancel_at_period_end)).toEqual([true, false]);
  });

  it('refuses a declined card with a message and keeps the old one', async () => {
    const { customer } = await subscribe(stripe, 1);
    const portal = await stripe.billingPortal.sessions.create({ customer: customer.id, return_url: 'http://127.0.0.1:3000/app/billing' });
    const res = await postForm(`${portal.url}/card`, DECLINE_CARD);
    expect(res.status).toBe(402);
    expect(await res.text()).toContain('Your card was declined.');
    const c = (await stripe.customers.retrieve(customer.id, { expand: ['invoice_settings.default_payment_method'] })) as Stripe.Customer;
    expect((c.invoice_settings.default_payment_method as Stripe.PaymentMethod).card?.last4).toBe('4242');
  });
});

describe('renewals, failed payments and cancellation', () => {
  it('a declined card on file at renewal: open invoice, past_due, invoice.payment_failed; a new card in the portal pays it', async () => {
    const { customer, subscription } = await subscribe(stripe, 3);
    const oldEnd = subscription.items.data[0].current_period_end;
    await admin(`/_fake/card?customer=${customer.id}&number=4000000000000002`);

    const { advanced } = await admin(`/_fake/advance?customer=${customer.id}`);
    expect(advanced).toHaveLength(1);
    expect(advanced[0].outcome).toBe('payment_failed');

    const sub = await stripe.subscriptions.retrieve(subscription.id);
    expect(sub.status).toBe('past_due');
    expect(sub.items.data[0].current_period_start).toBe(oldEnd);
    const invoice = await stripe.invoices.retrieve(sub.latest_invoice as string);
    expect(invoice.status).toBe('open');
    expect(invoice.amount_due).toBe(3 * UNIT);
    expect(invoice.attempt_count).toBe(1);
    expect(invoice.next_payment_attempt).toBeGreaterThan(oldEnd);
    const [failed] = await eventsOfType<Stripe.InvoicePaymentFailedEvent>('invoice.payment_failed');
    expect(failed.data.object.id).toBe(invoice.id);
    await receiver.waitFor((evs) => evs.some((e) => e.type === 'customer.subscription.updated' && (e.data.object as Stripe.Subscription).status === 'past_due'));
    expect(((await stripe.customers.retrieve(customer.id)) as Stripe.Customer).delinquent).toBe(true);

    const open = await stripe.invoices.list({ customer: customer.id, status: 'open' });
    expect(open.data.map((i) => i.id)).toEqual([invoice.id]);

    const portal = await stripe.billingPortal.sessions.create({ customer: customer.id, return_url: 'http://127.0.0.1:3000/app/billing' });
    expect(await (await fetch(portal.url)).text()).toContain('Your last payment of €87.00 failed.');
    expect((await postForm(`${portal.url}/card`, GOOD_CARD)).status).toBe(303);
    expect((await stripe.invoices.retrieve(invoice.id)).status).toBe('paid');
    expect((await stripe.subscriptions.retrieve(subscription.id)).status).toBe('active');
    await receiver.waitFor((evs) => evs.some((e) => e.type === 'invoice.paid' && (e.data.object as Stripe.Invoice).id === invoice.id));
    await receiver.waitFor((evs) => evs.some((e) => e.type === 'customer.subscription.updated' && (e.data.object as Stripe.Subscription).status === 'active'));
  });

  it('an open invoice can be paid on its hosted page', async () => {
    const { customer, subscription } = await subscribe(stripe, 1);
    await admin(`/_fake/card?customer=${customer.id}&number=4000000000000002`);
    const { advanced } = await admin(`/_fake/advance?customer=${customer.id}`);
    const invoice = await stripe.invoices.retrieve(advanced[0].invoice);
    expect(invoice.hosted_invoice_url).toBe(`${handle.url}/invoices/${invoice.id}`);
    const declined = await postForm(`${invoice.hosted_invoice_url}/pay`, DECLINE_CARD);
    expect(declined.status).toBe(402);
    const paid = await postForm(`${invoice.hosted_invoice_url}/pay`, GOOD_CARD);
    expect(paid.status).toBe(200);
    expect(await paid.text()).toContain('Payment received.');
    expect((await stripe.invoices.retrieve(invoice.id)).status).toBe('paid');
    expect((await stripe.subscriptions.retrieve(subscription.id)).status).toBe('active');
  });

  it('a subscription set to cancel at period end is deleted when the clock reaches the end', async () => {
    const { customer, subscription } = await subscribe(stripe, 2);
    await stripe.subscriptions.update(subscription.id, { cancel_at_period_end: true });
    const { advanced } = await admin(`/_fake/advance?customer=${customer.id}`);
    expect(advanced[0].outcome).toBe('canceled');
    const sub = await stripe.subscriptions.retrieve(subscription.id);
    expect(sub.status).toBe('canceled');
    expect(sub.ended_at).toBe(subscription.items.data[0].current_period_end);
    const [deleted] = await eventsOfType<Stripe.CustomerSubscriptionDeletedEvent>('customer.subscription.deleted');
    expect(deleted.data.object.id).toBe(subscription.id);
    expect((await stripe.invoices.list({ subscription: subscription.id })).data).toHaveLength(1); // no renewal invoice
    expect((await stripe.subscriptions.list({ customer: customer.id })).data).toHaveLength(0);
    expect((await stripe.subscriptions.list({ customer: customer.id, status: 'canceled' })).data).toHaveLength(1);
    expect((await admin(`/_fake/advance?customer=${customer.id}`)).advanced).toHaveLength(0);
    const err = await stripe.subscriptions.update(subscription.id, { cancel_at_period_end: false }).then(() => null, (e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it('cancels immediately through the API', async () => {
    const { subscription } = await subscribe(stripe, 1);
    const canceled = await stripe.subscriptions.cancel(subscription.id);
    expect(canceled.status).toBe('canceled');
    expect(canceled.ended_at).not.toBeNull();
    await eventsOfType('customer.subscription.deleted');
  });

  it('ends a trial on advance and charges the first full period', async () => {
    const { subscription, customer } = await subscribe(stripe, 2, { subscription_data: { trial_period_days: 7 } });
    expect(subscription.status).toBe('trialing');
    const { advanced } = await admin(`/_fake/advance?customer=${customer.id}`);
    const sub = await stripe.subscriptions.retrieve(subscription.id);
    expect(sub.status).toBe('active');
    expect(sub.items.data[0].current_period_start).toBe(subscription.trial_end);
    const invoice = await stripe.invoices.retrieve(advanced[0].invoice);
    expect(invoice.amount_paid).toBe(2 * UNIT);
  });
});
