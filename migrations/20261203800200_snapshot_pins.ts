import type { Knex } from 'knex';

// A snapshot may carry a second view: the dial values the viewer pinned before moving the dials again. The PDF
// then shows both runs side by side. Null for a single view.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('snapshot_jobs', (t) => {
    t.text('pinned_dial_values');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('snapshot_jobs', (t) => {
    t.dropColumn('pinned_dial_values');
  });
}
