// Fresh PostgreSQL databases for tests run by `npm run test:postgres`, which sets STOCHOS_TEST_PG_URL to the
// throwaway cluster's admin URL. Each test file (and each API stack) gets a database of its own.
import { randomBytes } from 'node:crypto';
import pg from 'pg';

export const testPgAdminUrl = (): string | null => process.env.STOCHOS_TEST_PG_URL || null;

/** Creates an empty database on the test cluster and returns its URL. */
export async function createTestDatabase(adminUrl: string, prefix: string): Promise<string> {
  const name = `${prefix}_${randomBytes(6).toString('hex')}`.toLowerCase().replace(/[^a-z0-9_]/g, '_');
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    await client.query(`CREATE DATABASE "${name}"`);
  } finally {
    await client.end();
  }
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  return url.toString();
}
