// Billing through the running app: the official SDK against the local fake Stripe, the fake's hosted pages posted
// like a browser, signed webhooks into the app's route and database, seat limits on invitations, e-mails.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import Stripe from 'stripe';
import type Database from 'better-sqlite3';
import type { BillingSummary } from '@/lib/server/billing/service';
import { Client, uniqueEmail } from '../../support/http-client';
import { addMember, newFirm } from '../../support/firms';
import { firmIdOf, openTestDb } from '../../support/db-direct';
import { waitForMessage } from '../../support/mailbox';

const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');
const stripeUrl = inject('stripeUrl');
// lib/dev/stack.ts gives the app and the fake this secret.
const SECRET = 'whsec_stochos_local_fake_secret';
const GOOD = { card_number: '4242 4242 4242 4242', card_expiry: '12 / 34', card_cvc: '123', card_name: 'Olive Owner' };
const DECLINED = { ...GOOD, card_number: '4000 0000 0000 0002' };
const signer = new Stripe('sk_test_signer_only');

let db: Database.Database;
beforeAll(() => {
  db = openTestDb(inject('dataDir'));
});
afterAll(() => db?.close());

const postForm = (url: string, fields: Record<string, string>) =>
  fetch(url, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: new URLSearchParams(fields).toString(), redirect: 'manual' });

async function settle(): Promise<void> {
  const res = await fetch(`${stripeUrl}/_fake/wait?timeout_ms=20000`, { method: 'POST' });
  expect(((await res.json()) as { idle: boolean }).idle).toBe(true);
}

async function summary(c: Client): Promise<BillingSummary> {
  const r = await c.json<BillingSummary>('GET', '/api/billing');
  expect(r.status).toBe(200);
  return r.body;
}

function sign(payload: string, opts: { secret?: string; timestamp?: number } = {}): string {
  return signer.webhooks.generateTestHeaderString({ payload, secret: opts.secret ?? SECRET, timestamp: opts.timestamp ?? Math.floor(Date.now() / 1000) });
}

const postWebhook = (payload: string, signature?: string) =>
  fetch(`${appUrl}/api/webhooks/stripe`, { method: 'POST', headers: { 'content-type': 'application/json', ...(signature ? { 'stripe-signature': signature } : {}) }, body: payload });

/** Everything billing stores, to show that a refused or replayed event changed nothing. */
function billingSnapshot(): unknown {
  return ['billing_accounts', 'billing_subscriptions', 'billing_invoices', 'stripe_events'].map((t) => db.prepare(`select * from ${t} order by 1`).all());
}

const customerOf = (firmId: string) => (db.prepare('select stripe_customer_id c from billing_accounts where firm_id = ?').get(firmId) as { c: string | null } | undefined)?.c ?? null;

async function buy(owner: Client, seats: number): Promise<void> {
  const r = await owner.json<{ url: string }>('POST', '/api/billing/checkout', { seats });
  expect(r.status).toBe(201);
  const paid = await postForm(r.body.url, GOOD);
  expect(paid.status).toBe(303);
  expect(paid.headers.get('location')).toMatch(new RegExp(`^${appUrl}/app/billing\\?checkout=success&session_id=cs_test_`));
  await settle();
}

