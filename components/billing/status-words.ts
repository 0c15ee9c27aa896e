// Plain sentences for each billing state, shared by the billing page (client) and the banner (server).
import type { BillingStatus } from '@/lib/core/billing/status';
import type { StatusKind } from '@/components/ui/badge';

const date = (iso: string | null) =>
  iso ? new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' }).format(new Date(iso)) : 'an unknown date';

export const STATUS_LABEL: Record<BillingStatus['kind'], string> = {
  trial: 'Trial',
  trial_ended: 'Trial ended',
  active: 'Active',
  canceling: 'Ends at period end',
  past_due: 'Payment overdue',
  suspended: 'Read-only: payment overdue',
  canceled: 'Ended',
};

export const STATUS_PILL: Record<BillingStatus['kind'], StatusKind> = {
  trial: 'info',
  trial_ended: 'stopped',
  active: 'ok',
  canceling: 'waiting',
  past_due: 'warn',
  suspended: 'warn',
  canceled: 'stopped',
};

/** One or two sentences: what the state means now and what the owner can do. */
export function statusSentence(s: BillingStatus): string {
  switch (s.kind) {
    case 'trial':
      return `${s.trialDaysLeft} day${s.trialDaysLeft === 1 ? '' : 's'} of the free trial left (until ${date(s.trialEndsAt)}), with ${s.seats} seats included. Buy seats to keep working after the trial.`;
    case 'trial_ended':
      return `The free trial ended on ${date(s.trialEndsAt)}. Models are read-only and no one new can join until you buy seats; published widgets keep working.`;
    case 'active':
      return `Renews on ${date(s.periodEnd)}.`;
    case 'canceling':
      return `Cancelled: the subscription ends on ${date(s.periodEnd)}. Everything keeps working until then; you can resume it before that date.`;
    case 'past_due':
      return `The last payment failed. Everything keeps working until ${date(s.graceEndsAt)} (7-day grace period); after that models become read-only. Update the card under “Manage in portal”.`;
    case 'suspended':
      return s.graceEndsAt
        ? `Payment has been overdue since ${date(s.pastDueSince)} and the grace period ended on ${date(s.graceEndsAt)}. Models are read-only until the invoice is paid; update the card under “Manage in portal”. Published widgets keep working.`
        : `Models are read-only: ${s.reason}. Settle it under “Manage in portal”.`;
    case 'canceled':
      return `The subscription ended on ${date(s.endedAt)}. Models are read-only; buy seats to subscribe again. Published widgets keep working.`;
  }
}

export { date as billingDate };
