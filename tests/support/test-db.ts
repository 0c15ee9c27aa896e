// A fresh, migrated database for one test file: a temporary SQLite file, or, under `npm run test:postgres`, a new
// database on the throwaway PostgreSQL cluster. Migrations are loaded through vitest's own module loader (which
// compiles TypeScript), since knex's loader would hand the .ts files to plain Node.
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import type { Knex } from 'knex';
import { resetEnvCache } from '@/lib/server/env';
import { closeDb, getDb } from '@/db/knex';
import { createTestDatabase, testPgAdminUrl } from './pg-databases';

const dir = path.resolve(__dirname, '../../migrations');

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => fs.readdirSync(dir).filter((f) => /^\d{14}_.+\.ts$/.test(f)).sort(),
  getMigrationName: (name) => name,
  getMigration: async (name) => (await import(/* @vite-ignore */ path.join(dir, name))) as Knex.Migration,
};

/** Points the process at a new, freshly migrated database (one per test file); returns its file path or URL. */
export async function useFreshDb(): Promise<string> {
  await closeDb();
  const admin = testPgAdminUrl();
  let target: string;
  if (admin) {
    target = await createTestDatabase(admin, 'unit');
    process.env.DATABASE_URL = target;
  } else {
    const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-test-'));
    target = path.join(tmp, 'test.sqlite');
    process.env.DATABASE_FILE = target;
    delete process.env.DATABASE_URL;
  }
  resetEnvCache();
  await getDb().migrate.latest({ migrationSource });
  return target;
}