describe('seat billing end to end', () => {
  let owner: Client;
  let ownerEmail: string;
  let firmId: string;

  beforeAll(async () => {
    ({ owner, email: ownerEmail } = await newFirm(appUrl, 'billing'));
    firmId = firmIdOf(db, ownerEmail);
  });

  it('starts on the 14-day trial with 3 seats and shows the price from the SDK', async () => {
    const s = await summary(owner);
    expect(s.status).toMatchObject({ kind: 'trial', seats: 3, authoring: true, trialDaysLeft: 14 });
    expect(s.plan).toEqual({ name: 'Stochos seat', unitAmount: 2900, currency: 'eur', interval: 'month' });
    expect(s).toMatchObject({ provider: 'local fake', subscription: null, invoices: [], providerError: null });
  });

  it('a declined card shows its error on the payment page and changes nothing', async () => {
    const r = await owner.json<{ url: string }>('POST', '/api/billing/checkout', { seats: 3 });
    expect(r.status).toBe(201);
    const before = billingSnapshot();
    const declined = await postForm(r.body.url, DECLINED);
    expect(declined.status).toBe(402);
    expect(await declined.text()).toContain('Your card was declined.');
    await settle();
    expect(billingSnapshot()).toEqual(before);
    expect((await summary(owner)).subscription).toBeNull();
  });

  it('buys 3 seats: signed webhooks put the subscription and the paid invoice in the database, and a receipt goes out', async () => {
    await buy(owner, 3);
    const row = db.prepare('select status, quantity, customer_id from billing_subscriptions where firm_id = ?').get(firmId) as { status: string; quantity: number; customer_id: string };
    expect(row).toEqual({ status: 'active', quantity: 3, customer_id: customerOf(firmId) });
    const events = db.prepare('select type from stripe_events where firm_id = ? order by created, type').all(firmId) as { type: string }[];
    expect(events.map((e) => e.type)).toEqual(expect.arrayContaining(['customer.subscription.created', 'checkout.session.completed', 'invoice.paid']));
    const s = await summary(owner);
    expect(s.status).toMatchObject({ kind: 'active', seats: 3, seatsPaid: 3 });
    expect(s.invoices).toHaveLength(1);
    expect(s.invoices[0]).toMatchObject({ status: 'paid', amountPaid: 8700, seats: 3, currency: 'eur' });
    expect(s.invoices[0]!.hostedInvoiceUrl).toMatch(/\/invoices\/in_/);
    expect(s.upcoming).toMatchObject({ amount: 8700, currency: 'eur' });
    const receipt = await waitForMessage(mailboxUrl, ownerEmail, /^Receipt: €87\.00/);
    expect(receipt.text).toMatch(/Seats: 3 seats/);
  });

  it('invites up to the paid seats; the next invitation is refused with the count and the link; one more seat lets it through', async () => {
    for (const role of ['author', 'checker', 'author'] as const) await addMember(appUrl, mailboxUrl, owner, role);
    const refused = await owner.json<{ error: { code: string; message: string } }>('POST', '/api/team/invitations', { email: uniqueEmail('fourth'), role: 'checker' });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toBe('All seats are taken: 3 of 3 in use (3 seats paid). The owner can add seats on the Billing page (/app/billing).');

    const preview = await owner.json<{ preview: { dueNow: number; seats: number; prorationDate: number; quote: string } }>('POST', '/api/billing/seats/preview', { seats: 4 });
    expect(preview.status).toBe(200);
    // One more seat for (almost) all of the month just paid: at most €29.00, prorated to the second.
    expect(preview.body.preview.dueNow).toBeGreaterThan(2800);
    expect(preview.body.preview.dueNow).toBeLessThanOrEqual(2900);
    const { seats, prorationDate, quote } = preview.body.preview;
    expect((await owner.json('POST', '/api/billing/seats', { seats, prorationDate, quote })).status).toBe(202);
    await settle();
    expect((await summary(owner)).seats).toMatchObject({ paid: 4, allowed: 4, used: 3 });
    const charged = db.prepare("select amount_paid from billing_invoices where firm_id = ? and billing_reason = 'subscription_update'").get(firmId) as { amount_paid: number };
    expect(charged.amount_paid).toBe(preview.body.preview.dueNow);

    expect((await owner.json('POST', '/api/team/invitations', { email: uniqueEmail('fourth'), role: 'checker' })).status).toBe(201);
  });

  it('refuses lowering seats below the members in use, and buying again while subscribed', async () => {
    const low = await owner.json<{ error: { fields: { seats: string[] } } }>('POST', '/api/billing/seats/preview', { seats: 2 });
    expect(low.status).toBe(422);
    expect(low.body.error.fields.seats[0]).toMatch(/cannot lower seats to 2 seats: 3 authors and checkers use seats now and 1 invitation is pending.*at least 4/);
    const again = await owner.json<{ error: { message: string } }>('POST', '/api/billing/checkout', { seats: 5 });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already has a subscription \(4 seats, active\)/);
  });

  it('a failed renewal: past due with a warning e-mail, still working in the grace period', async () => {
    const customer = customerOf(firmId)!;
    expect((await fetch(`${stripeUrl}/_fake/card?customer=${customer}&number=4000000000000002`, { method: 'POST' })).status).toBe(200);
    expect((await fetch(`${stripeUrl}/_fake/advance?customer=${customer}`, { method: 'POST' })).status).toBe(200);
    await settle();
    const s = await summary(owner);
    expect(s.status).toMatchObject({ kind: 'past_due', seats: 4, authoring: true });
    expect(s.invoices[0]).toMatchObject({ status: 'failed', total: 11600 });
    const warning = await waitForMessage(mailboxUrl, ownerEmail, /^Payment failed/);
    expect(warning.text).toMatch(/could not collect €116\.00/);
    expect(warning.text).toMatch(/7-day grace period/);
  });

  it('past the grace period seats are gone: the next invitation is refused and says why', async () => {
    const sub = db.prepare("select id, past_due_since from billing_subscriptions where firm_id = ? and status = 'past_due'").get(firmId) as { id: string; past_due_since: string };
    db.prepare('update billing_subscriptions set past_due_since = ? where id = ?').run(new Date(Date.now() - 8 * 86_400_000).toISOString(), sub.id);
    try {
      const s = await summary(owner);
      expect(s.status).toMatchObject({ kind: 'suspended', seats: 0, authoring: false });
      const refused = await owner.json<{ error: { message: string } }>('POST', '/api/team/invitations', { email: uniqueEmail('late'), role: 'author' });
      expect(refused.status).toBe(409);
      expect(refused.body.error.message).toMatch(/3 of 0 in use and 1 invitation pending \(payment overdue since .*grace period ended on .*\)/);
    } finally {
      db.prepare('update billing_subscriptions set past_due_since = ? where id = ?').run(sub.past_due_since, sub.id);
    }
  });

  it('recovers when a working card goes on file in the portal', async () => {
    const portal = await owner.json<{ url: string }>('POST', '/api/billing/portal', {});
    expect(portal.status).toBe(201);
    const res = await postForm(`${portal.body.url}/card`, GOOD);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`${appUrl}/app/billing?portal=returned`);
    await settle();
    const s = await summary(owner);
    expect(s.status).toMatchObject({ kind: 'active', seats: 4 });
    expect(s.invoices[0]).toMatchObject({ status: 'paid', amountPaid: 11600 });
    await waitForMessage(mailboxUrl, ownerEmail, /^Receipt: €116\.00/);
  });

  it('cancels at period end (still working), resumes, and ends at the period end', async () => {
    expect((await owner.json('POST', '/api/billing/cancel', {})).status).toBe(202);
    await settle();
    let s = await summary(owner);
    expect(s.status).toMatchObject({ kind: 'canceling', seats: 4, authoring: true });
    expect(s.upcoming).toBeNull();
    expect((await owner.json('POST', '/api/billing/cancel', {})).status).toBe(409);

    expect((await owner.json('POST', '/api/billing/resume', {})).status).toBe(202);
    await settle();
    expect((await summary(owner)).status.kind).toBe('active');

    expect((await owner.json('POST', '/api/billing/cancel', {})).status).toBe(202);
    await settle();
    await fetch(`${stripeUrl}/_fake/advance?customer=${customerOf(firmId)}`, { method: 'POST' });
    await settle();
    s = await summary(owner);
    expect(s.status).toMatchObject({ kind: 'canceled', seats: 0, authoring: false });
    expect(s.subscription).toBeNull();
    expect((await owner.json('POST', '/api/billing/checkout', { seats: 4 })).status).toBe(201);
  });
});

