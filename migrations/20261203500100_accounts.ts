import type { Knex } from 'knex';

// Sign-ups waiting for their e-mailed confirmation, password-reset links, and the counters behind the e-mail limits.
export async function up(knex: Knex): Promise<void> {
  // Nothing is created for an address until its owner follows the link: only the hash of the link's secret is kept.
  await knex.schema.createTable('pending_sign_ups', (t) => {
    t.string('id', 36).primary();
    t.string('email', 254).notNullable();
    t.string('name', 120).notNullable();
    t.string('firm_name', 120).notNullable();
    t.string('password_hash', 100).notNullable();
    t.string('token_hash', 64).notNullable().unique();
    t.timestamp('expires_at').notNullable();
    t.timestamp('created_at').notNullable();
    t.index(['email']);
  });

  await knex.schema.createTable('password_resets', (t) => {
    t.string('id', 36).primary();
    t.string('user_id', 36).notNullable().references('users.id').onDelete('CASCADE');
    t.string('token_hash', 64).notNullable().unique();
    t.timestamp('expires_at').notNullable();
    t.timestamp('used_at');
    t.timestamp('created_at').notNullable();
    t.index(['user_id']);
  });

  // One row per e-mail someone triggered, keyed by what is limited (recipient, client address, firm).
  await knex.schema.createTable('mail_sends', (t) => {
    t.increments('id');
    t.string('key', 300).notNullable();
    t.timestamp('at').notNullable();
    t.index(['key', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['mail_sends', 'password_resets', 'pending_sign_ups']) await knex.schema.dropTableIfExists(table);
}
