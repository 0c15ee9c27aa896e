// The webhook processor against a fresh SQLite database: idempotency, ordering, unknown customers, firm checks,
// and what the stored state means for seats and authoring.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type Stripe from 'stripe';
import { randomUUID } from 'node:crypto';
import { useFreshDb } from '../../support/test-db';
import { closeDb, getDb, writeTransaction } from '@/db/knex';
import { insertFirmWithOwner, insertUser } from '@/db/users';
import { insertMembership } from '@/db/team';
import { ensureBillingAccount, getInvoiceRow, getSubscriptionRow, setStripeCustomer } from '@/db/billing';
import { processStripeEvent, type ProcessDeps } from '@/lib/server/billing/webhooks';
import { assertAuthoringAllowed, billingStatus } from '@/lib/server/billing';
import { getSeatAllowance } from '@/lib/server/team/seat-allowance';
import { assertSeatAvailable } from '@/lib/server/team/seats';
import { AppError } from '@/lib/server/http/errors';
import { T0, checkoutSession, event, invoice, subscription } from './fixtures';

const logs: string[] = [];
let fetched: string[] = [];
let fetchable = new Map<string, Stripe.Subscription>();
let clock = (T0 + 3600) * 1000;
const deps: ProcessDeps = {
  fetchSubscription: async (id) => {
    fetched.push(id);
    return fetchable.get(id) ?? null;
  },
  now: () => clock,
  log: (l) => logs.push(l),
};

async function newFirm(): Promise<{ firmId: string; customerId: string }> {
  const customerId = `cus_${randomUUID().replace(/-/g, '').slice(0, 14)}`;
  const firmId = await writeTransaction(async (trx) => {
    const userId = await insertUser({ email: `owner-${customerId}@test-firm.example`, name: 'Olive Owner', passwordHash: null, verified: true }, trx);
    const id = await insertFirmWithOwner({ name: 'Hollin Stack Engineering' }, userId, trx);
    await ensureBillingAccount(id, new Date(Date.now() + 14 * 86_400_000).toISOString(), trx);
    await setStripeCustomer(id, customerId, trx);
    return id;
  });
  return { firmId, customerId };
}

async function addSeats(firmId: string, n: number): Promise<void> {
  await writeTransaction(async (trx) => {
    for (let i = 0; i < n; i++) {
      const userId = await insertUser({ email: `m-${randomUUID()}@test-firm.example`, name: 'Member', passwordHash: null, verified: true }, trx);
      await insertMembership(firmId, userId, i % 2 ? 'checker' : 'author', trx);
    }
  });
}

const count = async (table: string, where: Record<string, unknown> = {}) => Number(((await getDb()(table).where(where).count({ n: '*' }).first()) as { n: number }).n);

beforeAll(async () => {
  await useFreshDb();
});
afterAll(async () => {
  await closeDb();
});
beforeEach(() => {
  logs.length = 0;
  fetched = [];
  fetchable = new Map();
  clock = (T0 + 3600) * 1000;
});

