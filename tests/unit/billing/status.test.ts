import { describe, expect, it } from 'vitest';
import { currentSubscription, deriveBillingStatus, type SubscriptionFacts } from '@/lib/core/billing/status';
import { authoringBlockedMessage } from '@/lib/server/billing/access';

const DAY = 86_400_000;
const NOW = Date.parse('2027-03-10T12:00:00.000Z');
const iso = (ms: number) => new Date(ms).toISOString();

function sub(o: Partial<SubscriptionFacts> & { status: string }): SubscriptionFacts {
  return {
    id: 'sub_1',
    quantity: 4,
    currentPeriodEnd: iso(NOW + 20 * DAY),
    cancelAtPeriodEnd: false,
    canceledAt: null,
    endedAt: null,
    pastDueSince: null,
    stripeCreatedAt: iso(NOW - 40 * DAY),
    ...o,
  };
}

describe('billing status', () => {
  it('gives a new firm 3 seats for the 14-day trial, counting the days left', () => {
    const s = deriveBillingStatus({ trialEndsAt: iso(NOW + 13.5 * DAY), subscriptions: [], now: NOW });
    expect(s).toMatchObject({ kind: 'trial', seats: 3, authoring: true, trialDaysLeft: 14, seatsPaid: null });
    expect(s.reason).toBe('trial until 2027-03-24');
  });

  it('after the trial with nothing bought: no seats and read-only authoring', () => {
    const s = deriveBillingStatus({ trialEndsAt: iso(NOW - DAY), subscriptions: [], now: NOW });
    expect(s).toMatchObject({ kind: 'trial_ended', seats: 0, authoring: false });
    expect(authoringBlockedMessage(s)).toMatch(/trial ended on 2027-03-09.*Billing page \(\/app\/billing\).*widgets keep working/);
  });

  it('an active subscription gives its paid quantity, even during the trial window', () => {
    const s = deriveBillingStatus({ trialEndsAt: iso(NOW + 5 * DAY), subscriptions: [sub({ status: 'active', quantity: 7 })], now: NOW });
    expect(s).toMatchObject({ kind: 'active', seats: 7, seatsPaid: 7, authoring: true, reason: '7 seats paid' });
    expect(authoringBlockedMessage(s)).toBeNull();
  });

  it('past due keeps the seats and authoring for 7 days, then suspends both', () => {
    const since = NOW - 6 * DAY;
    const within = deriveBillingStatus({ trialEndsAt: iso(NOW - 60 * DAY), subscriptions: [sub({ status: 'past_due', pastDueSince: iso(since) })], now: NOW });
    expect(within).toMatchObject({ kind: 'past_due', seats: 4, authoring: true, graceEndsAt: iso(since + 7 * DAY) });

    const after = deriveBillingStatus({ trialEndsAt: iso(NOW - 60 * DAY), subscriptions: [sub({ status: 'past_due', pastDueSince: iso(NOW - 7 * DAY - 1000) })], now: NOW });
    expect(after).toMatchObject({ kind: 'suspended', seats: 0, authoring: false });
    expect(authoringBlockedMessage(after)).toMatch(/overdue since 2027-03-03.*grace period ended on 2027-03-10.*update the card/);
  });

  it('the grace period starts exactly 7 × 24 h after the payment became overdue (boundary)', () => {
    const since = NOW - 7 * DAY;
    const s = deriveBillingStatus({ trialEndsAt: iso(0), subscriptions: [sub({ status: 'past_due', pastDueSince: iso(since) })], now: NOW - 1 });
    expect(s.kind).toBe('past_due');
    expect(deriveBillingStatus({ trialEndsAt: iso(0), subscriptions: [sub({ status: 'past_due', pastDueSince: iso(since) })], now: NOW }).kind).toBe('suspended');
  });

  it('cancelled at period end keeps working until the period ends, then counts as cancelled', () => {
    const end = NOW + 3 * DAY;
    const before = deriveBillingStatus({ trialEndsAt: iso(0), subscriptions: [sub({ status: 'active', cancelAtPeriodEnd: true, currentPeriodEnd: iso(end) })], now: NOW });
    expect(before).toMatchObject({ kind: 'canceling', seats: 4, authoring: true });
    expect(before.reason).toBe('4 seats paid until 2027-03-13, when the subscription ends');
    const afterEnd = deriveBillingStatus({ trialEndsAt: iso(0), subscriptions: [sub({ status: 'active', cancelAtPeriodEnd: true, currentPeriodEnd: iso(end) })], now: end });
    expect(afterEnd).toMatchObject({ kind: 'canceled', seats: 0, authoring: false, endedAt: iso(end) });
  });

  it('a cancelled subscription leaves no seats, even inside the original trial window', () => {
    const s = deriveBillingStatus({ trialEndsAt: iso(NOW + 10 * DAY), subscriptions: [sub({ status: 'canceled', endedAt: iso(NOW - DAY) })], now: NOW });
    expect(s).toMatchObject({ kind: 'canceled', seats: 0, authoring: false, seatsPaid: null });
    expect(authoringBlockedMessage(s)).toMatch(/subscription ended on 2027-03-09.*subscribe again/);
  });

  it('unpaid and paused subscriptions are suspended', () => {
    for (const status of ['unpaid', 'paused']) {
      const s = deriveBillingStatus({ trialEndsAt: iso(0), subscriptions: [sub({ status })], now: NOW });
      expect(s).toMatchObject({ kind: 'suspended', seats: 0, authoring: false });
    }
  });

  it('incomplete checkouts do not count: the trial still applies', () => {
    const s = deriveBillingStatus({ trialEndsAt: iso(NOW + DAY), subscriptions: [sub({ status: 'incomplete' }), sub({ id: 'sub_2', status: 'incomplete_expired' })], now: NOW });
    expect(s.kind).toBe('trial');
  });

  it('a live subscription wins over an older cancelled one, and the newest live one decides', () => {
    const old = sub({ id: 'sub_old', status: 'canceled', stripeCreatedAt: iso(NOW - 90 * DAY) });
    const live = sub({ id: 'sub_new', status: 'active', quantity: 2, stripeCreatedAt: iso(NOW - 10 * DAY) });
    expect(currentSubscription([old, live])?.id).toBe('sub_new');
    const newerCanceled = sub({ id: 'sub_newer', status: 'canceled', stripeCreatedAt: iso(NOW - DAY) });
    expect(currentSubscription([old, live, newerCanceled])?.id).toBe('sub_new');
    expect(currentSubscription([old, newerCanceled])?.id).toBe('sub_newer');
  });
});
