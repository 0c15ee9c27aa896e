import 'server-only';
import knexFactory, { type Knex } from 'knex';
import { knexConfig } from '@/knexfile';
import { databaseTarget } from '@/db/config';
import { advisoryLocks, isPostgres, isRetryableConflict } from '@/db/dialect';

// One Knex instance per process; kept on globalThis so dev hot reloads do not open new pools.
const g = globalThis as unknown as { __stochosDb?: { target: string; db: Knex } };

export { databaseTarget };

export function getDb(): Knex {
  const target = databaseTarget();
  if (g.__stochosDb && g.__stochosDb.target === target) return g.__stochosDb.db;
  const db = knexFactory(knexConfig(target));
  g.__stochosDb = { target, db };
  return db;
}

export async function closeDb(): Promise<void> {
  if (g.__stochosDb) {
    const { db } = g.__stochosDb;
    g.__stochosDb = undefined;
    await db.destroy();
  }
}

const MAX_ATTEMPTS = 20;

export interface WriteOptions {
  /**
   * Names of what this transaction decides about (a limit's key, a counter's row). On PostgreSQL the transaction
   * then runs READ COMMITTED holding a transaction-scoped advisory lock per name, instead of SERIALIZABLE: for hot
   * read-then-write paths (many requests checking the same limit at once) where serializable runs would keep
   * aborting each other. Every transaction that writes what the read decides about must name the same locks.
   * SQLite ignores this: its write lock already covers everything.
   */
  locks?: string[];
}

/**
 * Read-then-write transaction: runs as if no other write ran at the same time. Pass `trx` to every query inside.
 * - SQLite: BEGIN IMMEDIATE's effect (the single write lock, taken up front) by touching a tiny table first, so two
 *   requests cannot both read the same state and then write conflicting rows. Knex has one connection there.
 * - PostgreSQL: a SERIALIZABLE transaction (or, with `locks`, READ COMMITTED under advisory locks); when PostgreSQL
 *   aborts it for a conflicting concurrent write or a deadlock, `fn` runs again from the start, so it must only
 *   touch the database.
 */
export async function writeTransaction<T>(fn: (trx: Knex.Transaction) => Promise<T>, o: WriteOptions = {}): Promise<T> {
  const db = getDb();
  if (!isPostgres(db)) {
    return db.transaction(async (trx) => {
      // Knex already issued BEGIN; upgrade to a write lock by touching a tiny table.
      await trx.raw('UPDATE write_lock SET n = n + 1 WHERE id = 1');
      return fn(trx);
    });
  }
  const locks = o.locks?.length ? o.locks : null;
  for (let attempt = 1; ; attempt++) {
    try {
      if (!locks) return await db.transaction(fn, { isolationLevel: 'serializable' });
      return await db.transaction(async (trx) => {
        await advisoryLocks(trx, locks);
        return fn(trx);
      });
    } catch (err) {
      if (!isRetryableConflict(err) || attempt >= MAX_ATTEMPTS) throw err;
      // Back off a little, with jitter, so the same transactions do not collide again.
      await new Promise((r) => setTimeout(r, Math.min(250, 5 * 2 ** attempt) * (0.5 + pseudoJitter())));
    }
  }
}

// Not a product random draw: only spreads retries apart in time.
let jitterState = process.pid % 997;
function pseudoJitter(): number {
  jitterState = (jitterState * 7919 + 104_729) % 1_000_003;
  return jitterState / 1_000_003;
}
