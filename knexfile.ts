import type { Knex } from 'knex';
import path from 'node:path';
import fs from 'node:fs';
import pg from 'pg';
import { isPostgresUrl } from './db/dialect';

const migrations = { directory: path.resolve(process.cwd(), 'migrations'), loadExtensions: ['.ts', '.js'] };

// Shared by the app (db/knex.ts), the CLI (db/cli.ts) and the tests. `target` is a SQLite file path or a
// postgres:// URL (DATABASE_URL), which switches Knex to the pg driver.
export function knexConfig(target: string): Knex.Config {
  if (isPostgresUrl(target)) return postgresConfig(target);
  if (target !== ':memory:') fs.mkdirSync(path.dirname(path.resolve(target)), { recursive: true });
  return {
    client: 'better-sqlite3',
    connection: { filename: target },
    useNullAsDefault: true,
    migrations,
    pool: {
      min: 1,
      max: 1,
      afterCreate(conn: { pragma: (s: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
        // Per-connection pragmas: WAL for concurrent readers, enforced foreign keys, wait on locks.
        conn.pragma('journal_mode = WAL');
        conn.pragma('foreign_keys = ON');
        conn.pragma('busy_timeout = 5000');
        conn.pragma('synchronous = NORMAL');
        done(null, conn);
      },
    },
  };
}

// Values come back as they do from SQLite: times as ISO strings, counts and sums as numbers.
const TIMESTAMPTZ = 1184;
const TIMESTAMP = 1114;
const INT8 = 20;
const NUMERIC = 1700;
const parseDate = pg.types.getTypeParser(TIMESTAMPTZ) as (s: string) => Date;
const iso = (s: string): string => {
  const d = parseDate(s);
  return Number.isNaN(d.getTime()) ? s : d.toISOString();
};
export const pgTypeParsers = {
  getTypeParser(oid: number, format?: 'text' | 'binary') {
    if (oid === TIMESTAMPTZ) return iso;
    // timestamp without time zone only appears in hand-written SQL; it is read as UTC.
    if (oid === TIMESTAMP) return (s: string) => iso(`${s}Z`);
    if (oid === INT8 || oid === NUMERIC) return (s: string) => Number(s);
    return pg.types.getTypeParser(oid, format ?? 'text');
  },
};

function postgresConfig(url: string): Knex.Config {
  const max = Number(process.env.DATABASE_POOL_MAX ?? 10);
  return {
    client: 'pg',
    connection: { connectionString: url, types: pgTypeParsers } as Knex.PgConnectionConfig,
    migrations,
    pool: {
      min: 0,
      max: Number.isInteger(max) && max > 0 ? max : 10,
      afterCreate(conn: { query: (s: string, cb: (err: Error | null) => void) => void }, done: (err: Error | null, conn: unknown) => void) {
        // Times are compared and printed in UTC whatever the server's zone.
        conn.query("SET TIME ZONE 'UTC'", (err) => done(err, conn));
      },
    },
  };
}

export default knexConfig(process.env.DATABASE_URL || process.env.DATABASE_FILE || '.data/stochos.sqlite');
