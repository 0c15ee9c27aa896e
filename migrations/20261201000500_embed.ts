import type { Knex } from 'knex';
import { dropGuard, restrictValues } from '../db/dialect';

// Embedding: the firm's clients (allowed origins and e-mail domains, key version), passes granting one client
// one widget, the signed tokens issued for each pass (revoking one denylists its jti), and view analytics.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('clients', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('name', 120).notNullable();
    t.string('note', 500);
    // JSON arrays of normalised values (scheme://host[:port] and bare domains).
    t.text('allowed_origins').notNullable();
    t.text('allowed_email_domains').notNullable();
    // Rotating the key bumps the version (tokens name it in their kid) and moves not_before to now.
    t.integer('key_version').notNullable().defaultTo(1);
    t.timestamp('not_before').notNullable();
    t.string('created_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at').notNullable();
    t.string('updated_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('updated_at').notNullable();
    t.timestamp('archived_at');
    t.index(['firm_id', 'archived_at']);
  });
  await knex.raw('CREATE UNIQUE INDEX clients_firm_name ON clients (firm_id, lower(name))');

  await knex.schema.createTable('passes', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('client_id', 36).notNullable().references('clients.id').onDelete('CASCADE');
    t.string('widget_id', 36).notNullable().references('widgets.id').onDelete('CASCADE');
    t.string('created_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at').notNullable();
    // The latest token's expiry; renewing issues a new token and moves this on.
    t.timestamp('expires_at').notNullable();
    t.timestamp('renewed_at');
    t.timestamp('revoked_at');
    t.string('revoked_by', 36).references('users.id').onDelete('SET NULL');
    t.string('revoke_reason', 32);
    t.timestamp('last_view_at');
    t.index(['firm_id', 'client_id']);
    t.index(['widget_id']);
  });

  await knex.schema.createTable('pass_tokens', (t) => {
    t.string('jti', 36).primary();
    t.string('pass_id', 36).notNullable().references('passes.id').onDelete('CASCADE');
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.integer('key_version').notNullable();
    t.timestamp('issued_at').notNullable();
    t.timestamp('expires_at').notNullable();
    // Set = denylisted: the token is refused even before its expiry.
    t.timestamp('revoked_at');
    t.index(['pass_id', 'issued_at']);
  });

  await knex.schema.createTable('pass_events', (t) => {
    t.increments('id');
    t.string('pass_id', 36).notNullable().references('passes.id').onDelete('CASCADE');
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('kind', 16).notNullable();
    t.timestamp('at').notNullable();
    t.string('detail', 200);
    t.index(['pass_id', 'at']);
    t.index(['firm_id', 'at']);
  });
  await restrictValues(knex, { table: 'pass_events', column: 'kind', values: ['load', 'dial', 'snapshot'], name: 'pass_events_kind_check', message: 'invalid pass event' });
}

export async function down(knex: Knex): Promise<void> {
  await dropGuard(knex, 'pass_events', 'pass_events_kind_check');
  await knex.raw('DROP INDEX IF EXISTS clients_firm_name');
  for (const table of ['pass_events', 'pass_tokens', 'passes', 'clients']) await knex.schema.dropTableIfExists(table);
}
