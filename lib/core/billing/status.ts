// What a firm may do now, derived from its trial date and its subscriptions as the webhooks reported them.
// Pure: the same rows and the same clock give the same answer (the tests drive the clock).
import { DAY_MS, GRACE_DAYS, TRIAL_SEATS } from './plan';

export type BillingKind = 'trial' | 'trial_ended' | 'active' | 'canceling' | 'past_due' | 'suspended' | 'canceled';

export interface SubscriptionFacts {
  id: string;
  status: string;
  quantity: number;
  currentPeriodEnd: string | null;
  cancelAtPeriodEnd: boolean;
  canceledAt: string | null;
  endedAt: string | null;
  pastDueSince: string | null;
  stripeCreatedAt: string;
}

export interface BillingStatus {
  kind: BillingKind;
  /** Author and checker seats the firm may fill now. */
  seats: number;
  /** Seats on the subscription (what is paid for), whether or not they count now. */
  seatsPaid: number | null;
  /** Whether models may be edited; published widgets work in every state. */
  authoring: boolean;
  /** Short reason, shown in brackets after seat counts. */
  reason: string;
  subscriptionId: string | null;
  trialEndsAt: string;
  trialDaysLeft: number | null;
  periodEnd: string | null;
  graceEndsAt: string | null;
  pastDueSince: string | null;
  endedAt: string | null;
}

/** Statuses in which Stripe still bills the subscription. */
const LIVE = new Set(['active', 'trialing', 'past_due', 'unpaid', 'paused']);

export const day = (iso: string | null): string => (iso ? iso.slice(0, 10) : '—');

/** The subscription that decides: the newest live one, else the newest ended one. Incomplete checkouts never count. */
export function currentSubscription<T extends SubscriptionFacts>(subs: readonly T[]): T | null {
  const newestFirst = [...subs].sort((a, b) => b.stripeCreatedAt.localeCompare(a.stripeCreatedAt));
  return newestFirst.find((s) => LIVE.has(s.status)) ?? newestFirst.find((s) => s.status === 'canceled') ?? null;
}

export function deriveBillingStatus(input: { trialEndsAt: string; subscriptions: readonly SubscriptionFacts[]; now: number }): BillingStatus {
  const { trialEndsAt, now } = input;
  const sub = currentSubscription(input.subscriptions);
  const base = {
    subscriptionId: sub?.id ?? null,
    seatsPaid: sub && sub.status !== 'canceled' ? sub.quantity : null,
    trialEndsAt,
    trialDaysLeft: null as number | null,
    periodEnd: sub?.currentPeriodEnd ?? null,
    graceEndsAt: null as string | null,
    pastDueSince: null as string | null,
    endedAt: null as string | null,
  };

  if (!sub) {
    const end = Date.parse(trialEndsAt);
    if (now < end) {
      return { ...base, kind: 'trial', seats: TRIAL_SEATS, authoring: true, reason: `trial until ${day(trialEndsAt)}`, trialDaysLeft: Math.max(1, Math.ceil((end - now) / DAY_MS)) };
    }
    return { ...base, kind: 'trial_ended', seats: 0, authoring: false, reason: `the trial ended on ${day(trialEndsAt)} and no seats are paid` };
  }

  const periodEnd = sub.currentPeriodEnd ? Date.parse(sub.currentPeriodEnd) : null;
  const endedByPeriod = sub.cancelAtPeriodEnd && periodEnd !== null && now >= periodEnd;
  if (sub.status === 'canceled' || endedByPeriod) {
    const endedAt = sub.endedAt ?? (endedByPeriod ? sub.currentPeriodEnd : sub.canceledAt);
    return { ...base, kind: 'canceled', seats: 0, seatsPaid: null, authoring: false, reason: `the subscription ended on ${day(endedAt)}`, endedAt };
  }

  if (sub.status === 'past_due') {
    const since = sub.pastDueSince ?? new Date(now).toISOString();
    const graceEnd = Date.parse(since) + GRACE_DAYS * DAY_MS;
    const graceEndsAt = new Date(graceEnd).toISOString();
    if (now < graceEnd) {
      return { ...base, kind: 'past_due', seats: sub.quantity, authoring: true, reason: `${seatsWord(sub.quantity)} paid; payment overdue, grace until ${day(graceEndsAt)}`, graceEndsAt, pastDueSince: since };
    }
    return { ...base, kind: 'suspended', seats: 0, authoring: false, reason: `payment overdue since ${day(since)}; the grace period ended on ${day(graceEndsAt)}`, graceEndsAt, pastDueSince: since };
  }

  if (sub.status === 'unpaid' || sub.status === 'paused') {
    return { ...base, kind: 'suspended', seats: 0, authoring: false, reason: sub.status === 'unpaid' ? 'the subscription is unpaid' : 'the subscription is paused', pastDueSince: sub.pastDueSince };
  }

  if (sub.cancelAtPeriodEnd) {
    return { ...base, kind: 'canceling', seats: sub.quantity, authoring: true, reason: `${seatsWord(sub.quantity)} paid until ${day(sub.currentPeriodEnd)}, when the subscription ends` };
  }
  return { ...base, kind: 'active', seats: sub.quantity, authoring: true, reason: `${seatsWord(sub.quantity)} paid` };
}

export const seatsWord = (n: number): string => `${n} seat${n === 1 ? '' : 's'}`;