describe('subscription events', () => {
  it('applies created then updated in order, and records each event id once', async () => {
    const { firmId, customerId } = await newFirm();
    const sub = subscription({ id: 'sub_order_1', customer: customerId, firmId, quantity: 3 });
    expect((await processStripeEvent(event('customer.subscription.created', sub, T0), deps)).outcome).toBe('applied');
    const grown = subscription({ id: 'sub_order_1', customer: customerId, firmId, quantity: 5 });
    expect((await processStripeEvent(event('customer.subscription.updated', grown, T0 + 60), deps)).outcome).toBe('applied');
    const row = await getSubscriptionRow('sub_order_1');
    expect(row).toMatchObject({ firmId, status: 'active', quantity: 5, lastEventCreated: T0 + 60, itemId: 'si_sub_order_1', unitAmount: 2900, currency: 'eur' });
    expect(await count('stripe_events', { firm_id: firmId })).toBe(2);
    expect(await count('audit_log', { firm_id: firmId, action: 'billing.subscription_changed' })).toBe(2);
  });

  it('updated delivered before created ends in the updated state', async () => {
    const { firmId, customerId } = await newFirm();
    const created = event('customer.subscription.created', subscription({ id: 'sub_ooo', customer: customerId, firmId, quantity: 3 }), T0);
    const updated = event('customer.subscription.updated', subscription({ id: 'sub_ooo', customer: customerId, firmId, quantity: 6 }), T0 + 5);
    expect((await processStripeEvent(updated, deps)).outcome).toBe('applied');
    expect((await processStripeEvent(created, deps)).outcome).toBe('stale');
    expect(await getSubscriptionRow('sub_ooo')).toMatchObject({ quantity: 6, lastEventCreated: T0 + 5, lastEventType: 'customer.subscription.updated' });
    // The stale event is still recorded, so a retry of it is a duplicate.
    expect((await processStripeEvent(created, deps)).outcome).toBe('duplicate');
  });

  it('within the same second, "created" never overwrites a later event type', async () => {
    const { firmId, customerId } = await newFirm();
    const updated = event('customer.subscription.updated', subscription({ id: 'sub_tie', customer: customerId, firmId, quantity: 4, status: 'past_due' }), T0);
    const created = event('customer.subscription.created', subscription({ id: 'sub_tie', customer: customerId, firmId, quantity: 3 }), T0);
    await processStripeEvent(updated, deps);
    expect((await processStripeEvent(created, deps)).outcome).toBe('stale');
    expect(await getSubscriptionRow('sub_tie')).toMatchObject({ quantity: 4, status: 'past_due' });
  });

  it('two updates stamped with the same second and disagreeing are settled by reading Stripe', async () => {
    const { firmId, customerId } = await newFirm();
    const a = event('customer.subscription.updated', subscription({ id: 'sub_same', customer: customerId, firmId, quantity: 4 }), T0);
    const b = event('customer.subscription.updated', subscription({ id: 'sub_same', customer: customerId, firmId, quantity: 2, status: 'past_due' }), T0);
    fetchable.set('sub_same', subscription({ id: 'sub_same', customer: customerId, firmId, quantity: 4 }));
    await processStripeEvent(a, deps);
    expect(fetched).toEqual([]);
    expect((await processStripeEvent(b, deps)).outcome).toBe('applied');
    expect(fetched).toEqual(['sub_same']);
    expect(await getSubscriptionRow('sub_same')).toMatchObject({ quantity: 4, status: 'active' });
  });

  it('a replayed event changes nothing, even after newer events', async () => {
    const { firmId, customerId } = await newFirm();
    const first = event('customer.subscription.updated', subscription({ id: 'sub_replay', customer: customerId, firmId, quantity: 3 }), T0 + 10);
    await processStripeEvent(first, deps);
    await processStripeEvent(event('customer.subscription.updated', subscription({ id: 'sub_replay', customer: customerId, firmId, quantity: 8 }), T0 + 20), deps);
    const before = await getDb()('billing_subscriptions').where({ id: 'sub_replay' }).first();
    const auditBefore = await count('audit_log', { firm_id: firmId });
    expect((await processStripeEvent(first, deps)).outcome).toBe('duplicate');
    expect(await getDb()('billing_subscriptions').where({ id: 'sub_replay' }).first()).toEqual(before);
    expect(await count('audit_log', { firm_id: firmId })).toBe(auditBefore);
    expect(await count('stripe_events', { id: first.id })).toBe(1);
  });

  it('a cancelled subscription stays cancelled when an older or same-time update arrives late', async () => {
    const { firmId, customerId } = await newFirm();
    await processStripeEvent(event('customer.subscription.deleted', subscription({ id: 'sub_end', customer: customerId, firmId, quantity: 3, status: 'canceled' }), T0 + 100), deps);
    const late = await processStripeEvent(event('customer.subscription.updated', subscription({ id: 'sub_end', customer: customerId, firmId, quantity: 3, cancelAtPeriodEnd: true }), T0 + 100), deps);
    expect(late.outcome).toBe('stale');
    expect((await getSubscriptionRow('sub_end'))?.status).toBe('canceled');
    expect((await billingStatus(firmId)).kind).toBe('canceled');
  });

  it('an event for an unknown customer is acknowledged and changes nothing', async () => {
    const before = { subs: await count('billing_subscriptions'), events: await count('stripe_events'), audit: await count('audit_log') };
    const e = event('customer.subscription.created', subscription({ id: 'sub_stranger', customer: 'cus_nobody_here', firmId: null, quantity: 3 }), T0);
    expect((await processStripeEvent(e, deps)).outcome).toBe('unknown_customer');
    expect({ subs: await count('billing_subscriptions'), events: await count('stripe_events'), audit: await count('audit_log') }).toEqual(before);
    expect(logs.join('\n')).toMatch(/unknown customer cus_nobody_here/);
  });

  it('a subscription whose metadata names another firm is refused without changes', async () => {
    const a = await newFirm();
    const b = await newFirm();
    const e = event('customer.subscription.created', subscription({ id: 'sub_cross', customer: a.customerId, firmId: b.firmId, quantity: 50 }), T0);
    expect((await processStripeEvent(e, deps)).outcome).toBe('firm_mismatch');
    expect(await getSubscriptionRow('sub_cross')).toBeNull();
    expect(await count('stripe_events', { id: e.id })).toBe(0);
  });

  it('events the app does not use are acknowledged and ignored', async () => {
    const { customerId } = await newFirm();
    const e = event('customer.updated', { id: customerId, object: 'customer', customer: customerId }, T0);
    expect((await processStripeEvent(e, deps)).outcome).toBe('ignored');
    expect(await count('stripe_events', { id: e.id })).toBe(0);
  });
});

