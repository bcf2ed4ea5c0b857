import type { Knex } from 'knex';

/*
 * Indexes for the order lists at scale (tests/bench/scale.bench.ts: 100 000 orders, one company).
 * The lists pick one page of ids from an index alone, then read the rows of that page only
 * (orders.repo.ts listOrders), so each index below holds every column its list filters and sorts on.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('orders', (t) => {
    // The office queue: requested + scheduled, nearest deadline first. Replaces the index without
    // the sort's tie-breakers, which made every queued order a table read.
    t.index(['company_id', 'status', 'contingency_deadline', 'window_start', 'id'], 'orders_company_status_deadline');
    // An agent's or client's orders: each id they are on is looked up here, with the company and
    // every sort key but the address beside it, so the count and the page never read an order's row.
    t.index(['id', 'company_id', 'contingency_deadline', 'window_start', 'created_at', 'status', 'window_date'], 'orders_id_sort_keys');
    t.dropIndex(['company_id', 'status', 'contingency_deadline']);
  });
  // The office's register of all orders, newest first: in exactly the list's order (knex cannot say
  // DESC for one column), so a page is read straight off the index and the rest never is.
  await knex.raw('create index "orders_company_created" on "orders" ("company_id", "created_at" desc, "window_start", "id")');
  await knex.schema.alterTable('order_parties', (t) => {
    // The orders a person is on, answered from the index alone; replaces the index on user_id.
    t.index(['user_id', 'order_id'], 'order_parties_user_order');
    t.dropIndex(['user_id']);
  });
  await knex.schema.alterTable('report_revisions', (t) => {
    // The grade beside each listed order, read without stepping over the large snapshot stored before it in the row.
    t.index(['order_id', 'number', 'grade'], 'report_revisions_order_grade');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('report_revisions', (t) => {
    t.dropIndex(['order_id', 'number', 'grade'], 'report_revisions_order_grade');
  });
  await knex.schema.alterTable('order_parties', (t) => {
    t.index(['user_id']);
    t.dropIndex(['user_id', 'order_id'], 'order_parties_user_order');
  });
  await knex.raw('drop index "orders_company_created"');
  await knex.schema.alterTable('orders', (t) => {
    t.index(['company_id', 'status', 'contingency_deadline']);
    t.dropIndex(['id', 'company_id', 'contingency_deadline', 'window_start', 'created_at', 'status', 'window_date'], 'orders_id_sort_keys');
    t.dropIndex(['company_id', 'status', 'contingency_deadline', 'window_start', 'id'], 'orders_company_status_deadline');
  });
}
