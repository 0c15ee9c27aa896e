import 'server-only';
import { getDb } from '@/db/knex';
import { nowIso } from '@/db/ids';

// Failed sign-in attempts, keyed by account and by client address, for rate limiting.
export async function countRecentFailures(key: string, sinceIso: string): Promise<{ count: number; oldest: string | null }> {
  const r = await getDb()('sign_in_attempts').where('key', key).andWhere('at', '>', sinceIso).count({ n: '*' }).min({ oldest: 'at' }).first();
  return { count: Number(r?.n ?? 0), oldest: (r?.oldest as string | null) ?? null };
}

export async function recordFailure(keys: string[]): Promise<void> {
  const at = nowIso();
  await getDb()('sign_in_attempts').insert(keys.map((key) => ({ key, at })));
}

export async function clearFailures(key: string): Promise<void> {
  await getDb()('sign_in_attempts').where({ key }).delete();
}

export async function pruneAttempts(beforeIso: string): Promise<void> {
  await getDb()('sign_in_attempts').where('at', '<', beforeIso).delete();
}

// next-auth e-mail sign-in links: next-auth hashes the token before it reaches us.
export async function insertVerificationToken(identifier: string, tokenHash: string, expiresAt: string): Promise<void> {
  await getDb()('verification_tokens').insert({ identifier: identifier.toLowerCase(), token_hash: tokenHash, expires_at: expiresAt });
}

/** Deletes and returns the token in one step, so a link works exactly once. */
export async function consumeVerificationToken(identifier: string, tokenHash: string): Promise<{ identifier: string; expiresAt: string } | null> {
  return getDb().transaction(async (trx) => {
    const row = await trx('verification_tokens').select('identifier', 'expires_at').where({ identifier: identifier.toLowerCase(), token_hash: tokenHash }).first();
    if (!row) return null;
    // Only the request whose delete took the row may use it: two instances can read the same row at once.
    const n = await trx('verification_tokens').where({ identifier: identifier.toLowerCase(), token_hash: tokenHash }).delete();
    if (n !== 1) return null;
    return { identifier: row.identifier, expiresAt: row.expires_at };
  });
}
