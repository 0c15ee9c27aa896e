import 'server-only';
import { createHmac, timingSafeEqual } from 'node:crypto';
import type Stripe from 'stripe';
import { writeTransaction } from '@/db/knex';
import { getFirm } from '@/db/firms';
import { ensureBillingAccount, getBillingAccount, listInvoices, listSubscriptions, setStripeCustomer, type InvoiceRow, type SubscriptionRow } from '@/db/billing';
import { recordAudit } from '@/db/audit';
import { env } from '@/lib/server/env';
import { AppError, conflict, fieldError, notFound } from '@/lib/server/http/errors';
import type { Member } from '@/lib/server/auth/guard';
import { seatUsage, type SeatUsage } from '@/lib/server/team/seats';
import { billingStatus, defaultTrialEnd } from './access';
import { MAX_SEATS, MIN_SEATS, SEAT_PRICE_LOOKUP_KEY } from '@/lib/core/billing/plan';
import { providerError } from './provider-errors';
import { currentSubscription, seatsWord } from '@/lib/core/billing/status';
import type { BillingSummary, InvoiceView, Plan, SeatPreview } from '@/lib/core/api-types';

export type { BillingSummary, InvoiceView, Plan, SeatPreview };
import { stripe, usingFakeStripe } from './stripe';

// The owner's billing actions. The firm always comes from the signed-in member, never from the request body.

const LIVE = new Set(['active', 'trialing', 'past_due']);
const appUrl = () => env().APP_URL.replace(/\/+$/, '');

// ---------- price ----------


let planCache: { at: number; key: string; plan: Plan } | null = null;

/** The per-seat price: STRIPE_PRICE_ID, else the active price with the lookup key. Cached for ten minutes. */
export async function seatPlan(): Promise<Plan> {
  const key = `${env().STRIPE_PRICE_ID ?? SEAT_PRICE_LOOKUP_KEY}|${env().STRIPE_SECRET_KEY ? 'live' : env().FAKE_STRIPE_URL}`;
  if (planCache && planCache.key === key && Date.now() - planCache.at < 600_000) return planCache.plan;
  let price: Stripe.Price | undefined;
  try {
    const id = env().STRIPE_PRICE_ID;
    price = id
      ? await stripe().prices.retrieve(id, { expand: ['product'] })
      : (await stripe().prices.list({ lookup_keys: [SEAT_PRICE_LOOKUP_KEY], active: true, expand: ['data.product'], limit: 1 })).data[0];
  } catch (err) {
    throw providerError(err, 'reading the seat price');
  }
  if (!price || price.unit_amount == null || !price.recurring) {
    throw new AppError('internal', `No recurring seat price was found. Set STRIPE_PRICE_ID, or give a monthly per-seat price the lookup key "${SEAT_PRICE_LOOKUP_KEY}".`);
  }
  const product = typeof price.product === 'object' && price.product && 'name' in price.product ? price.product.name : null;
  const plan = { priceId: price.id, name: product ?? price.nickname ?? 'Stochos seat', unitAmount: price.unit_amount, currency: price.currency, interval: price.recurring.interval };
  planCache = { at: Date.now(), key, plan };
  return plan;
}

// ---------- customer ----------

/** The firm's Stripe customer, created on first need and stored; concurrent calls end with one stored id. */
async function ensureCustomer(m: Member): Promise<string> {
  const firm = await getFirm(m.firmId);
  if (!firm) throw notFound('That firm');
  const account = await writeTransaction((trx) => ensureBillingAccount(m.firmId, defaultTrialEnd(firm.createdAt), trx));
  if (account.stripeCustomerId) return account.stripeCustomerId;
  let customer: Stripe.Customer;
  try {
    customer = await stripe().customers.create(
      { name: firm.name, email: m.email, metadata: { firm_id: m.firmId } },
      // A double click or a retry within 24 h returns the same customer instead of a second one.
      { idempotencyKey: `stochos-customer-${m.firmId}-${m.userId}` },
    );
  } catch (err) {
    throw providerError(err, 'creating the billing customer');
  }
  return writeTransaction(async (trx) => {
    const again = await getBillingAccount(m.firmId, trx);
    if (again?.stripeCustomerId) return again.stripeCustomerId;
    await setStripeCustomer(m.firmId, customer.id, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'billing.customer_created', targetType: 'customer', targetId: customer.id }, trx);
    return customer.id;
  });
}