describe('webhook endpoint', () => {
  let firmId: string;
  let customer: string;

  beforeAll(async () => {
    const { owner, email } = await newFirm(appUrl, 'billing-hooks');
    firmId = firmIdOf(db, email);
    // Opening the portal creates the firm's Stripe customer.
    expect((await owner.json('POST', '/api/billing/portal', {})).status).toBe(201);
    customer = customerOf(firmId)!;
    expect(customer).toMatch(/^cus_/);
  });

  function subscriptionEvent(type: string, o: { id: string; quantity: number; created: number; status?: string }) {
    return JSON.stringify({
      id: `evt_test_${o.id}_${type}_${o.created}`,
      object: 'event',
      api_version: Stripe.API_VERSION,
      created: o.created,
      type,
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
      data: {
        object: {
          id: o.id,
          object: 'subscription',
          customer,
          status: o.status ?? 'active',
          currency: 'eur',
          created: o.created - 10,
          cancel_at_period_end: false,
          cancel_at: null,
          canceled_at: null,
          ended_at: null,
          metadata: { firm_id: firmId },
          items: {
            object: 'list',
            data: [{ id: `si_${o.id}`, object: 'subscription_item', quantity: o.quantity, current_period_start: o.created - 10, current_period_end: o.created + 2_592_000, price: { id: 'price_stochos_seat', unit_amount: 2900, currency: 'eur', recurring: { interval: 'month' } } }],
          },
        },
      },
    });
  }

  it('refuses a missing, wrong or stale signature with 400 and changes nothing', async () => {
    const payload = subscriptionEvent('customer.subscription.created', { id: 'sub_forged', quantity: 99, created: Math.floor(Date.now() / 1000) });
    const before = billingSnapshot();
    const cases: [string | undefined, RegExp][] = [
      [undefined, /no Stripe-Signature header/],
      [sign(payload, { secret: 'whsec_someone_else' }), /does not match/],
      [sign(payload, { timestamp: Math.floor(Date.now() / 1000) - 3600 }), /too old/],
      ['t=1,v1=deadbeef', /too old|does not match/],
    ];
    for (const [signature, why] of cases) {
      const res = await postWebhook(payload, signature);
      expect(res.status).toBe(400);
      const body = (await res.json()) as { error: { code: string; message: string } };
      expect(body.error.code).toBe('bad_request');
      expect(body.error.message).toMatch(why);
    }
    // A body altered after signing fails too.
    const res = await postWebhook(payload.replace('"quantity": 99', '"quantity": 98').replace('"quantity":99', '"quantity":98'), sign(payload));
    expect(res.status).toBe(400);
    expect(billingSnapshot()).toEqual(before);
  });

  it('a replayed event is acknowledged and changes nothing', async () => {
    const now = Math.floor(Date.now() / 1000);
    const payload = subscriptionEvent('customer.subscription.created', { id: 'sub_replayed', quantity: 2, created: now });
    const first = await postWebhook(payload, sign(payload));
    expect(await first.json()).toEqual({ received: true, outcome: 'applied' });
    const later = subscriptionEvent('customer.subscription.updated', { id: 'sub_replayed', quantity: 5, created: now + 1 });
    expect((await (await postWebhook(later, sign(later))).json()) as object).toMatchObject({ outcome: 'applied' });
    const before = billingSnapshot();
    const again = await postWebhook(payload, sign(payload));
    expect(again.status).toBe(200);
    expect(await again.json()).toEqual({ received: true, outcome: 'duplicate' });
    expect(billingSnapshot()).toEqual(before);
    expect((db.prepare("select quantity from billing_subscriptions where id = 'sub_replayed'").get() as { quantity: number }).quantity).toBe(5);
  });

  it('updated delivered before created ends in the updated state', async () => {
    const now = Math.floor(Date.now() / 1000);
    const created = subscriptionEvent('customer.subscription.created', { id: 'sub_out_of_order', quantity: 2, created: now });
    const updated = subscriptionEvent('customer.subscription.updated', { id: 'sub_out_of_order', quantity: 7, created: now + 30, status: 'past_due' });
    expect(await (await postWebhook(updated, sign(updated))).json()).toMatchObject({ outcome: 'applied' });
    expect(await (await postWebhook(created, sign(created))).json()).toMatchObject({ outcome: 'stale' });
    const row = db.prepare("select status, quantity, last_event_created from billing_subscriptions where id = 'sub_out_of_order'").get();
    expect(row).toEqual({ status: 'past_due', quantity: 7, last_event_created: now + 30 });
  });

  it('an event for an unknown customer is a logged, acknowledged no-op', async () => {
    const payload = subscriptionEvent('customer.subscription.created', { id: 'sub_nobody', quantity: 3, created: Math.floor(Date.now() / 1000) }).replaceAll(customer, 'cus_unknown0000000');
    const before = billingSnapshot();
    const res = await postWebhook(payload, sign(payload));
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ received: true, outcome: 'unknown_customer' });
    expect(billingSnapshot()).toEqual(before);
  });

  it('a signed body that is not an event is refused with 400', async () => {
    const payload = JSON.stringify({ hello: 'world' });
    const res = await postWebhook(payload, sign(payload));
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/not a Stripe event/);
  });
});

