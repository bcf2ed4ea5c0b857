import type { Knex } from 'knex';

/*
 * Published reports. A revision is a frozen snapshot (the inspection, what core computed
 * from it, the company and inspector as they were, the media it shows), so later edits
 * never change what people already read. Release and disclosure live on the order.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('orders', (t) => {
    // JSON list of the sides ('buyer', 'seller') the published report is released to.
    t.text('released_to').notNullable().defaultTo('[]');
    // Published but waiting for payment (the company requires payment before release).
    t.boolean('release_held').notNullable().defaultTo(false);
  });

  await knex.schema.createTable('report_revisions', (t) => {
    t.string('id', 36).primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    t.integer('number').notNullable();
    t.enu('kind', ['original', 'amendment', 'reinspection'], { useNative: false, enumName: 'revision_kind' }).notNullable();
    t.text('note').notNullable().defaultTo('');
    t.text('snapshot').notNullable();
    t.string('grade', 20).notNullable();
    t.string('published_by', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('published_at', 32).notNullable();
    t.unique(['order_id', 'number']);
  });

  await knex.schema.createTable('share_links', (t) => {
    t.string('id', 36).primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    // 'guest': an expiring link for a lender or contractor; 'disclosure': the pre-listing link for any prospective buyer.
    t.enu('purpose', ['guest', 'disclosure'], { useNative: false, enumName: 'share_purpose' }).notNullable();
    t.string('token_hash', 64).notNullable().unique();
    t.string('label', 120).notNullable().defaultTo('');
    t.boolean('show_costs').notNullable().defaultTo(true);
    t.string('expires_at', 32);
    t.string('revoked_at', 32);
    t.string('created_by', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.index(['order_id']);
  });

  await knex.schema.createTable('report_views', (t) => {
    t.increments('id').primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    t.integer('revision_number').notNullable();
    t.string('viewer_user_id', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('share_link_id', 36).references('id').inTable('share_links').onDelete('SET NULL');
    t.enu('what', ['report', 'pdf'], { useNative: false, enumName: 'view_kind' }).notNullable();
    t.string('ip', 64);
    t.string('viewed_at', 32).notNullable();
    t.index(['order_id', 'viewed_at']);
  });

  await knex.schema.createTable('report_messages', (t) => {
    t.string('id', 36).primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    // Answers point at their question; questions have none.
    t.string('question_id', 36).references('id').inTable('report_messages').onDelete('CASCADE');
    t.string('author_id', 36).references('id').inTable('users').onDelete('SET NULL');
    t.text('body').notNullable();
    t.string('created_at', 32).notNullable();
    t.index(['order_id', 'created_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('report_messages');
  await knex.schema.dropTable('report_views');
  await knex.schema.dropTable('share_links');
  await knex.schema.dropTable('report_revisions');
  await knex.schema.alterTable('orders', (t) => {
    t.dropColumn('release_held');
    t.dropColumn('released_to');
  });
}
