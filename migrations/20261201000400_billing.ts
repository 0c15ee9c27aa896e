import type { Knex } from 'knex';

// Seat billing: the firm's Stripe customer, its subscriptions and invoices as last reported by webhooks,
// and the ids of the webhook events already applied (each event changes the database at most once).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('billing_accounts', (t) => {
    t.string('firm_id', 36).primary().references('firms.id').onDelete('CASCADE');
    t.string('stripe_customer_id', 255).unique();
    // The app's own trial (no card needed); support can extend it by moving this date.
    t.timestamp('trial_ends_at').notNullable();
    t.timestamp('created_at').notNullable();
    t.timestamp('updated_at').notNullable();
  });

  await knex.schema.createTable('billing_subscriptions', (t) => {
    t.string('id', 255).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('customer_id', 255).notNullable();
    t.string('status', 32).notNullable();
    t.string('item_id', 255);
    t.string('price_id', 255);
    t.integer('unit_amount');
    t.string('currency', 3);
    t.string('interval', 8);
    t.integer('quantity').notNullable();
    t.timestamp('current_period_start');
    t.timestamp('current_period_end');
    t.boolean('cancel_at_period_end').notNullable().defaultTo(false);
    t.timestamp('canceled_at');
    t.timestamp('ended_at');
    // When the subscription became past due, as the app saw it (never in the app's future).
    t.timestamp('past_due_since');
    // Stripe's `created` of the last event applied (epoch seconds) and its type: older events never win.
    t.integer('last_event_created').notNullable();
    t.string('last_event_type', 64).notNullable();
    t.timestamp('stripe_created_at').notNullable();
    t.timestamp('updated_at').notNullable();
    t.index(['firm_id', 'stripe_created_at']);
  });

  await knex.schema.createTable('billing_invoices', (t) => {
    t.string('id', 255).primary();
    t.string('firm_id', 36).notNullable().references('firms.id').onDelete('CASCADE');
    t.string('subscription_id', 255);
    t.string('number', 64);
    t.string('status', 16).notNullable();
    t.string('billing_reason', 40);
    t.integer('total').notNullable();
    t.integer('amount_due').notNullable();
    t.integer('amount_paid').notNullable();
    t.string('currency', 3).notNullable();
    t.integer('seats');
    t.timestamp('period_start');
    t.timestamp('period_end');
    t.string('hosted_invoice_url', 2000);
    t.integer('attempt_count').notNullable().defaultTo(0);
    t.integer('last_event_created').notNullable();
    t.timestamp('stripe_created_at').notNullable();
    t.timestamp('updated_at').notNullable();
    t.index(['firm_id', 'stripe_created_at']);
  });

  await knex.schema.createTable('stripe_events', (t) => {
    t.string('id', 255).primary();
    t.string('type', 64).notNullable();
    t.string('firm_id', 36).references('firms.id').onDelete('CASCADE');
    t.integer('created').notNullable();
    t.string('outcome', 32).notNullable();
    t.timestamp('received_at').notNullable();
    t.index(['firm_id', 'received_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['stripe_events', 'billing_invoices', 'billing_subscriptions', 'billing_accounts']) {
    await knex.schema.dropTableIfExists(table);
  }
}
