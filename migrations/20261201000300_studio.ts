import type { Knex } from 'knex';
import { dropGuard, refuseUpdate, restrictValues } from '../db/dialect';

// Authoring studio: models, their immutable versions with the checker's decision, and published widgets.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('models', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('title', 160).notNullable();
    t.string('template', 16).notNullable();
    // The model a new (or duplicated) model starts from, until its first version is saved.
    t.text('draft_json').notNullable();
    t.string('created_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at').notNullable();
    t.string('updated_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('updated_at').notNullable();
    t.timestamp('archived_at');
    t.index(['firm_id', 'archived_at']);
  });
  await restrictValues(knex, { table: 'models', column: 'template', values: ['linear-stack', 'cost-range', 'formula'], name: 'models_template_check', message: 'invalid template' });

  await knex.schema.createTable('model_versions', (t) => {
    t.string('id', 36).primary();
    t.string('model_id', 36).notNullable().references('models.id').onDelete('CASCADE');
    // Kept beside model_id so every query can be scoped by firm without a join.
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.integer('number').notNullable();
    t.text('model_json').notNullable();
    t.string('author_id', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('created_at').notNullable();
    t.string('note', 2000);
    t.string('check_state', 16).notNullable().defaultTo('unchecked');
    t.string('checker_id', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('checked_at');
    t.text('check_note');
    t.text('check_comments');
    t.unique(['model_id', 'number']);
    t.index(['firm_id', 'check_state']);
  });
  await restrictValues(knex, {
    table: 'model_versions',
    column: 'check_state',
    values: ['unchecked', 'signed_off', 'sent_back'],
    name: 'model_versions_state_check',
    message: 'invalid check state',
  });
  // A saved version is immutable: only the checker's decision may be written to it afterwards, once.
  // (A deleted user's id may still be cleared by the foreign key's SET NULL.)
  await refuseUpdate(knex, {
    table: 'model_versions',
    name: 'model_versions_immutable',
    message: 'model versions are immutable',
    when: `NEW.model_json IS NOT OLD.model_json OR NEW.number IS NOT OLD.number OR NEW.model_id IS NOT OLD.model_id
      OR NEW.firm_id IS NOT OLD.firm_id OR NEW.created_at IS NOT OLD.created_at OR NEW.note IS NOT OLD.note
      OR (NEW.author_id IS NOT NULL AND NEW.author_id IS NOT OLD.author_id)
      OR NEW.check_state NOT IN ('unchecked','signed_off','sent_back')
      OR (OLD.check_state <> 'unchecked' AND (NEW.check_state IS NOT OLD.check_state OR NEW.checked_at IS NOT OLD.checked_at
        OR NEW.check_note IS NOT OLD.check_note OR NEW.check_comments IS NOT OLD.check_comments
        OR (NEW.checker_id IS NOT NULL AND NEW.checker_id IS NOT OLD.checker_id)))`,
  });

  await knex.schema.createTable('widgets', (t) => {
    t.string('id', 36).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('model_id', 36).notNullable().references('models.id').onDelete('CASCADE');
    t.string('version_id', 36).notNullable().references('model_versions.id').onDelete('RESTRICT');
    t.string('title', 160).notNullable();
    t.text('panels').notNullable();
    t.string('headline', 32).notNullable();
    t.text('dial_ids').notNullable();
    t.string('brand_color', 7).notNullable();
    t.boolean('show_logo').notNullable().defaultTo(true);
    t.string('published_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('published_at').notNullable();
    t.string('updated_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('updated_at').notNullable();
    t.string('unpublished_by', 36).references('users.id').onDelete('SET NULL');
    t.timestamp('unpublished_at');
    t.index(['firm_id', 'unpublished_at']);
  });
  // One live widget per model; a model can be published again after it was taken down.
  await knex.raw('CREATE UNIQUE INDEX widgets_one_live_per_model ON widgets (model_id) WHERE unpublished_at IS NULL');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX IF EXISTS widgets_one_live_per_model');
  await dropGuard(knex, 'model_versions', 'model_versions_immutable');
  await dropGuard(knex, 'model_versions', 'model_versions_state_check');
  await dropGuard(knex, 'models', 'models_template_check');
  for (const table of ['widgets', 'model_versions', 'models']) await knex.schema.dropTableIfExists(table);
}
