import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import knexFactory, { type Knex } from 'knex';
import { randomUUID } from 'node:crypto';
import * as foundation from '@/migrations/20261201000100_foundation';
import * as studio from '@/migrations/20261201000300_studio';

// The database itself keeps versions immutable and allows one live widget per model.
let knex: Knex;
const now = () => new Date().toISOString();
const ids = { firm: randomUUID(), user: randomUUID(), model: randomUUID(), v1: randomUUID(), v2: randomUUID() };

beforeAll(async () => {
  knex = knexFactory({ client: 'better-sqlite3', connection: { filename: ':memory:' }, useNullAsDefault: true });
  await knex.raw('PRAGMA foreign_keys = ON');
  await foundation.up(knex);
  await studio.up(knex);
  await knex('firms').insert({ id: ids.firm, name: 'Test', created_at: now() });
  await knex('users').insert({ id: ids.user, email: 'a@x.example', name: 'A', created_at: now() });
  await knex('models').insert({ id: ids.model, firm_id: ids.firm, title: 'M', template: 'formula', draft_json: '{}', created_at: now(), updated_at: now() });
  for (const [id, number] of [[ids.v1, 1], [ids.v2, 2]] as const) {
    await knex('model_versions').insert({ id, model_id: ids.model, firm_id: ids.firm, number, model_json: '{"a":1}', author_id: ids.user, created_at: now() });
  }
});
afterAll(() => knex.destroy());

describe('studio migration', () => {
  it('refuses an unknown template and an unknown check state', async () => {
    await expect(knex('models').insert({ id: randomUUID(), firm_id: ids.firm, title: 'X', template: 'spreadsheet', draft_json: '{}', created_at: now(), updated_at: now() })).rejects.toThrow(/invalid template/);
    await expect(
      knex('model_versions').insert({ id: randomUUID(), model_id: ids.model, firm_id: ids.firm, number: 9, model_json: '{}', created_at: now(), check_state: 'approved' }),
    ).rejects.toThrow(/invalid check state/);
  });

  it('refuses a second version with the same number', async () => {
    await expect(knex('model_versions').insert({ id: randomUUID(), model_id: ids.model, firm_id: ids.firm, number: 1, model_json: '{}', created_at: now() })).rejects.toThrow(/UNIQUE/);
  });

  it('refuses any change to a saved version’s content', async () => {
    await expect(knex('model_versions').where({ id: ids.v1 }).update({ model_json: '{"a":2}' })).rejects.toThrow(/immutable/);
    await expect(knex('model_versions').where({ id: ids.v1 }).update({ note: 'rewritten' })).rejects.toThrow(/immutable/);
    await expect(knex('model_versions').where({ id: ids.v1 }).update({ number: 7 })).rejects.toThrow(/immutable/);
  });

  it('takes the checker’s decision once, then refuses to change it', async () => {
    await knex('model_versions').where({ id: ids.v1 }).update({ check_state: 'signed_off', checker_id: ids.user, checked_at: now(), check_note: 'ok' });
    await expect(knex('model_versions').where({ id: ids.v1 }).update({ check_state: 'sent_back' })).rejects.toThrow(/immutable/);
    await expect(knex('model_versions').where({ id: ids.v1 }).update({ check_note: 'changed my mind' })).rejects.toThrow(/immutable/);
    await expect(knex('model_versions').where({ id: ids.v2 }).update({ check_state: 'approved' })).rejects.toThrow(/immutable/);
  });

  it('allows one live widget per model', async () => {
    const w = (id: string, unpublished: string | null) => ({
      id, firm_id: ids.firm, model_id: ids.model, version_id: ids.v1, title: 'W', panels: '[]', headline: 'mean', dial_ids: '[]', brand_color: '#000000',
      published_at: now(), updated_at: now(), unpublished_at: unpublished,
    });
    await knex('widgets').insert(w(randomUUID(), now()));
    await knex('widgets').insert(w(randomUUID(), null));
    await expect(knex('widgets').insert(w(randomUUID(), null))).rejects.toThrow(/UNIQUE/);
  });

  it('rolls back cleanly', async () => {
    await studio.down(knex);
    const tables = (await knex.raw("select name from sqlite_master where type in ('table','trigger','index') and name like '%model%' or name like 'widget%'")) as { name: string }[];
    expect(tables).toEqual([]);
  });
});
