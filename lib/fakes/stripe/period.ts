// Billing-period arithmetic. Monthly periods keep the anchor's day of month and clamp to the
// month's last day (31 Jan -> 28/29 Feb -> 31 Mar), counted from the billing cycle anchor so a
// short month does not drift the anchor. Proration follows the remaining fraction of the period,
// to the second.
import type Stripe from 'stripe';

type Interval = Stripe.Price.Recurring.Interval;

function addMonthsUtc(anchor: number, months: number): number {
  const d = new Date(anchor * 1000);
  const y = d.getUTCFullYear();
  const m = d.getUTCMonth() + months;
  const targetYear = y + Math.floor(m / 12);
  const targetMonth = ((m % 12) + 12) % 12;
  const lastDay = new Date(Date.UTC(targetYear, targetMonth + 1, 0)).getUTCDate();
  const day = Math.min(d.getUTCDate(), lastDay);
  return Date.UTC(targetYear, targetMonth, day, d.getUTCHours(), d.getUTCMinutes(), d.getUTCSeconds()) / 1000;
}

/** The k-th boundary after `anchor` for a recurring price (k = 0 is the anchor itself). */
export function boundary(anchor: number, interval: Interval, count: number, k: number): number {
  switch (interval) {
    case 'day':
      return anchor + k * count * 86_400;
    case 'week':
      return anchor + k * count * 7 * 86_400;
    case 'year':
      return addMonthsUtc(anchor, 12 * count * k);
    default:
      return addMonthsUtc(anchor, count * k);
  }
}

/** The boundary that follows `current` (itself a boundary of the same anchor). */
export function nextBoundary(anchor: number, interval: Interval, count: number, current: number): number {
  let k = 0;
  while (boundary(anchor, interval, count, k) <= current) k += 1;
  return boundary(anchor, interval, count, k);
}

/**
 * Prorated amount for `quantity` units at `unitAmount` over the part of [start, end) after `at`.
 * Each proration line is rounded on its own, half away from zero, to the currency's minor unit,
 * so "unused time" and "remaining time" lines can differ by one minor unit from rounding their
 * difference (Stripe rounds per line item as well; from memory).
 */
export function prorate(unitAmount: number, quantity: number, start: number, end: number, at: number): number {
  const span = end - start;
  if (span <= 0) return 0;
  const fraction = Math.min(1, Math.max(0, (end - at) / span));
  const exact = unitAmount * quantity * fraction;
  return Math.sign(exact) * Math.round(Math.abs(exact));
}
