import type { Knex } from 'knex';

// Measured data: the firm's dataset library, which models used which dataset (with the hash they copied), and the
// firm's logo (re-encoded bytes, never the uploaded file).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('datasets', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('name', 120).notNullable();
    t.string('unit', 24).notNullable().defaultTo('');
    // The chosen column's header as the file named it.
    t.string('column_name', 120).notNullable();
    t.string('file_name', 255).notNullable();
    // JSON array of numbers in file order.
    t.text('values_json').notNullable();
    // sha256 of the uploaded bytes (hex) and their size.
    t.string('hash', 64).notNullable();
    t.integer('size_bytes').notNullable();
    t.integer('row_count').notNullable();
    // JSON array of row numbers the uploader dropped explicitly.
    t.text('dropped_rows').notNullable().defaultTo('[]');
    t.string('uploaded_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at').notNullable();
    t.timestamp('archived_at');
    t.index(['firm_id', 'archived_at']);
  });

  await knex.schema.createTable('dataset_uses', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('dataset_id', 36).notNullable().references('datasets.id').onDelete('CASCADE');
    t.string('model_id', 36).notNullable().references('models.id').onDelete('CASCADE');
    // The dataset hash the model copied, and how: 'empirical' or the fitted law.
    t.string('hash', 64).notNullable();
    t.string('method', 16).notNullable();
    t.string('created_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at').notNullable();
    t.index(['dataset_id']);
    t.index(['firm_id', 'model_id']);
  });

  await knex.schema.createTable('firm_logos', (t) => {
    t.string('firm_id', 36).primary().references('firms.id').onDelete('CASCADE');
    t.binary('bytes').notNullable();
    t.string('content_type', 32).notNullable();
    t.string('hash', 64).notNullable();
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.string('updated_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('updated_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('firm_logos');
  await knex.schema.dropTableIfExists('dataset_uses');
  await knex.schema.dropTableIfExists('datasets');
}
