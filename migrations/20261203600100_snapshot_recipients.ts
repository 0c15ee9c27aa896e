import type { Knex } from 'knex';

// A client with no snapshot e-mail domains used to accept any address. Now an empty list means nobody, and
// "any address" is an explicit setting of its own (off for every existing client).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clients', (t) => {
    t.boolean('snapshot_any_address').notNullable().defaultTo(false);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clients', (t) => {
    t.dropColumn('snapshot_any_address');
  });
}
