import 'server-only';
import { writeTransaction } from '@/db/knex';
import { getFirm } from '@/db/firms';
import { ensureBillingAccount } from '@/db/billing';
import { defaultTrialEnd } from '@/lib/server/billing/access';

/**
 * The demo firm starts where every new firm starts: on the 14-day trial with 3 seats (its 2 authors and 1 checker
 * fill them), no Stripe customer yet. The demo's billing story (buy, grow, fail, recover, cancel) begins from the
 * Billing page against the local fake Stripe, which starts empty.
 */
export async function seedDemoBilling(firmId: string): Promise<void> {
  const firm = await getFirm(firmId);
  if (!firm) throw new Error(`seedDemoBilling: no firm ${firmId}`);
  await writeTransaction((trx) => ensureBillingAccount(firmId, defaultTrialEnd(firm.createdAt), trx));
}
