import 'server-only';
import type { SeatUsage } from '@/lib/core/api-types';
import type { Knex } from 'knex';
import { countActiveByRole, countLiveInvitations } from '@/db/team';
import { getSeatAllowance } from '@/lib/server/team/seat-allowance';
import { AppError } from '@/lib/server/http/errors';

export type { SeatUsage };

/** Seats are authors and checkers; the owner and client viewers are free. */
export async function seatUsage(firmId: string, trx?: Knex.Transaction): Promise<SeatUsage> {
  const counts = await countActiveByRole(firmId, trx);
  const allowance = await getSeatAllowance(firmId, trx);
  return { allowed: allowance.seats, used: counts.author + counts.checker, pendingInvitations: await countLiveInvitations(firmId, trx), reason: allowance.reason };
}

export async function assertSeatAvailable(
  firmId: string,
  opts: { adding: number; countInvitations: boolean },
  trx: Knex.Transaction,
): Promise<void> {
  const u = await seatUsage(firmId, trx);
  const taken = u.used + (opts.countInvitations ? u.pendingInvitations : 0);
  if (taken + opts.adding > u.allowed) {
    const pending = opts.countInvitations && u.pendingInvitations ? ` and ${u.pendingInvitations} invitation${u.pendingInvitations === 1 ? '' : 's'} pending` : '';
    throw new AppError(
      'conflict',
      `All seats are taken: ${u.used} of ${u.allowed} in use${pending} (${u.reason}). The owner can add seats on the Billing page (/app/billing).`,
    );
  }
}