// ---------- checks ----------

function liveSubscription(subs: SubscriptionRow[]): SubscriptionRow | null {
  const current = currentSubscription(subs);
  return current && LIVE.has(current.status) ? current : null;
}

async function requireLiveSubscription(firmId: string): Promise<SubscriptionRow> {
  const sub = liveSubscription(await listSubscriptions(firmId));
  if (!sub || !sub.itemId) throw conflict('This firm has no running subscription. Buy seats first.');
  return sub;
}

function assertSeatRange(seats: number): void {
  if (!Number.isInteger(seats) || seats < MIN_SEATS || seats > MAX_SEATS) throw fieldError('seats', `Choose a whole number of seats from ${MIN_SEATS} to ${MAX_SEATS}.`);
}

/** Seats cannot go below the authors and checkers in use (and the invitations that would take seats). */
function assertCoversUsage(seats: number, u: SeatUsage, verb: string): void {
  const needed = u.used + u.pendingInvitations;
  if (seats >= needed) return;
  const pending = u.pendingInvitations ? ` and ${u.pendingInvitations} invitation${u.pendingInvitations === 1 ? ' is' : 's are'} pending` : '';
  throw fieldError(
    'seats',
    `You cannot ${verb} ${seatsWord(seats)}: ${u.used} author${u.used === 1 ? '' : 's'} and checkers use seats now${pending}. Remove members or cancel invitations on the Team page first, or choose at least ${needed}.`,
  );
}

// ---------- checkout, portal ----------

export async function startCheckout(m: Member, seats: number): Promise<{ url: string }> {
  assertSeatRange(seats);
  const subs = await listSubscriptions(m.firmId);
  const current = currentSubscription(subs);
  if (current && current.status !== 'canceled') {
    throw conflict(`This firm already has a subscription (${seatsWord(current.quantity)}, ${current.status.replace('_', ' ')}). Use “Change seats” or the portal instead of buying again.`);
  }
  assertCoversUsage(seats, await seatUsage(m.firmId), 'buy');
  const plan = await seatPlan();
  const customer = await ensureCustomer(m);
  let session: Stripe.Checkout.Session;
  try {
    // An earlier checkout page left open (another tab, the back button) could otherwise start a second subscription.
    const open = await stripe().checkout.sessions.list({ customer, status: 'open', limit: 10 });
    for (const s of open.data) await stripe().checkout.sessions.expire(s.id);
    session = await stripe().checkout.sessions.create({
      mode: 'subscription',
      customer,
      line_items: [{ price: plan.priceId, quantity: seats }],
      success_url: `${appUrl()}/app/billing?checkout=success&session_id={CHECKOUT_SESSION_ID}`,
      cancel_url: `${appUrl()}/app/billing?checkout=cancelled`,
      client_reference_id: m.firmId,
      metadata: { firm_id: m.firmId, seats: String(seats) },
      subscription_data: { metadata: { firm_id: m.firmId } },
    });
  } catch (err) {
    throw providerError(err, 'opening checkout');
  }
  if (!session.url) throw new AppError('internal', 'The payment provider opened checkout without a page address. Try again.');
  await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'billing.checkout_started', targetType: 'checkout', targetId: session.id, detail: { seats } });
  return { url: session.url };
}

export async function openPortal(m: Member): Promise<{ url: string }> {
  const customer = await ensureCustomer(m);
  try {
    const session = await stripe().billingPortal.sessions.create({ customer, return_url: `${appUrl()}/app/billing?portal=returned` });
    return { url: session.url };
  } catch (err) {
    throw providerError(err, 'opening the billing portal');
  }
}

