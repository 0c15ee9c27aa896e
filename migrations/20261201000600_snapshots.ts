import type { Knex } from 'knex';
import { dropGuard, restrictValues } from '../db/dialect';

// Snapshot jobs: a viewer's request for a PDF of the view they explored, queued and delivered by the worker.
// States: queued → rendering → sending → sent, or failed. A lease (locked_until) lets another worker take over a
// job whose worker stopped; the state 'sending' marks the one step that is never repeated blindly.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('snapshot_jobs', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('client_id', 36).notNullable().references('clients.id').onDelete('CASCADE');
    t.string('pass_id', 36).notNullable().references('passes.id').onDelete('CASCADE');
    t.string('widget_id', 36).notNullable().references('widgets.id').onDelete('CASCADE');
    // The version the viewer saw, pinned at request time so a later republish cannot change the PDF.
    t.string('version_id', 36).notNullable().references('model_versions.id').onDelete('CASCADE');
    t.string('recipient', 254).notNullable();
    // sha256 of the requesting address with the app secret: enough to rate-limit, not enough to identify.
    t.string('requester_hash', 64).notNullable();
    t.text('dial_values').notNullable();
    t.string('state', 16).notNullable();
    t.integer('attempts').notNullable().defaultTo(0);
    t.timestamp('next_attempt_at').notNullable();
    t.string('locked_by', 80);
    t.timestamp('locked_until');
    t.string('message_id', 200).notNullable();
    t.string('last_error', 500);
    t.integer('pdf_bytes');
    t.integer('render_ms');
    t.timestamp('created_at').notNullable();
    t.timestamp('updated_at').notNullable();
    t.timestamp('sent_at');
    t.index(['state', 'next_attempt_at']);
    t.index(['firm_id', 'created_at']);
    t.index(['recipient', 'created_at']);
    t.index(['pass_id', 'created_at']);
    t.index(['requester_hash', 'created_at']);
  });
  await restrictValues(knex, {
    table: 'snapshot_jobs',
    column: 'state',
    values: ['queued', 'rendering', 'sending', 'sent', 'failed'],
    name: 'snapshot_jobs_state_check',
    onUpdate: 'snapshot_jobs_state_update_check',
    message: 'invalid snapshot state',
  });
}

export async function down(knex: Knex): Promise<void> {
  await dropGuard(knex, 'snapshot_jobs', 'snapshot_jobs_state_update_check');
  await dropGuard(knex, 'snapshot_jobs', 'snapshot_jobs_state_check');
  await knex.schema.dropTableIfExists('snapshot_jobs');
}
