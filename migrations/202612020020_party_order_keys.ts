import type { Knex } from 'knex';

/*
 * A person's orders in the portal list, found from their party rows alone (orders.repo.ts
 * listOrders, tests/bench/scale.bench.ts: an agent on thousands of orders). Each party row
 * carries two facts of its order that never change once it is placed, the company and the
 * contingency deadline, so how many orders a person is on and which come first by deadline
 * are read from one index range instead of looking up each order.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('order_parties', (t) => {
    t.string('company_id', 36).references('id').inTable('companies').onDelete('CASCADE');
    t.string('contingency_deadline', 10);
  });
  await knex.raw(
    `update order_parties set
       company_id = (select orders.company_id from orders where orders.id = order_parties.order_id),
       contingency_deadline = (select orders.contingency_deadline from orders where orders.id = order_parties.order_id)`,
  );
  await knex.schema.alterTable('order_parties', (t) => {
    t.string('company_id', 36).notNullable().alter();
    t.string('contingency_deadline', 10).notNullable().alter();
    // Replaces the index on (user_id, order_id): the orders a person is on, in deadline order.
    t.index(['user_id', 'company_id', 'contingency_deadline', 'order_id'], 'order_parties_person_deadline');
    t.dropIndex(['user_id', 'order_id'], 'order_parties_user_order');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('order_parties', (t) => {
    t.index(['user_id', 'order_id'], 'order_parties_user_order');
    t.dropIndex(['user_id', 'company_id', 'contingency_deadline', 'order_id'], 'order_parties_person_deadline');
    t.dropForeign(['company_id']);
    t.dropColumn('company_id');
    t.dropColumn('contingency_deadline');
  });
}
