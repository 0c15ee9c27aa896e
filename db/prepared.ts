import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';

// The hottest reads (the embed pass check on every widget read and pass exchange) select many columns over
// several joins; building that SQL with Knex, and having SQLite parse and plan it, costs more than running it.
// Such a query is built once per Knex instance with placeholder values; on SQLite its compiled statement is kept
// per connection (better-sqlite3 statements are reusable), elsewhere the same SQL text runs with new bindings.

const PARAM = '\u0000stochos-param:';

interface SqliteConnection {
  prepare(sql: string): { all(...bindings: unknown[]): Record<string, unknown>[] };
}
interface PoolClient {
  config: { client?: unknown };
  acquireConnection(): Promise<unknown>;
  releaseConnection(c: unknown): Promise<unknown>;
}

export function prepared<P extends string>(build: (db: Knex, param: (name: P) => string) => Knex.QueryBuilder): (params: Record<P, unknown>) => Promise<Record<string, unknown>[]> {
  const compiled = new WeakMap<Knex, { sql: string; bindings: readonly unknown[] }>();
  const statements = new WeakMap<object, ReturnType<SqliteConnection['prepare']>>();
  return async (params) => {
    const db = getDb();
    let c = compiled.get(db);
    if (!c) {
      const q = build(db, (name) => PARAM + name).toSQL();
      c = { sql: q.sql, bindings: q.bindings };
      compiled.set(db, c);
    }
    const bindings = c.bindings.map((b) => (typeof b === 'string' && b.startsWith(PARAM) ? params[b.slice(PARAM.length) as P] : b));
    const client = db.client as PoolClient;
    if (client.config.client === 'better-sqlite3') {
      const conn = (await client.acquireConnection()) as SqliteConnection & object;
      try {
        let st = statements.get(conn);
        if (!st) {
          st = conn.prepare(c.sql);
          statements.set(conn, st);
        }
        return st.all(...bindings);
      } finally {
        await client.releaseConnection(conn);
      }
    }
    const res = (await db.raw(c.sql, bindings as Knex.RawBinding[])) as { rows: Record<string, unknown>[] };
    return res.rows;
  };
}
