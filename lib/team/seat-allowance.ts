import 'server-only';
import type { Knex } from 'knex';
import { getFirm } from '@/db/firms';

export const TRIAL_DAYS = 14;
export const TRIAL_SEATS = 3;

/**
 * How many seats the firm may use now. A new firm has a 14-day trial with 3 seats;
 * paid subscriptions (billing) extend this.
 */
export async function getSeatAllowance(firmId: string, trx?: Knex.Transaction): Promise<{ seats: number; reason: string }> {
  const firm = await getFirm(firmId, trx);
  if (!firm) return { seats: 0, reason: 'unknown firm' };
  const trialEnds = Date.parse(firm.createdAt) + TRIAL_DAYS * 86_400_000;
  if (Date.now() < trialEnds) return { seats: TRIAL_SEATS, reason: `trial until ${new Date(trialEnds).toISOString().slice(0, 10)}` };
  return { seats: 0, reason: 'the trial has ended and no seats are paid' };
}
