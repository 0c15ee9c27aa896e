import { getDb, closeDb } from '@/db/knex';
import { seedDemo } from '@/db/seed/demo';
import { resetEnvCache } from '@/lib/env';

export async function migrateAndSeed(seed: boolean): Promise<string> {
  resetEnvCache();
  await getDb().migrate.latest();
  const message = seed ? await seedDemo() : '';
  // The app process opens its own connection; this one must let go of the file.
  await closeDb();
  return message;
}
