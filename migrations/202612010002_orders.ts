import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('companies', (t) => {
    // IANA zone: deadlines and arrival windows are the company's local calendar.
    t.string('time_zone', 60).notNullable().defaultTo('America/Los_Angeles');
    t.boolean('require_payment_before_release').notNullable().defaultTo(true);
    t.boolean('inspectors_may_publish').notNullable().defaultTo(false);
    t.integer('share_link_days').notNullable().defaultTo(30);
    t.boolean('guest_costs_default').notNullable().defaultTo(true);
    t.enu('agent_signup', ['invite_only', 'self_signup'], { useNative: false, enumName: 'agent_signup' })
      .notNullable()
      .defaultTo('invite_only');
    t.text('service_area');
    t.text('report_footer');
  });

  await knex.schema.createTable('fee_items', (t) => {
    t.string('id', 36).primary();
    t.string('company_id', 36).notNullable().references('id').inTable('companies').onDelete('CASCADE');
    t.enu('kind', ['base', 'add_on'], { useNative: false, enumName: 'fee_item_kind' }).notNullable();
    t.string('name', 100).notNullable();
    t.string('description', 300).notNullable().defaultTo('');
    t.integer('price_cents').notNullable();
    t.boolean('active').notNullable().defaultTo(true);
    t.integer('sort_order').notNullable().defaultTo(0);
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.index(['company_id', 'active']);
  });

  await knex.schema.createTable('properties', (t) => {
    t.string('id', 36).primary();
    t.string('company_id', 36).notNullable().references('id').inTable('companies').onDelete('CASCADE');
    t.string('street', 200).notNullable();
    t.string('unit', 40).notNullable().defaultTo('');
    t.string('city', 100).notNullable();
    t.string('region', 60).notNullable();
    t.string('postal_code', 12).notNullable();
    // Lower-cased, space-collapsed street + unit + postal code: how we notice the same house ordered twice.
    t.string('address_key', 260).notNullable();
    t.integer('year_built').notNullable();
    t.string('property_type', 30).notNullable();
    t.enu('occupancy', ['occupied', 'vacant'], { useNative: false, enumName: 'occupancy' }).notNullable();
    t.text('access_notes').notNullable().defaultTo('');
    t.string('created_at', 32).notNullable();
    t.index(['company_id', 'address_key']);
  });

  await knex.schema.createTable('orders', (t) => {
    t.string('id', 36).primary();
    t.string('company_id', 36).notNullable().references('id').inTable('companies').onDelete('CASCADE');
    t.string('property_id', 36).notNullable().references('id').inTable('properties').onDelete('RESTRICT');
    t.enu('kind', ['pre_purchase', 'pre_listing'], { useNative: false, enumName: 'order_kind' }).notNullable();
    t.enu('ordering_side', ['buyer', 'seller'], { useNative: false, enumName: 'order_side' }).notNullable();
    t.enu('status', ['requested', 'scheduled', 'recorded', 'in_review', 'published', 'cancelled'], {
      useNative: false,
      enumName: 'order_status',
    })
      .notNullable()
      .defaultTo('requested');
    t.string('contingency_deadline', 10).notNullable();
    t.text('preferred_dates').notNullable().defaultTo('[]');
    t.enu('payer', ['agent_now', 'client_before_release'], { useNative: false, enumName: 'order_payer' }).notNullable();
    t.integer('fee_total_cents').notNullable();
    t.enu('payment_state', ['unpaid', 'paid', 'refunded'], { useNative: false, enumName: 'payment_state' })
      .notNullable()
      .defaultTo('unpaid');
    t.string('assigned_inspector_id', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('window_date', 10);
    t.string('window_start', 5);
    t.string('window_end', 5);
    t.text('note').notNullable().defaultTo('');
    t.text('cancel_reason');
    t.string('created_by', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.index(['company_id', 'status', 'contingency_deadline']);
    t.index(['assigned_inspector_id', 'window_date']);
    t.index(['property_id']);
  });

  await knex.schema.createTable('order_fee_lines', (t) => {
    t.increments('id').primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    // The price is copied: later fee list changes never touch an existing order.
    t.string('fee_item_id', 36).references('id').inTable('fee_items').onDelete('SET NULL');
    t.string('name', 100).notNullable();
    t.integer('price_cents').notNullable();
    t.index(['order_id']);
  });

  await knex.schema.createTable('order_parties', (t) => {
    t.increments('id').primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    t.string('user_id', 36).notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.enu('party_role', ['buyers_agent', 'listing_agent', 'buyer', 'seller'], { useNative: false, enumName: 'party_role' }).notNullable();
    t.string('created_at', 32).notNullable();
    t.unique(['order_id', 'user_id', 'party_role']);
    t.index(['user_id']);
  });

  await knex.schema.createTable('order_events', (t) => {
    t.increments('id').primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    t.string('actor_user_id', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('type', 40).notNullable();
    t.text('detail');
    t.string('created_at', 32).notNullable();
    t.index(['order_id', 'id']);
  });

  await knex.schema.createTable('payments', (t) => {
    t.string('id', 36).primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    t.string('checkout_session_id', 255).notNullable().unique();
    t.string('checkout_url', 1000).notNullable();
    t.string('payment_intent_id', 255);
    t.integer('amount_cents').notNullable();
    t.string('currency', 3).notNullable();
    t.enu('status', ['open', 'paid', 'expired', 'refunded'], { useNative: false, enumName: 'payment_status' })
      .notNullable()
      .defaultTo('open');
    t.string('refund_id', 255);
    t.string('created_by', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.index(['order_id']);
  });

  // Each provider event is handled once: a replayed webhook finds its id here and changes nothing.
  await knex.schema.createTable('payment_events', (t) => {
    t.string('event_id', 255).primary();
    t.string('type', 100).notNullable();
    t.string('received_at', 32).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('payment_events');
  await knex.schema.dropTable('payments');
  await knex.schema.dropTable('order_events');
  await knex.schema.dropTable('order_parties');
  await knex.schema.dropTable('order_fee_lines');
  await knex.schema.dropTable('orders');
  await knex.schema.dropTable('properties');
  await knex.schema.dropTable('fee_items');
  await knex.schema.alterTable('companies', (t) => {
    t.dropColumn('report_footer');
    t.dropColumn('service_area');
    t.dropColumn('agent_signup');
    t.dropColumn('guest_costs_default');
    t.dropColumn('share_link_days');
    t.dropColumn('inspectors_may_publish');
    t.dropColumn('require_payment_before_release');
    t.dropColumn('time_zone');
  });
}
