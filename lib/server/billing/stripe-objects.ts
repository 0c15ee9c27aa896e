// Reads the fields Stochos keeps from Stripe objects of the pinned API version: billing periods live on the
// subscription item, an invoice names its subscription under parent.subscription_details.
import type Stripe from 'stripe';
import type { InvoiceRow, SubscriptionRow } from '@/db/billing';

const iso = (seconds: number | null | undefined): string | null => (seconds == null ? null : new Date(seconds * 1000).toISOString());
const idOf = (v: string | { id: string } | null | undefined): string | null => (v == null ? null : typeof v === 'string' ? v : v.id);

/** A subscription as Stripe sends it, in the shape of the stored row (less what only the app tracks). */
export type SubscriptionFields = Omit<SubscriptionRow, 'firmId' | 'pastDueSince' | 'lastEventCreated' | 'lastEventType'> & { firmIdInMetadata: string | null };

export function subscriptionFields(sub: Stripe.Subscription): SubscriptionFields {
  const item = sub.items.data[0];
  return {
    id: sub.id,
    customerId: idOf(sub.customer) ?? '',
    status: sub.status,
    itemId: item?.id ?? null,
    priceId: item?.price?.id ?? null,
    unitAmount: item?.price?.unit_amount ?? null,
    currency: sub.currency ?? item?.price?.currency ?? null,
    interval: item?.price?.recurring?.interval ?? null,
    quantity: item?.quantity ?? 0,
    currentPeriodStart: iso(item?.current_period_start),
    currentPeriodEnd: iso(item?.current_period_end),
    cancelAtPeriodEnd: Boolean(sub.cancel_at_period_end || (sub.cancel_at && item && sub.cancel_at <= item.current_period_end)),
    canceledAt: iso(sub.canceled_at),
    endedAt: iso(sub.ended_at),
    stripeCreatedAt: iso(sub.created)!,
    firmIdInMetadata: sub.metadata?.firm_id ?? null,
  };
}

/** An invoice as Stripe sends it, in the shape of the stored row (less what only the app tracks). */
export type InvoiceFields = Omit<InvoiceRow, 'firmId' | 'lastEventCreated'> & { customerId: string };

/**
 * Seats and period an invoice bills: the regular (non-proration) line if there is one, else the proration line
 * that charges for the new quantity.
 */
function billedLine(inv: Stripe.Invoice): Stripe.InvoiceLineItem | null {
  const lines = inv.lines?.data ?? [];
  const isProration = (l: Stripe.InvoiceLineItem) => Boolean(l.parent?.subscription_item_details?.proration ?? l.parent?.invoice_item_details?.proration);
  return lines.find((l) => !isProration(l)) ?? [...lines].reverse().find((l) => l.amount > 0) ?? lines[0] ?? null;
}

export function invoiceFields(inv: Stripe.Invoice): InvoiceFields {
  const line = billedLine(inv);
  return {
    id: inv.id ?? '',
    customerId: idOf(inv.customer) ?? '',
    subscriptionId: idOf(inv.parent?.subscription_details?.subscription ?? null),
    number: inv.number ?? null,
    status: inv.status ?? 'draft',
    billingReason: inv.billing_reason ?? null,
    total: inv.total,
    amountDue: inv.amount_due,
    amountPaid: inv.amount_paid,
    currency: inv.currency,
    seats: line?.quantity ?? null,
    periodStart: iso(line?.period?.start ?? inv.period_start),
    periodEnd: iso(line?.period?.end ?? inv.period_end),
    hostedInvoiceUrl: inv.hosted_invoice_url ?? null,
    attemptCount: inv.attempt_count ?? 0,
    stripeCreatedAt: iso(inv.created)!,
  };
}

export function checkoutFields(s: Stripe.Checkout.Session): { id: string; customerId: string | null; subscriptionId: string | null; firmId: string | null; mode: string } {
  return {
    id: s.id,
    customerId: idOf(s.customer),
    subscriptionId: idOf(s.subscription),
    firmId: s.metadata?.firm_id ?? s.client_reference_id ?? null,
    mode: s.mode,
  };
}