describe('checkout.session.completed', () => {
  it('records the completed checkout, and reads the subscription when its own event has not arrived yet', async () => {
    const { firmId, customerId } = await newFirm();
    fetchable.set('sub_ck', subscription({ id: 'sub_ck', customer: customerId, firmId, quantity: 3 }));
    const e = event('checkout.session.completed', checkoutSession({ customer: customerId, firmId, subscription: 'sub_ck' }), T0);
    expect((await processStripeEvent(e, deps)).outcome).toBe('applied');
    expect(fetched).toEqual(['sub_ck']);
    expect(await getSubscriptionRow('sub_ck')).toMatchObject({ quantity: 3, status: 'active' });
    expect(await count('audit_log', { firm_id: firmId, action: 'billing.checkout_completed' })).toBe(1);
    // The subscription's own "created" event, same second, arrives afterwards and is stale.
    const created = event('customer.subscription.created', subscription({ id: 'sub_ck', customer: customerId, firmId, quantity: 3 }), T0);
    expect((await processStripeEvent(created, deps)).outcome).toBe('stale');
    expect((await getSeatAllowance(firmId)).seats).toBe(3);
  });

  it('refuses a checkout whose firm is not the customer’s firm (a checkout for another firm)', async () => {
    const a = await newFirm();
    const b = await newFirm();
    fetchable.set('sub_other', subscription({ id: 'sub_other', customer: a.customerId, firmId: b.firmId, quantity: 9 }));
    const e = event('checkout.session.completed', checkoutSession({ customer: a.customerId, firmId: b.firmId, subscription: 'sub_other' }), T0);
    expect((await processStripeEvent(e, deps)).outcome).toBe('firm_mismatch');
    expect(await getSubscriptionRow('sub_other')).toBeNull();
    expect(await count('audit_log', { firm_id: a.firmId, action: 'billing.checkout_completed' })).toBe(0);
    expect(await count('audit_log', { firm_id: b.firmId, action: 'billing.checkout_completed' })).toBe(0);
    expect(await count('stripe_events', { id: e.id })).toBe(0);
  });
});

