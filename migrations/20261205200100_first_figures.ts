import type { Knex } from 'knex';
import { dropGuard, restrictValues } from '../db/dialect';

// First figures: the one result of a published version at its default dial values (same model, seed and trials
// give the same numbers), computed once on the server's run pool and sent with the widget so the embed shows
// figures before its own worker has run. One row per version and engine build (a new engine build computes them
// again). The row is also the job: queued → computing → done | failed, with a lease like snapshot_jobs.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('first_figures', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('version_id', 36).notNullable().references('model_versions.id').onDelete('CASCADE');
    t.string('engine_build', 64).notNullable();
    t.string('state', 16).notNullable();
    t.integer('attempts').notNullable().defaultTo(0);
    t.timestamp('next_attempt_at').notNullable();
    t.string('locked_by', 80);
    t.timestamp('locked_until');
    t.string('last_error', 500);
    t.text('result_json');
    t.timestamp('computed_at');
    t.integer('run_ms');
    t.timestamp('created_at').notNullable();
    t.timestamp('updated_at').notNullable();
    t.unique(['version_id', 'engine_build']);
    t.index(['state', 'next_attempt_at']);
    t.index(['firm_id', 'version_id']);
  });
  await restrictValues(knex, {
    table: 'first_figures',
    column: 'state',
    values: ['queued', 'computing', 'done', 'failed'],
    name: 'first_figures_state_check',
    message: 'invalid first figures state',
    onUpdate: 'first_figures_state_update_check',
  });
}

export async function down(knex: Knex): Promise<void> {
  await dropGuard(knex, 'first_figures', 'first_figures_state_update_check');
  await dropGuard(knex, 'first_figures', 'first_figures_state_check');
  await knex.schema.dropTableIfExists('first_figures');
}
