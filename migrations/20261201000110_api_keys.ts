import type { Knex } from 'knex';

// Firm API keys for the simulate API; only a hash of the secret is stored.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('api_keys', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('name', 80).notNullable();
    t.string('prefix', 16).notNullable();
    t.string('key_hash', 64).notNullable().unique();
    t.string('created_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at').notNullable();
    t.timestamp('last_used_at');
    t.timestamp('revoked_at');
    t.index(['firm_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('api_keys');
}
