import 'server-only';
import { countRecentFailures, recordFailure, clearFailures } from '@/db/sign-in';
import { AppError } from '@/lib/server/http/errors';

// Failed sign-ins: 5 per account and 20 per client address within 15 minutes (common practice, no source).
const WINDOW_MS = 15 * 60_000;
const LIMITS = { account: 5, address: 20 } as const;

const keys = (email: string, address: string) => ({
  account: `account:${email.toLowerCase()}`,
  address: `address:${address}`,
});

export async function assertSignInAllowed(email: string, address: string): Promise<void> {
  const since = new Date(Date.now() - WINDOW_MS).toISOString();
  const k = keys(email, address);
  for (const kind of ['account', 'address'] as const) {
    const { count, oldest } = await countRecentFailures(k[kind], since);
    if (count >= LIMITS[kind]) {
      const retryAfter = oldest ? Math.max(60, Math.ceil((Date.parse(oldest) + WINDOW_MS - Date.now()) / 1000)) : WINDOW_MS / 1000;
      const minutes = Math.ceil(retryAfter / 60);
      const who = kind === 'account' ? 'this account' : 'your network address';
      throw new AppError('rate_limited', `Too many failed sign-ins for ${who}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}, or use a sign-in link.`, { retryAfter });
    }
  }
}

export async function noteSignInFailure(email: string, address: string): Promise<void> {
  const k = keys(email, address);
  await recordFailure([k.account, k.address]);
}

export async function noteSignInSuccess(email: string): Promise<void> {
  await clearFailures(keys(email, '').account);
}
