import type { Knex } from 'knex';
import { dropGuard, restrictValues } from '../db/dialect';

// Firms, people, roles, invitations, sign-in tokens, attempts and the audit log.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('write_lock', (t) => {
    t.integer('id').primary();
    t.integer('n').notNullable().defaultTo(0);
  });
  await knex('write_lock').insert({ id: 1, n: 0 });

  await knex.schema.createTable('firms', (t) => {
    t.string('id', 36).primary();
    t.string('name', 120).notNullable();
    t.string('units_default', 8).notNullable().defaultTo('mm');
    t.string('currency_default', 3).notNullable().defaultTo('EUR');
    t.string('brand_color', 7).notNullable().defaultTo('#1f887b');
    t.boolean('require_check').notNullable().defaultTo(true);
    t.string('paper_size', 8).notNullable().defaultTo('A4');
    t.timestamp('created_at').notNullable();
  });

  await knex.schema.createTable('users', (t) => {
    t.string('id', 36).primary();
    t.string('email', 254).notNullable().unique();
    t.string('name', 120).notNullable();
    t.string('password_hash', 100);
    t.integer('session_version').notNullable().defaultTo(1);
    t.timestamp('email_verified_at');
    t.timestamp('last_active_at');
    t.timestamp('created_at').notNullable();
  });

  await knex.schema.createTable('memberships', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('user_id', 36).notNullable().references('users.id').onDelete('CASCADE');
    t.string('role', 16).notNullable();
    t.string('status', 16).notNullable().defaultTo('active');
    t.timestamp('created_at').notNullable();
    t.timestamp('updated_at').notNullable();
    t.timestamp('removed_at');
    t.unique(['firm_id', 'user_id']);
    t.index(['user_id', 'status']);
  });
  await restrictValues(knex, { table: 'memberships', column: 'role', values: ['owner', 'author', 'checker'], name: 'memberships_role_check', message: 'invalid role' });

  await knex.schema.createTable('invitations', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('email', 254).notNullable();
    t.string('role', 16).notNullable();
    t.string('token_hash', 64).notNullable().unique();
    t.string('invited_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('expires_at').notNullable();
    t.timestamp('accepted_at');
    t.timestamp('revoked_at');
    t.timestamp('created_at').notNullable();
    t.index(['firm_id', 'email']);
  });

  await knex.schema.createTable('verification_tokens', (t) => {
    t.string('identifier', 254).notNullable();
    t.string('token_hash', 128).notNullable();
    t.timestamp('expires_at').notNullable();
    t.primary(['identifier', 'token_hash']);
  });

  await knex.schema.createTable('sign_in_attempts', (t) => {
    t.increments('id');
    t.string('key', 300).notNullable();
    t.timestamp('at').notNullable();
    t.index(['key', 'at']);
  });

  await knex.schema.createTable('audit_log', (t) => {
    t.increments('id');
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('actor_user_id', 36).references('users.id').onDelete('SET NULL');
    t.string('action', 64).notNullable();
    t.string('target_type', 32);
    // Stripe ids (checkout sessions, events) run past 64 characters; SQLite never checked the length, PostgreSQL does.
    t.string('target_id', 255);
    t.text('detail');
    t.timestamp('at').notNullable();
    t.index(['firm_id', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await dropGuard(knex, 'memberships', 'memberships_role_check');
  for (const table of ['audit_log', 'sign_in_attempts', 'verification_tokens', 'invitations', 'memberships', 'users', 'firms', 'write_lock']) {
    await knex.schema.dropTableIfExists(table);
  }
}
