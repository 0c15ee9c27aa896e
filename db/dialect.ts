import type { Knex } from 'knex';

// The one place that knows SQLite from PostgreSQL. Migrations, queries and the transaction helper ask here
// instead of writing either dialect's SQL themselves. No 'server-only' import: migrations load this too.

export type DbKind = 'sqlite' | 'postgres';

/** A `DATABASE_URL` names PostgreSQL; anything else is a SQLite file. */
export const isPostgresUrl = (target: string): boolean => /^postgres(ql)?:\/\//i.test(target);

export function dbKind(knex: Knex | Knex.Transaction): DbKind {
  const client = (knex.client as { config: { client?: unknown } }).config.client;
  return client === 'pg' || client === 'postgres' || client === 'postgresql' ? 'postgres' : 'sqlite';
}

export const isPostgres = (knex: Knex | Knex.Transaction): boolean => dbKind(knex) === 'postgres';

// ---------- migrations ----------

/**
 * Restricts a column to a list of values: a CHECK constraint on PostgreSQL; on SQLite the BEFORE INSERT trigger
 * (and, with `onUpdate`, a BEFORE UPDATE OF trigger) the first migrations shipped, so existing files stay as they are.
 */
export async function restrictValues(
  knex: Knex,
  o: { table: string; column: string; values: readonly string[]; name: string; message: string; onUpdate?: string },
): Promise<void> {
  const list = o.values.map((v) => `'${v.replace(/'/g, "''")}'`).join(',');
  if (isPostgres(knex)) {
    await knex.raw(`ALTER TABLE ?? ADD CONSTRAINT ?? CHECK (?? IN (${list}))`, [o.table, o.name, o.column]);
    return;
  }
  await knex.raw(`CREATE TRIGGER ${o.name} BEFORE INSERT ON ${o.table}
    WHEN NEW.${o.column} NOT IN (${list}) BEGIN SELECT RAISE(ABORT, '${o.message}'); END`);
  if (o.onUpdate) {
    await knex.raw(`CREATE TRIGGER ${o.onUpdate} BEFORE UPDATE OF ${o.column} ON ${o.table}
    WHEN NEW.${o.column} NOT IN (${list}) BEGIN SELECT RAISE(ABORT, '${o.message}'); END`);
  }
}

/**
 * Refuses an UPDATE when `when` holds. `when` is written once with NEW./OLD. and SQLite's null-safe `IS NOT`
 * (`a IS NOT b`, never `IS NOT NULL` in that role); on PostgreSQL that becomes `IS DISTINCT FROM` inside a
 * PL/pgSQL trigger function of the same name.
 */
export async function refuseUpdate(knex: Knex, o: { table: string; name: string; when: string; message: string }): Promise<void> {
  if (isPostgres(knex)) {
    const when = o.when.replace(/\bIS NOT (?!NULL\b)/g, 'IS DISTINCT FROM ');
    await knex.raw(`CREATE FUNCTION ${o.name}() RETURNS trigger LANGUAGE plpgsql AS $fn$
BEGIN
  IF ${when} THEN RAISE EXCEPTION '${o.message}'; END IF;
  RETURN NEW;
END
$fn$`);
    await knex.raw(`CREATE TRIGGER ${o.name} BEFORE UPDATE ON ${o.table} FOR EACH ROW EXECUTE FUNCTION ${o.name}()`);
    return;
  }
  await knex.raw(`CREATE TRIGGER ${o.name} BEFORE UPDATE ON ${o.table}
    WHEN ${o.when}
    BEGIN SELECT RAISE(ABORT, '${o.message}'); END`);
}

/** Drops what `restrictValues` or `refuseUpdate` made (PostgreSQL names the table a trigger or constraint is on). */
export async function dropGuard(knex: Knex, table: string, name: string): Promise<void> {
  if (isPostgres(knex)) {
    if (!(await knex.schema.hasTable(table))) return;
    await knex.raw('ALTER TABLE ?? DROP CONSTRAINT IF EXISTS ??', [table, name]);
    await knex.raw('DROP TRIGGER IF EXISTS ?? ON ??', [name, table]);
    await knex.raw(`DROP FUNCTION IF EXISTS ${name}()`);
    return;
  }
  await knex.raw(`DROP TRIGGER IF EXISTS ${name}`);
}

// ---------- queries ----------

/** The UTC calendar day (YYYY-MM-DD) of a timestamp column. SQLite stores ISO strings; PostgreSQL timestamptz. */
export function utcDay(knex: Knex | Knex.Transaction, column: string): Knex.Raw {
  return isPostgres(knex) ? knex.raw(`to_char(?? AT TIME ZONE 'UTC', 'YYYY-MM-DD')`, [column]) : knex.raw('substr(??, 1, 10)', [column]);
}

/**
 * Locks the rows a read-then-write reads. SQLite needs nothing here: `writeTransaction` already holds the
 * database's single write lock. On PostgreSQL the rows stay locked until the transaction ends.
 */
export function forUpdate<Q extends Knex.QueryBuilder>(trx: Knex.Transaction, q: Q): Q {
  return (isPostgres(trx) ? q.forUpdate() : q) as Q;
}

/**
 * A job queue's claim: on PostgreSQL, locks the rows read and skips rows another transaction holds, so any number of
 * workers take different jobs at once (FOR UPDATE SKIP LOCKED). SQLite serialises claims with its write lock instead.
 */
export function forUpdateSkipLocked<Q extends Knex.QueryBuilder>(trx: Knex.Transaction, q: Q): Q {
  return (isPostgres(trx) ? q.forUpdate().skipLocked() : q) as Q;
}

/**
 * Adds `by` to the counter row named by `key` (creating it at `by`) in one statement, and returns the new value.
 * `key` must be the table's primary key or a unique index. Safe under concurrency on both databases: ON CONFLICT …
 * DO UPDATE … RETURNING is the same SQL in SQLite (3.35+) and PostgreSQL. For counters shared by every instance.
 */
export async function bumpCounter(
  db: Knex | Knex.Transaction,
  table: string,
  key: Record<string, string | number>,
  o: { column?: string; by?: number; set?: Record<string, unknown> } = {},
): Promise<number> {
  const column = o.column ?? 'n';
  const by = o.by ?? 1;
  const rows = (await db(table)
    .insert({ ...key, ...o.set, [column]: by })
    .onConflict(Object.keys(key))
    .merge({ ...o.set, [column]: db.raw('??.?? + ?', [table, column, by]) })
    .returning(column)) as Record<string, unknown>[];
  return Number(rows[0]?.[column]);
}

/**
 * PostgreSQL: takes a transaction-scoped advisory lock per name (in sorted order, so two transactions naming the
 * same locks cannot deadlock); released at COMMIT or ROLLBACK. SQLite: nothing (its write lock covers everything).
 */
export async function advisoryLocks(trx: Knex.Transaction, names: string[]): Promise<void> {
  if (!isPostgres(trx)) return;
  for (const name of [...new Set(names)].sort()) await trx.raw('SELECT pg_advisory_xact_lock(hashtextextended(?, 0))', [name]);
}

/** A count or sum as a number: PostgreSQL returns bigint and numeric aggregates as strings. */
export const toCount = (v: unknown): number => (v == null ? 0 : Number(v));

/** PostgreSQL's error codes for a transaction that lost a race and may simply be run again. */
export function isRetryableConflict(err: unknown): boolean {
  const code = (err as { code?: unknown } | null)?.code;
  return code === '40001' || code === '40P01';
}
