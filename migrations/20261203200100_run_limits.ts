import type { Knex } from 'knex';

// Server-side runs (simulate API, snapshot re-runs): rate-limit counters and concurrent-run leases live in the
// database so every app instance sees the same counts. Portable: plain tables, no engine-specific SQL.
export async function up(knex: Knex): Promise<void> {
  // One row per scope (e.g. "firm:<id>", "key:<id>") and fixed window; incremented by an upsert.
  await knex.schema.createTable('run_rate_counters', (t) => {
    t.string('scope', 80).notNullable();
    t.string('window_start', 32).notNullable();
    t.integer('count').notNullable().defaultTo(0);
    t.primary(['scope', 'window_start']);
    t.index(['window_start']);
  });
  // A run in progress holds a lease; it is deleted when the run ends and ignored after expires_at (a crashed instance).
  await knex.schema.createTable('run_leases', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('caller', 80).notNullable();
    t.string('created_at', 32).notNullable();
    t.string('expires_at', 32).notNullable();
    t.index(['firm_id', 'expires_at']);
    t.index(['caller', 'expires_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('run_leases');
  await knex.schema.dropTableIfExists('run_rate_counters');
}
