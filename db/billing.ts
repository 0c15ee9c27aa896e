import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { nowIso } from '@/db/ids';

// Billing records: every query names its columns and is scoped by firm (or by a Stripe id that maps to one firm).

type Q = Knex | Knex.Transaction;
const q = (trx?: Knex.Transaction): Q => trx ?? getDb();

export interface BillingAccount {
  firmId: string;
  stripeCustomerId: string | null;
  trialEndsAt: string;
}

const ACCOUNT_COLUMNS = ['firm_id', 'stripe_customer_id', 'trial_ends_at'];

const toAccount = (r: Record<string, unknown>): BillingAccount => ({
  firmId: r.firm_id as string,
  stripeCustomerId: (r.stripe_customer_id as string | null) ?? null,
  trialEndsAt: r.trial_ends_at as string,
});

export async function getBillingAccount(firmId: string, trx?: Knex.Transaction): Promise<BillingAccount | null> {
  const row = await q(trx)('billing_accounts').select(ACCOUNT_COLUMNS).where({ firm_id: firmId }).first();
  return row ? toAccount(row) : null;
}

/** Creates the firm's billing account on first use, with its trial end; returns the stored account. */
export async function ensureBillingAccount(firmId: string, trialEndsAt: string, trx: Knex.Transaction): Promise<BillingAccount> {
  const now = nowIso();
  await trx('billing_accounts').insert({ firm_id: firmId, stripe_customer_id: null, trial_ends_at: trialEndsAt, created_at: now, updated_at: now }).onConflict('firm_id').ignore();
  return (await getBillingAccount(firmId, trx))!;
}

export async function setStripeCustomer(firmId: string, customerId: string, trx: Knex.Transaction): Promise<void> {
  await trx('billing_accounts').where({ firm_id: firmId }).update({ stripe_customer_id: customerId, updated_at: nowIso() });
}

export async function firmIdByCustomer(customerId: string, trx?: Knex.Transaction): Promise<string | null> {
  const row = await q(trx)('billing_accounts').select('firm_id').where({ stripe_customer_id: customerId }).first();
  return row?.firm_id ?? null;
}

export interface SubscriptionRow {
  id: string;
  firmId: string;
  customerId: string;
  status: string;
  itemId: string | null;
  priceId: string | null;
  unitAmount: number | null;
  currency: string | null;
  interval: string | null;
  quantity: number;
  currentPeriodStart: string | null;
  currentPeriodEnd: string | null;
  cancelAtPeriodEnd: boolean;
  canceledAt: string | null;
  endedAt: string | null;
  pastDueSince: string | null;
  lastEventCreated: number;
  lastEventType: string;
  stripeCreatedAt: string;
}

const SUB_COLUMNS = [
  'id',
  'firm_id',
  'customer_id',
  'status',
  'item_id',
  'price_id',
  'unit_amount',
  'currency',
  'interval',
  'quantity',
  'current_period_start',
  'current_period_end',
  'cancel_at_period_end',
  'canceled_at',
  'ended_at',
  'past_due_since',
  'last_event_created',
  'last_event_type',
  'stripe_created_at',
];

const toSub = (r: Record<string, unknown>): SubscriptionRow => ({
  id: r.id as string,
  firmId: r.firm_id as string,
  customerId: r.customer_id as string,
  status: r.status as string,
  itemId: (r.item_id as string | null) ?? null,
  priceId: (r.price_id as string | null) ?? null,
  unitAmount: r.unit_amount == null ? null : Number(r.unit_amount),
  currency: (r.currency as string | null) ?? null,
  interval: (r.interval as string | null) ?? null,
  quantity: Number(r.quantity),
  currentPeriodStart: (r.current_period_start as string | null) ?? null,
  currentPeriodEnd: (r.current_period_end as string | null) ?? null,
  cancelAtPeriodEnd: Boolean(r.cancel_at_period_end),
  canceledAt: (r.canceled_at as string | null) ?? null,
  endedAt: (r.ended_at as string | null) ?? null,
  pastDueSince: (r.past_due_since as string | null) ?? null,
  lastEventCreated: Number(r.last_event_created),
  lastEventType: r.last_event_type as string,
  stripeCreatedAt: r.stripe_created_at as string,
});

export async function getSubscriptionRow(id: string, trx?: Knex.Transaction): Promise<SubscriptionRow | null> {
  const row = await q(trx)('billing_subscriptions').select(SUB_COLUMNS).where({ id }).first();
  return row ? toSub(row) : null;
}

/** The firm's subscriptions, newest first. */
export async function listSubscriptions(firmId: string, trx?: Knex.Transaction): Promise<SubscriptionRow[]> {
  const rows = await q(trx)('billing_subscriptions').select(SUB_COLUMNS).where({ firm_id: firmId }).orderBy([
    { column: 'stripe_created_at', order: 'desc' },
    { column: 'last_event_created', order: 'desc' },
  ]);
  return rows.map(toSub);
}