describe('invoices, grace and enforcement', () => {
  it('fail → past due within grace → paid: notices, stored status and seats follow', async () => {
    const { firmId, customerId } = await newFirm();
    await addSeats(firmId, 3);
    const sub = subscription({ id: 'sub_pay', customer: customerId, firmId, quantity: 3 });
    await processStripeEvent(event('customer.subscription.created', sub, T0), deps);

    const open = invoice({ id: 'in_pay_0001', customer: customerId, subscription: sub, quantity: 3, status: 'open', created: T0 + 100 });
    const failed = await processStripeEvent(event('invoice.payment_failed', open, T0 + 100), deps);
    expect(failed.outcome).toBe('applied');
    expect(failed.notices).toHaveLength(1);
    expect(failed.notices[0]).toMatchObject({ kind: 'payment_failed', firmId, graceEndsAt: new Date((T0 + 100) * 1000 + 7 * 86_400_000).toISOString() });

    // Stripe's clock may run ahead of ours (a test clock): the grace period starts no later than our now.
    clock = (T0 + 50) * 1000;
    await processStripeEvent(event('customer.subscription.updated', subscription({ id: 'sub_pay', customer: customerId, firmId, quantity: 3, status: 'past_due' }), T0 + 101), deps);
    expect((await getSubscriptionRow('sub_pay'))?.pastDueSince).toBe(new Date((T0 + 50) * 1000).toISOString());

    const paid = invoice({ id: 'in_pay_0001', customer: customerId, subscription: sub, quantity: 3, status: 'paid', attempts: 2, created: T0 + 100 });
    const paidResult = await processStripeEvent(event('invoice.paid', paid, T0 + 400), deps);
    expect(paidResult.notices.map((n) => n.kind)).toEqual(['receipt']);
    expect(await getInvoiceRow('in_pay_0001')).toMatchObject({ status: 'paid', amountPaid: 8700, seats: 3, attemptCount: 2 });

    // A failure notice delivered late (a retry) neither reopens the paid invoice nor sends a warning.
    const lateFailure = await processStripeEvent(event('invoice.payment_failed', open, T0 + 200), deps);
    expect(lateFailure).toMatchObject({ outcome: 'stale', notices: [] });
    expect((await getInvoiceRow('in_pay_0001'))?.status).toBe('paid');
  });

  it('past the 7-day grace: authoring is refused with the reason, and seats are gone', async () => {
    const { firmId, customerId } = await newFirm();
    await addSeats(firmId, 2);
    await processStripeEvent(event('customer.subscription.updated', subscription({ id: 'sub_grace', customer: customerId, firmId, quantity: 4, status: 'past_due' }), T0), deps);
    await expect(assertAuthoringAllowed(firmId)).resolves.toBeUndefined();
    expect((await getSeatAllowance(firmId)).seats).toBe(4);

    await getDb()('billing_subscriptions').where({ id: 'sub_grace' }).update({ past_due_since: new Date(Date.now() - 8 * 86_400_000).toISOString() });
    const err = await assertAuthoringAllowed(firmId).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).code).toBe('forbidden');
    expect((err as AppError).message).toMatch(/read-only.*grace period ended.*update the card.*\/app\/billing/);
    expect(await getSeatAllowance(firmId)).toMatchObject({ seats: 0 });
    const refusal = await writeTransaction((trx) => assertSeatAvailable(firmId, { adding: 1, countInvitations: true }, trx)).catch((e: unknown) => e);
    expect((refusal as AppError).message).toMatch(/2 of 0 in use.*\/app\/billing/);
  });

  it('seats follow the paid quantity for invitations: the next one beyond it is refused', async () => {
    const { firmId, customerId } = await newFirm();
    await addSeats(firmId, 4);
    await processStripeEvent(event('customer.subscription.created', subscription({ id: 'sub_limit', customer: customerId, firmId, quantity: 4 }), T0), deps);
    const refusal = await writeTransaction((trx) => assertSeatAvailable(firmId, { adding: 1, countInvitations: true }, trx)).catch((e: unknown) => e);
    expect((refusal as AppError).message).toBe('All seats are taken: 4 of 4 in use (4 seats paid). The owner can add seats on the Billing page (/app/billing).');
    await processStripeEvent(event('customer.subscription.updated', subscription({ id: 'sub_limit', customer: customerId, firmId, quantity: 5 }), T0 + 1), deps);
    await expect(writeTransaction((trx) => assertSeatAvailable(firmId, { adding: 1, countInvitations: true }, trx))).resolves.toBeUndefined();
  });
});
