import Link from 'next/link';
import type { Role } from '@/lib/core/api-types';
import type { BillingStatus } from '@/lib/core/billing/status';
import { Banner } from '@/components/ui/banner';
import { billingDate, statusSentence } from './status-words';

const TRIAL_WARNING_DAYS = 3;

/**
 * The billing notice across the dashboard. The layout reads the status (database only, no call to Stripe) and the
 * read-only message the server gives for it.
 * Owners see what needs doing (trial ending, payment overdue, read-only, ending subscription); authors and checkers
 * see no billing data, only that editing is paused when it is.
 */
export function BillingBanner({ status: s, blockedMessage, role }: { status: BillingStatus; blockedMessage: string | null; role: Role }) {
  if (role !== 'owner') {
    if (s.authoring) return null;
    return (
      <Banner tone="warn" title="Models are read-only for now">
        Editing is paused for this firm’s account. Everyone can still open and run models, and published widgets keep working. Ask the account owner: it is resolved on their Billing page.
      </Banner>
    );
  }
  const link = <Link href="/app/billing">Open Billing</Link>;
  switch (s.kind) {
    case 'past_due':
      return (
        <Banner tone="warn" title={`Payment failed: update the card by ${billingDate(s.graceEndsAt)}`}>
          {statusSentence(s)} {link}
        </Banner>
      );
    case 'suspended':
    case 'trial_ended':
    case 'canceled':
      return (
        <Banner tone="danger" title="Models are read-only">
          {blockedMessage?.replace(' on the Billing page (/app/billing)', '')} {link}
        </Banner>
      );
    case 'trial':
      return s.trialDaysLeft !== null && s.trialDaysLeft <= TRIAL_WARNING_DAYS ? (
        <Banner tone="info" title={`The free trial ends in ${s.trialDaysLeft} day${s.trialDaysLeft === 1 ? '' : 's'}`}>
          {statusSentence(s)} {link}
        </Banner>
      ) : null;
    case 'canceling':
      return (
        <Banner tone="info" title={`The subscription ends on ${billingDate(s.periodEnd)}`}>
          {statusSentence(s)} {link}
        </Banner>
      );
    default:
      return null;
  }
}