describe('bad input to the owner routes', () => {
  let owner: Client;
  let firmId: string;
  let otherFirmId: string;

  beforeAll(async () => {
    const a = await newFirm(appUrl, 'billing-bad');
    owner = a.owner;
    firmId = firmIdOf(db, a.email);
    const b = await newFirm(appUrl, 'billing-victim');
    otherFirmId = firmIdOf(db, b.email);
  });

  it('refuses seat counts below 1, above 500, fractional or not numbers, with the seats field named', async () => {
    for (const seats of [0, -1, 501, 2.5, '3', null]) {
      const r = await owner.json<{ error: { code: string; fields: Record<string, string[]> } }>('POST', '/api/billing/checkout', { seats });
      expect(r.status, `seats ${String(seats)}`).toBe(422);
      expect(r.body.error.fields.seats?.[0]).toBe('Choose a whole number of seats from 1 to 500.');
    }
    expect(customerOf(firmId)).toBeNull();
  });

  it('takes no firm from the request: a checkout naming another firm is refused and creates nothing for it', async () => {
    const r = await owner.json<{ error: { code: string; fields: Record<string, string[]> } }>('POST', '/api/billing/checkout', { seats: 3, firmId: otherFirmId });
    expect(r.status).toBe(422);
    expect(Object.keys(r.body.error.fields)).toEqual(['_']);
    expect(customerOf(otherFirmId)).toBeNull();
    expect(customerOf(firmId)).toBeNull();
  });

  it('refuses a non-JSON body, a malformed one and a cross-site post', async () => {
    expect((await owner.request('POST', '/api/billing/checkout', 'seats=3', { 'content-type': 'application/x-www-form-urlencoded' })).status).toBe(415);
    expect((await owner.request('POST', '/api/billing/checkout', '{"seats":', { 'content-type': 'application/json' })).status).toBe(400);
    expect((await owner.request('POST', '/api/billing/checkout', { seats: 3 }, { origin: 'https://attacker.example' })).status).toBe(403);
    expect(customerOf(firmId)).toBeNull();
  });

  it('a forged checkout completion naming another firm is acknowledged and changes nothing', async () => {
    expect((await owner.json('POST', '/api/billing/portal', {})).status).toBe(201);
    const customer = customerOf(firmId)!;
    const payload = JSON.stringify({
      id: `evt_test_cross_${Date.now()}`,
      object: 'event',
      api_version: Stripe.API_VERSION,
      created: Math.floor(Date.now() / 1000),
      type: 'checkout.session.completed',
      data: { object: { id: 'cs_test_cross', object: 'checkout.session', mode: 'subscription', customer, subscription: null, client_reference_id: otherFirmId, metadata: { firm_id: otherFirmId } } },
    });
    const before = billingSnapshot();
    const res = await postWebhook(payload, sign(payload));
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ received: true, outcome: 'firm_mismatch' });
    expect(billingSnapshot()).toEqual(before);
  });
});
