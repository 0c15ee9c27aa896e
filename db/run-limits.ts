import 'server-only';
import { getDb } from '@/db/knex';
import { newId } from '@/db/ids';

// Rate-limit counters and concurrent-run leases for server-side runs (lib/server/simulate/admission.ts decides).
// Every statement stands alone (no read-then-write transaction), so several app instances may share the table.

/** Adds one to each scope's counter for the window and returns the new counts, in the order given. */
export async function bumpRateCounters(scopes: string[], windowStart: string): Promise<number[]> {
  const db = getDb();
  const counts: number[] = [];
  for (const scope of scopes) {
    // An upsert is atomic on SQLite and PostgreSQL alike; RETURNING gives the count this request made.
    const rows = await db('run_rate_counters')
      .insert({ scope, window_start: windowStart, count: 1 })
      .onConflict(['scope', 'window_start'])
      .merge({ count: db.raw('?? + 1', ['run_rate_counters.count']) })
      .returning(['count']);
    counts.push(Number((rows[0] as { count: number | string }).count));
  }
  return counts;
}

export async function pruneRateCounters(beforeWindowStart: string): Promise<void> {
  await getDb()('run_rate_counters').where('window_start', '<', beforeWindowStart).delete();
}

/**
 * Inserts a lease, then counts the live leases of the firm and of the caller including it. Insert-then-count never
 * admits more than the cap, even when instances race: of any two leases, the one counted later sees the other.
 */
export async function takeLease(firmId: string, caller: string, nowIso: string, expiresAt: string): Promise<{ id: string; firmCount: number; callerCount: number }> {
  const db = getDb();
  const id = newId();
  await db('run_leases').insert({ id, firm_id: firmId, caller, created_at: nowIso, expires_at: expiresAt });
  const [firm, mine] = await Promise.all([
    db('run_leases').where('firm_id', firmId).andWhere('expires_at', '>', nowIso).count({ n: '*' }).first(),
    db('run_leases').where('firm_id', firmId).andWhere('caller', caller).andWhere('expires_at', '>', nowIso).count({ n: '*' }).first(),
  ]);
  return { id, firmCount: Number(firm?.n ?? 0), callerCount: Number(mine?.n ?? 0) };
}

export async function releaseLease(firmId: string, id: string): Promise<void> {
  await getDb()('run_leases').where({ firm_id: firmId, id }).delete();
}

/** Live leases of a firm (for tests and operators: zero when no run is in progress). */
export async function countLiveLeases(firmId: string, nowIso: string): Promise<number> {
  const r = await getDb()('run_leases').where('firm_id', firmId).andWhere('expires_at', '>', nowIso).count({ n: '*' }).first();
  return Number(r?.n ?? 0);
}

export async function pruneLeases(beforeIso: string): Promise<void> {
  await getDb()('run_leases').where('expires_at', '<', beforeIso).delete();
}
