// A fresh, migrated SQLite file for one test file. Migrations are loaded through vitest's own module loader
// (which compiles TypeScript), since knex's loader would hand the .ts files to plain Node.
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import type { Knex } from 'knex';
import { resetEnvCache } from '@/lib/env';
import { closeDb, getDb } from '@/db/knex';

const dir = path.resolve(__dirname, '../../migrations');

const source: Knex.MigrationSource<string> = {
  getMigrations: async () => fs.readdirSync(dir).filter((f) => /^\d{14}_.+\.ts$/.test(f)).sort(),
  getMigrationName: (name) => name,
  getMigration: async (name) => (await import(/* @vite-ignore */ path.join(dir, name))) as Knex.Migration,
};

/** Points the process at a new, freshly migrated SQLite file (one per test file). */
export async function useFreshDb(): Promise<string> {
  await closeDb();
  const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-test-'));
  process.env.DATABASE_FILE = path.join(tmp, 'test.sqlite');
  resetEnvCache();
  await getDb().migrate.latest({ migrationSource: source });
  return process.env.DATABASE_FILE;
}
