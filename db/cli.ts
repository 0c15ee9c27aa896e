import 'server-only';
import { getDb, closeDb } from '@/db/knex';
import { databaseTarget } from '@/db/knex';

// npm run db:migrate | db:rollback (the demo seed is lib/dev/seed/cli.ts: npm run db:seed)
async function main(): Promise<void> {
  const [command, ...flags] = process.argv.slice(2);
  const db = getDb();
  try {
    if (command === 'migrate') {
      const [batch, names] = await db.migrate.latest();
      console.log(names.length ? `Migrated (batch ${batch}): ${names.join(', ')}` : 'Database is up to date.');
    } else if (command === 'rollback') {
      const [batch, names] = await db.migrate.rollback(undefined, flags.includes('--all'));
      console.log(names.length ? `Rolled back batch ${batch}: ${names.join(', ')}` : 'Nothing to roll back.');
    } else {
      console.error('Usage: tsx db/cli.ts migrate | rollback [--all]');
      process.exitCode = 2;
    }
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