// ---------- seat changes ----------

/** A preview is quoted for a proration moment; the change must use the same moment to charge what was shown. */
function quoteFor(firmId: string, subId: string, seats: number, prorationDate: number, issuedAt: number): string {
  const mac = createHmac('sha256', `${env().authSecret}:billing-quote`).update(`${firmId}|${subId}|${seats}|${prorationDate}|${issuedAt}`).digest('base64url');
  return `${issuedAt}.${mac}`;
}

const QUOTE_MINUTES = 15;

function checkQuote(firmId: string, subId: string, seats: number, prorationDate: number, quote: string): void {
  const issuedAt = Number(quote.split('.')[0]);
  const expected = quoteFor(firmId, subId, seats, prorationDate, issuedAt);
  const a = Buffer.from(quote);
  const b = Buffer.from(expected);
  if (!Number.isFinite(issuedAt) || a.length !== b.length || !timingSafeEqual(a, b)) {
    throw fieldError('quote', 'That price preview does not match this change. Preview the change again.');
  }
  if (Date.now() - issuedAt > QUOTE_MINUTES * 60_000) throw fieldError('quote', `The price preview is older than ${QUOTE_MINUTES} minutes. Preview the change again.`);
}


async function checkedChange(m: Member, seats: number): Promise<SubscriptionRow> {
  assertSeatRange(seats);
  const sub = await requireLiveSubscription(m.firmId);
  if (seats === sub.quantity) throw fieldError('seats', `You already pay for ${seatsWord(seats)}.`);
  if (seats < sub.quantity) assertCoversUsage(seats, await seatUsage(m.firmId), 'lower seats to');
  return sub;
}

export async function previewSeatChange(m: Member, seats: number): Promise<SeatPreview> {
  const sub = await checkedChange(m, seats);
  let preview: Stripe.Invoice;
  try {
    preview = await stripe().invoices.createPreview({
      customer: sub.customerId,
      subscription: sub.id,
      subscription_details: { items: [{ id: sub.itemId!, quantity: seats }], proration_behavior: 'always_invoice' },
    });
  } catch (err) {
    throw providerError(err, 'previewing the seat change');
  }
  const prorationDate = preview.parent?.subscription_details?.subscription_proration_date ?? preview.created;
  const lines = (preview.lines?.data ?? []).map((l) => ({ description: l.description ?? 'Proration', amount: l.amount }));
  return {
    seats,
    currentSeats: sub.quantity,
    currency: preview.currency,
    unitAmount: sub.unitAmount,
    dueNow: preview.amount_due,
    prorationTotal: preview.total,
    lines,
    periodEnd: sub.currentPeriodEnd,
    nextPeriodAmount: sub.unitAmount == null ? null : sub.unitAmount * seats,
    prorationDate,
    quote: quoteFor(m.firmId, sub.id, seats, prorationDate, Date.now()),
  };
}

/**
 * Changes the quantity with proration, invoiced and charged at once; a declined card leaves the seats unchanged.
 * The database follows when Stripe's webhook arrives (the one writer of subscription state).
 */
export async function changeSeats(m: Member, input: { seats: number; prorationDate?: number; quote?: string }): Promise<{ requestedSeats: number; previousSeats: number }> {
  const sub = await checkedChange(m, input.seats);
  const params: Stripe.SubscriptionUpdateParams = {
    items: [{ id: sub.itemId!, quantity: input.seats }],
    proration_behavior: 'always_invoice',
    payment_behavior: 'error_if_incomplete',
  };
  if (input.prorationDate !== undefined || input.quote !== undefined) {
    if (input.prorationDate === undefined || input.quote === undefined) throw fieldError('quote', 'Send both the proration date and the quote from the preview, or neither.');
    checkQuote(m.firmId, sub.id, input.seats, input.prorationDate, input.quote);
    params.proration_date = input.prorationDate;
  }
  try {
    await stripe().subscriptions.update(sub.id, params, { idempotencyKey: `stochos-seats-${sub.id}-${input.seats}-${input.quote ?? Date.now()}` });
  } catch (err) {
    throw providerError(err, 'changing the number of seats');
  }
  await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'billing.seats_change_requested', targetType: 'subscription', targetId: sub.id, detail: { from: sub.quantity, to: input.seats } });
  return { requestedSeats: input.seats, previousSeats: sub.quantity };
}

