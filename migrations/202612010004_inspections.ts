import type { Knex } from 'knex';

/*
 * The recorded line (one inspection document per order) and the files recorded with it.
 *
 * The document is the inspection as core's `inspectionSchema` parses it, stored as JSON text:
 * it is always read and written whole, and the same text works on SQLite and PostgreSQL.
 * `version` is the optimistic-concurrency counter: every save names the version it started
 * from, and only a save that matches moves it on.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('inspections', (t) => {
    t.string('order_id', 36).primary().references('id').inTable('orders').onDelete('CASCADE');
    t.text('document').notNullable();
    t.integer('version').notNullable();
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.string('updated_by', 36).references('id').inTable('users').onDelete('SET NULL');
  });

  await knex.schema.createTable('media', (t) => {
    t.string('id', 36).primary();
    t.string('order_id', 36).notNullable().references('id').inTable('orders').onDelete('CASCADE');
    t.enu('kind', ['video', 'still', 'rendered'], { useNative: false, enumName: 'media_kind' }).notNullable();
    // Where it was recorded, by the ids inside the inspection document (not foreign keys: the document is JSON).
    t.string('run_id', 64);
    t.string('observation_id', 64);
    // A rendered copy points at the still it was drawn from.
    t.string('source_media_id', 36).references('id').inTable('media').onDelete('CASCADE');
    // Keys inside the storage (local disk or object store), never a path from the client.
    t.string('storage_key', 300).notNullable();
    t.string('thumbnail_key', 300);
    t.string('mime', 100).notNullable();
    t.bigInteger('size_bytes').notNullable();
    t.integer('width');
    t.integer('height');
    // double, not float: knex's float is PostgreSQL's 4-byte real, which would round what SQLite's REAL
    // keeps (SQLite gets the same `float` column either way).
    t.double('duration_seconds');
    // Seconds into the run's video where a still was grabbed.
    t.double('video_time');
    // Footage where a still was taken, in core's stored unit (tenths of a millimetre).
    t.integer('footage');
    t.enu('origin', ['upload', 'frame_grab', 'photo', 'markup'], { useNative: false, enumName: 'media_origin' }).notNullable();
    // The name the file had on the phone, cleaned; shown to people, never used as a path.
    t.string('original_name', 255).notNullable().defaultTo('');
    // Markup on a still, as vector data (core's markupSchema), with its own concurrency counter.
    t.text('markup');
    t.integer('markup_version').notNullable().defaultTo(0);
    t.string('created_by', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.index(['order_id', 'kind']);
    t.index(['source_media_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('media');
  await knex.schema.dropTable('inspections');
}
