import 'server-only';
import type { Knex } from 'knex';
import { billingStatus } from '@/lib/server/billing/access';
import { AppError } from '@/lib/server/http/errors';

export { TRIAL_DAYS, TRIAL_SEATS } from '@/lib/core/billing/plan';

/**
 * How many author and checker seats the firm may use now: 3 during the 14-day trial; once subscribed, the paid
 * quantity while active, while past due within the 7-day grace period and, when cancelled, until the period ends.
 */
export async function getSeatAllowance(firmId: string, trx?: Knex.Transaction): Promise<{ seats: number; reason: string }> {
  try {
    const s = await billingStatus(firmId, trx);
    return { seats: s.seats, reason: s.reason };
  } catch (err) {
    if (err instanceof AppError && err.code === 'not_found') return { seats: 0, reason: 'unknown firm' };
    throw err;
  }
}
