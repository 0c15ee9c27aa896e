import 'server-only';
import knexFactory, { type Knex } from 'knex';
import { knexConfig } from '@/knexfile';
import { env } from '@/lib/env';

// One Knex instance per process; kept on globalThis so dev hot reloads do not open new pools.
const g = globalThis as unknown as { __stochosDb?: { file: string; db: Knex } };

export function getDb(): Knex {
  const file = env().DATABASE_FILE;
  if (g.__stochosDb && g.__stochosDb.file === file) return g.__stochosDb.db;
  const db = knexFactory(knexConfig(file));
  g.__stochosDb = { file, db };
  return db;
}

export async function closeDb(): Promise<void> {
  if (g.__stochosDb) {
    await g.__stochosDb.db.destroy();
    g.__stochosDb = undefined;
  }
}

/**
 * Read-then-write transaction. SQLite's BEGIN IMMEDIATE takes the write lock up front so two requests cannot
 * both read the same state and then write conflicting rows. Knex has one connection: pass `trx` to every query.
 */
export async function writeTransaction<T>(fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return getDb().transaction(async (trx) => {
    // Knex already issued BEGIN; upgrade to a write lock by touching a tiny table.
    await trx.raw('UPDATE write_lock SET n = n + 1 WHERE id = 1');
    return fn(trx);
  });
}
