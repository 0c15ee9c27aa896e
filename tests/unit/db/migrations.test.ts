// Every migration runs up, all the way down and up again, on SQLite and (under `npm run test:postgres`) on
// PostgreSQL: the same files, with db/dialect.ts deciding where the two differ.
import { describe, expect, it } from 'vitest';
import { getDb } from '@/db/knex';
import { bumpCounter, isPostgres } from '@/db/dialect';
import { migrationSource, useFreshDb } from '../../support/test-db';

async function tables(): Promise<string[]> {
  const db = getDb();
  const rows = isPostgres(db)
    ? ((await db.raw("select tablename as name from pg_tables where schemaname = 'public'")).rows as { name: string }[])
    : ((await db.raw("select name from sqlite_master where type = 'table' and name not like 'sqlite_%'")) as { name: string }[]);
  return rows.map((r) => r.name).filter((n) => !n.startsWith('knex_')).sort();
}

describe('migrations', () => {
  it('run up, down and up again, leaving the same tables', async () => {
    await useFreshDb();
    const db = getDb();
    const up = await tables();
    expect(up).toEqual(expect.arrayContaining(['firms', 'users', 'memberships', 'model_versions', 'widgets', 'passes', 'snapshot_jobs', 'datasets', 'firm_logos']));
    await db.migrate.rollback({ migrationSource }, true);
    expect(await tables()).toEqual([]);
    await db.migrate.latest({ migrationSource });
    expect(await tables()).toEqual(up);
  });

  it('keep the guards: a saved version is immutable and column values are restricted', async () => {
    const db = getDb();
    const now = new Date().toISOString();
    await db('firms').insert({ id: 'f1', name: 'Guard test firm', created_at: now });
    await expect(db('models').insert({ id: 'm0', firm_id: 'f1', title: 'T', template: 'spreadsheet', draft_json: '{}', created_at: now, updated_at: now })).rejects.toThrow(
      /invalid template|models_template_check/,
    );
    await db('models').insert({ id: 'm1', firm_id: 'f1', title: 'T', template: 'formula', draft_json: '{}', created_at: now, updated_at: now });
    await db('model_versions').insert({ id: 'v1', model_id: 'm1', firm_id: 'f1', number: 1, model_json: '{"a":1}', created_at: now });
    await expect(db('model_versions').where({ id: 'v1' }).update({ model_json: '{"a":2}' })).rejects.toThrow(/model versions are immutable/);
    // The checker's decision may be written once.
    await db('model_versions').where({ id: 'v1' }).update({ check_state: 'signed_off', checked_at: now, check_note: 'ok' });
    await expect(db('model_versions').where({ id: 'v1' }).update({ check_note: 'changed later' })).rejects.toThrow(/model versions are immutable/);
    await expect(db('model_versions').where({ id: 'v1' }).update({ check_state: 'approved' })).rejects.toThrow(/model versions are immutable|check/);
  });
});

describe('dialect helpers', () => {
  it('bumpCounter counts concurrent increments exactly, on either database', async () => {
    const db = getDb();
    await db.schema.createTable('test_counters', (t) => {
      t.string('key', 64).notNullable();
      t.string('window', 32).notNullable();
      t.integer('n').notNullable();
      t.primary(['key', 'window']);
    });
    const results = await Promise.all(Array.from({ length: 20 }, () => bumpCounter(db, 'test_counters', { key: 'k', window: 'w1' })));
    expect([...results].sort((a, b) => a - b)).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    expect(await bumpCounter(db, 'test_counters', { key: 'k', window: 'w1' }, { by: 5 })).toBe(25);
    expect(await bumpCounter(db, 'test_counters', { key: 'k', window: 'w2' })).toBe(1);
    await db.schema.dropTable('test_counters');
  });
});
