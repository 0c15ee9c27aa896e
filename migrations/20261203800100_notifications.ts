import type { Knex } from 'knex';

// The review loop told by e-mail: outgoing notification mails, queued in the same transaction as the event that
// causes them and delivered by the worker with a lease (like snapshot_jobs), and each person's choice of which
// kinds they receive. States: queued → claimed → sending → sent, or failed; 'sending' is never repeated blindly.
// Portable: plain tables and indexes, no triggers or engine-specific SQL.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mail_jobs', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('kind', 32).notNullable();
    t.string('user_id', 36).notNullable().references('users.id').onDelete('CASCADE');
    t.string('recipient', 254).notNullable();
    t.string('subject', 300).notNullable();
    t.text('text_body').notNullable();
    t.text('html_body').notNullable();
    // One mail per event and person, even if the event were recorded twice.
    t.string('dedupe_key', 200).notNullable().unique();
    t.string('state', 16).notNullable();
    t.integer('attempts').notNullable().defaultTo(0);
    t.timestamp('next_attempt_at').notNullable();
    t.string('locked_by', 80);
    t.timestamp('locked_until');
    t.string('message_id', 200).notNullable();
    t.string('last_error', 500);
    t.timestamp('created_at').notNullable();
    t.timestamp('updated_at').notNullable();
    t.timestamp('sent_at');
    t.index(['state', 'next_attempt_at']);
    t.index(['firm_id', 'created_at']);
  });
  await knex.schema.createTable('notification_prefs', (t) => {
    t.string('user_id', 36).notNullable().references('users.id').onDelete('CASCADE');
    t.string('kind', 32).notNullable();
    t.boolean('enabled').notNullable();
    t.timestamp('updated_at').notNullable();
    t.primary(['user_id', 'kind']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('notification_prefs');
  await knex.schema.dropTableIfExists('mail_jobs');
}