export async function setCancelAtPeriodEnd(m: Member, cancel: boolean): Promise<{ cancelAtPeriodEnd: boolean; periodEnd: string | null }> {
  const sub = await requireLiveSubscription(m.firmId);
  if (sub.cancelAtPeriodEnd === cancel) {
    throw conflict(cancel ? `The subscription already ends on ${sub.currentPeriodEnd?.slice(0, 10) ?? 'the period end'}.` : 'The subscription is not set to end; there is nothing to resume.');
  }
  try {
    await stripe().subscriptions.update(sub.id, { cancel_at_period_end: cancel });
  } catch (err) {
    throw providerError(err, cancel ? 'cancelling the subscription' : 'resuming the subscription');
  }
  await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: cancel ? 'billing.cancel_requested' : 'billing.resume_requested', targetType: 'subscription', targetId: sub.id, detail: { periodEnd: sub.currentPeriodEnd } });
  return { cancelAtPeriodEnd: cancel, periodEnd: sub.currentPeriodEnd };
}

// ---------- summary ----------



function invoiceView(i: InvoiceRow): InvoiceView {
  const status = i.status === 'open' && i.attemptCount > 0 ? 'failed' : (i.status as InvoiceView['status']);
  return {
    id: i.id,
    number: i.number,
    status,
    total: i.total,
    amountPaid: i.amountPaid,
    amountDue: i.amountDue,
    currency: i.currency,
    seats: i.seats,
    periodStart: i.periodStart,
    periodEnd: i.periodEnd,
    createdAt: i.stripeCreatedAt,
    hostedInvoiceUrl: i.hostedInvoiceUrl,
  };
}

export async function billingSummary(m: Member): Promise<BillingSummary> {
  const [status, usage, subs, invoices] = await Promise.all([billingStatus(m.firmId), seatUsage(m.firmId), listSubscriptions(m.firmId), listInvoices(m.firmId, 36)]);
  const current = currentSubscription(subs);
  const live = current && LIVE.has(current.status) ? current : null;
  const errors: string[] = [];
  let plan: Plan | null = null;
  try {
    plan = await seatPlan();
  } catch (err) {
    errors.push(err instanceof Error ? err.message : String(err));
  }
  let upcoming: BillingSummary['upcoming'] = null;
  if (live && !live.cancelAtPeriodEnd) {
    try {
      const next = await stripe().invoices.createPreview({ customer: live.customerId, subscription: live.id });
      const at = next.next_payment_attempt ?? next.period_end;
      upcoming = { date: at ? new Date(at * 1000).toISOString() : live.currentPeriodEnd, amount: next.amount_due, currency: next.currency };
    } catch (err) {
      errors.push(providerError(err, 'reading the next invoice').message);
    }
  }
  return {
    firmName: m.firmName,
    provider: usingFakeStripe() ? 'local fake' : 'stripe',
    status,
    plan: plan ? { name: plan.name, unitAmount: plan.unitAmount, currency: plan.currency, interval: plan.interval } : null,
    seats: { paid: status.seatsPaid, allowed: usage.allowed, used: usage.used, pendingInvitations: usage.pendingInvitations },
    subscription: current && current.status !== 'canceled' ? { id: current.id, status: current.status, quantity: current.quantity, currentPeriodEnd: current.currentPeriodEnd, cancelAtPeriodEnd: current.cancelAtPeriodEnd } : null,
    upcoming,
    invoices: invoices.map(invoiceView),
    providerError: errors.length ? errors.join(' ') : null,
    limits: { min: MIN_SEATS, max: MAX_SEATS },
  };
}
