import type { Knex } from 'knex';
import path from 'node:path';
import fs from 'node:fs';

// Shared by the app (db/knex.ts), the CLI (db/cli.ts) and the tests.
export function knexConfig(file: string): Knex.Config {
  if (file !== ':memory:') fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  return {
    client: 'better-sqlite3',
    connection: { filename: file },
    useNullAsDefault: true,
    migrations: { directory: path.resolve(process.cwd(), 'migrations'), loadExtensions: ['.ts', '.js'] },
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

export default knexConfig(process.env.DATABASE_FILE ?? '.data/stochos.sqlite');
