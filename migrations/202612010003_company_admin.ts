import type { Knex } from 'knex';

/**
 * What the office needs to run the company from its own screens: the logo,
 * each company's price book, and pending e-mail address changes.
 */
export async function up(knex: Knex): Promise<void> {
  // Each uploaded logo, checked and re-encoded; the bytes live in the media storage under storage_key.
  await knex.schema.createTable('company_logos', (t) => {
    t.string('id', 36).primary();
    t.string('company_id', 36).notNullable().references('id').inTable('companies').onDelete('CASCADE');
    t.string('storage_key', 300).notNullable().unique();
    t.string('content_type', 100).notNullable();
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.integer('size_bytes').notNullable();
    t.string('created_by', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('created_at', 32).notNullable();
    t.index(['company_id']);
  });

  // No foreign key: SQLite cannot add one to an existing table without rebuilding it. The company
  // service keeps it pointing at a logo row of the same company.
  await knex.schema.alterTable('companies', (t) => {
    t.string('logo_id', 36);
  });

  // The company's price book as JSON validated by core's priceBookSchema; no row means core's documented defaults.
  await knex.schema.createTable('price_books', (t) => {
    t.string('company_id', 36).primary().references('id').inTable('companies').onDelete('CASCADE');
    t.text('book').notNullable();
    t.string('updated_by', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('updated_at', 32).notNullable();
  });

  // A requested change of sign-in address, proven by a link sent to the new address.
  await knex.schema.createTable('email_changes', (t) => {
    t.string('id', 36).primary();
    t.string('user_id', 36).notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.string('new_email', 254).notNullable();
    // SHA-256 of the token; the token itself only exists in the e-mail.
    t.string('token_hash', 64).notNullable().unique();
    t.string('expires_at', 32).notNullable();
    t.string('used_at', 32);
    t.string('created_at', 32).notNullable();
    t.index(['user_id']);
  });

  // The audit trail is filtered by action and by person.
  await knex.schema.alterTable('audit_log', (t) => {
    t.index(['company_id', 'action', 'created_at'], 'audit_log_company_action');
    t.index(['company_id', 'actor_user_id', 'created_at'], 'audit_log_company_actor');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('audit_log', (t) => {
    t.dropIndex(['company_id', 'actor_user_id', 'created_at'], 'audit_log_company_actor');
    t.dropIndex(['company_id', 'action', 'created_at'], 'audit_log_company_action');
  });
  await knex.schema.dropTable('email_changes');
  await knex.schema.dropTable('price_books');
  await knex.schema.alterTable('companies', (t) => {
    t.dropColumn('logo_id');
  });
  await knex.schema.dropTable('company_logos');
}
