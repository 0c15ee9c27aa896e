import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { resetEnvCache } from '@/lib/env';
import { closeDb, getDb } from '@/db/knex';

/** Points the process at a new, freshly migrated SQLite file (one per test file). */
export async function useFreshDb(): Promise<string> {
  await closeDb();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-test-'));
  process.env.DATABASE_FILE = path.join(dir, 'test.sqlite');
  resetEnvCache();
  await getDb().migrate.latest();
  return process.env.DATABASE_FILE;
}
