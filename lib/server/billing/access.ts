import 'server-only';
import type { Knex } from 'knex';
import { getFirm } from '@/db/firms';
import { getBillingAccount, listSubscriptions } from '@/db/billing';
import { AppError } from '@/lib/server/http/errors';
import { DAY_MS, TRIAL_DAYS } from '@/lib/core/billing/plan';
import { day, deriveBillingStatus, type BillingStatus } from '@/lib/core/billing/status';

/** The firm's trial end: the stored one, or 14 days after the firm was created. */
export function defaultTrialEnd(firmCreatedAt: string): string {
  return new Date(Date.parse(firmCreatedAt) + TRIAL_DAYS * DAY_MS).toISOString();
}

/** Billing state from the database alone (no call to Stripe): safe for every page and every seat check. */
export async function billingStatus(firmId: string, trx?: Knex.Transaction): Promise<BillingStatus> {
  const firm = await getFirm(firmId, trx);
  if (!firm) throw new AppError('not_found', 'That firm was not found.');
  const account = await getBillingAccount(firmId, trx);
  const subscriptions = await listSubscriptions(firmId, trx);
  return deriveBillingStatus({ trialEndsAt: account?.trialEndsAt ?? defaultTrialEnd(firm.createdAt), subscriptions, now: Date.now() });
}

const KEEP_WORKING = 'Published widgets keep working, and everyone can still open and run models.';

/** Why authoring is blocked and what the owner must do, or null while it is allowed. */
export function authoringBlockedMessage(s: BillingStatus): string | null {
  if (s.authoring) return null;
  switch (s.kind) {
    case 'trial_ended':
      return `Models are read-only: the 14-day trial ended on ${day(s.trialEndsAt)}. The account owner can buy seats on the Billing page (/app/billing) to edit again. ${KEEP_WORKING}`;
    case 'suspended':
      return s.graceEndsAt
        ? `Models are read-only: payment has been overdue since ${day(s.pastDueSince)} and the 7-day grace period ended on ${day(s.graceEndsAt)}. The account owner can update the card on the Billing page (/app/billing); editing resumes once the invoice is paid. ${KEEP_WORKING}`
        : `Models are read-only: ${s.reason}. The account owner can settle it on the Billing page (/app/billing). ${KEEP_WORKING}`;
    case 'canceled':
      return `Models are read-only: the subscription ended on ${day(s.endedAt)}. The account owner can subscribe again on the Billing page (/app/billing). ${KEEP_WORKING}`;
    default:
      return `Models are read-only: ${s.reason}. The account owner can resolve it on the Billing page (/app/billing). ${KEEP_WORKING}`;
  }
}

/**
 * Call before any change to models, versions or templates. Throws 403 (forbidden) naming the reason and what the
 * owner must do when the trial has ended with no seats bought, when a payment is overdue beyond the grace period,
 * or when the subscription has ended. Published widgets and model runs are never blocked.
 */
export async function assertAuthoringAllowed(firmId: string, trx?: Knex.Transaction): Promise<void> {
  const message = authoringBlockedMessage(await billingStatus(firmId, trx));
  if (message) throw new AppError('forbidden', message);
}
