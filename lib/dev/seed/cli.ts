import 'server-only';
import { closeDb, databaseTarget, getDb } from '@/db/knex';
import { seedDemo } from './demo';

// npm run db:seed [-- --reset]: brings the schema up to date, then writes the invented demo firm.
async function main(): Promise<void> {
  const reset = process.argv.slice(2).includes('--reset');
  try {
    await getDb().migrate.latest();
    console.log(await seedDemo({ reset }));
    // A URL's password is never printed.
    console.log(`Database: ${databaseTarget().replace(/\/\/([^:@/]+):[^@/]*@/, '//$1:***@')}`);
  } finally {
    await closeDb();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