export async function upsertSubscription(s: SubscriptionRow, trx: Knex.Transaction): Promise<void> {
  const row = {
    id: s.id,
    firm_id: s.firmId,
    customer_id: s.customerId,
    status: s.status,
    item_id: s.itemId,
    price_id: s.priceId,
    unit_amount: s.unitAmount,
    currency: s.currency,
    interval: s.interval,
    quantity: s.quantity,
    current_period_start: s.currentPeriodStart,
    current_period_end: s.currentPeriodEnd,
    cancel_at_period_end: s.cancelAtPeriodEnd,
    canceled_at: s.canceledAt,
    ended_at: s.endedAt,
    past_due_since: s.pastDueSince,
    last_event_created: s.lastEventCreated,
    last_event_type: s.lastEventType,
    stripe_created_at: s.stripeCreatedAt,
    updated_at: nowIso(),
  };
  const { id: _id, firm_id: _firm, ...changes } = row;
  void _id;
  void _firm;
  // A subscription never moves between firms: the update is scoped to the firm that first stored it.
  await trx('billing_subscriptions').insert(row).onConflict('id').merge(Object.keys(changes));
}

export interface InvoiceRow {
  id: string;
  firmId: string;
  subscriptionId: string | null;
  number: string | null;
  status: string;
  billingReason: string | null;
  total: number;
  amountDue: number;
  amountPaid: number;
  currency: string;
  seats: number | null;
  periodStart: string | null;
  periodEnd: string | null;
  hostedInvoiceUrl: string | null;
  attemptCount: number;
  lastEventCreated: number;
  stripeCreatedAt: string;
}

const INVOICE_COLUMNS = [
  'id',
  'firm_id',
  'subscription_id',
  'number',
  'status',
  'billing_reason',
  'total',
  'amount_due',
  'amount_paid',
  'currency',
  'seats',
  'period_start',
  'period_end',
  'hosted_invoice_url',
  'attempt_count',
  'last_event_created',
  'stripe_created_at',
];

const toInvoice = (r: Record<string, unknown>): InvoiceRow => ({
  id: r.id as string,
  firmId: r.firm_id as string,
  subscriptionId: (r.subscription_id as string | null) ?? null,
  number: (r.number as string | null) ?? null,
  status: r.status as string,
  billingReason: (r.billing_reason as string | null) ?? null,
  total: Number(r.total),
  amountDue: Number(r.amount_due),
  amountPaid: Number(r.amount_paid),
  currency: r.currency as string,
  seats: r.seats == null ? null : Number(r.seats),
  periodStart: (r.period_start as string | null) ?? null,
  periodEnd: (r.period_end as string | null) ?? null,
  hostedInvoiceUrl: (r.hosted_invoice_url as string | null) ?? null,
  attemptCount: Number(r.attempt_count),
  lastEventCreated: Number(r.last_event_created),
  stripeCreatedAt: r.stripe_created_at as string,
});

export async function getInvoiceRow(id: string, trx?: Knex.Transaction): Promise<InvoiceRow | null> {
  const row = await q(trx)('billing_invoices').select(INVOICE_COLUMNS).where({ id }).first();
  return row ? toInvoice(row) : null;
}

export async function listInvoices(firmId: string, limit = 50, trx?: Knex.Transaction): Promise<InvoiceRow[]> {
  const rows = await q(trx)('billing_invoices').select(INVOICE_COLUMNS).where({ firm_id: firmId }).orderBy([
    { column: 'stripe_created_at', order: 'desc' },
    { column: 'id', order: 'desc' },
  ]).limit(limit);
  return rows.map(toInvoice);
}

export async function upsertInvoice(i: InvoiceRow, trx: Knex.Transaction): Promise<void> {
  const row = {
    id: i.id,
    firm_id: i.firmId,
    subscription_id: i.subscriptionId,
    number: i.number,
    status: i.status,
    billing_reason: i.billingReason,
    total: i.total,
    amount_due: i.amountDue,
    amount_paid: i.amountPaid,
    currency: i.currency,
    seats: i.seats,
    period_start: i.periodStart,
    period_end: i.periodEnd,
    hosted_invoice_url: i.hostedInvoiceUrl,
    attempt_count: i.attemptCount,
    last_event_created: i.lastEventCreated,
    stripe_created_at: i.stripeCreatedAt,
    updated_at: nowIso(),
  };
  const { id: _id, firm_id: _firm, ...changes } = row;
  void _id;
  void _firm;
  await trx('billing_invoices').insert(row).onConflict('id').merge(Object.keys(changes));
}

export async function hasStripeEvent(id: string, trx?: Knex.Transaction): Promise<boolean> {
  return Boolean(await q(trx)('stripe_events').select('id').where({ id }).first());
}

export async function insertStripeEvent(e: { id: string; type: string; firmId: string | null; created: number; outcome: string }, trx: Knex.Transaction): Promise<void> {
  await trx('stripe_events').insert({ id: e.id, type: e.type, firm_id: e.firmId, created: e.created, outcome: e.outcome, received_at: nowIso() });
}

/** The firm's name and its active owners, who receive billing e-mails. */
export async function billingContacts(firmId: string, trx?: Knex.Transaction): Promise<{ firmName: string; owners: { email: string; name: string }[] } | null> {
  const firm = await q(trx)('firms').select('name').where({ id: firmId }).first();
  if (!firm) return null;
  const owners = await q(trx)('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where({ 'm.firm_id': firmId, 'm.status': 'active', 'm.role': 'owner' })
    .select('u.email', 'u.name')
    .orderBy('u.email');
  return { firmName: firm.name, owners: owners.map((o: { email: string; name: string }) => ({ email: o.email, name: o.name })) };
}
