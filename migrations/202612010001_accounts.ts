import type { Knex } from 'knex';

// Ids are random UUID strings (no guessable sequence); times are ISO-8601 UTC strings, which sort
// and compare the same way in SQLite and PostgreSQL.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('companies', (t) => {
    t.string('id', 36).primary();
    t.string('name', 200).notNullable();
    t.string('licence_number', 100);
    t.string('phone', 50);
    t.string('email', 254);
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
  });

  await knex.schema.createTable('users', (t) => {
    t.string('id', 36).primary();
    t.string('company_id', 36).notNullable().references('id').inTable('companies').onDelete('RESTRICT');
    // Stored lower-cased by the application; the unique index below holds even if a caller forgets.
    t.string('email', 254).notNullable();
    t.string('name', 120).notNullable();
    t.enu('role', ['office', 'inspector', 'agent', 'client'], { useNative: false, enumName: 'user_role' }).notNullable();
    t.string('password_hash', 255);
    t.string('disabled_at', 32);
    t.string('email_verified_at', 32);
    t.string('created_at', 32).notNullable();
    t.string('updated_at', 32).notNullable();
    t.index(['company_id', 'role']);
  });
  await knex.raw('CREATE UNIQUE INDEX users_email_lower_unique ON users (lower(email))');

  await knex.schema.createTable('one_time_tokens', (t) => {
    t.string('id', 36).primary();
    t.string('user_id', 36).notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.enu('purpose', ['password_reset', 'invitation', 'email_verification'], { useNative: false, enumName: 'token_purpose' }).notNullable();
    // SHA-256 of the token; the token itself only ever exists in the e-mail.
    t.string('token_hash', 64).notNullable().unique();
    t.string('expires_at', 32).notNullable();
    t.string('used_at', 32);
    t.string('created_at', 32).notNullable();
    t.index(['user_id', 'purpose']);
  });

  // Same shape connect-session-knex would create; made here so every table has a migration with a down.
  await knex.schema.createTable('sessions', (t) => {
    t.string('sid', 255).primary();
    t.json('sess').notNullable();
    t.timestamp('expired', { useTz: true }).notNullable().index();
  });

  // Sign-in throttling counters live in the database so every server instance sees the same counts.
  await knex.schema.createTable('rate_limits', (t) => {
    t.string('key', 300).primary();
    t.integer('hits').notNullable();
    t.string('reset_at', 32).notNullable();
  });

  await knex.schema.createTable('audit_log', (t) => {
    t.increments('id').primary();
    t.string('company_id', 36).references('id').inTable('companies').onDelete('CASCADE');
    t.string('actor_user_id', 36).references('id').inTable('users').onDelete('SET NULL');
    t.string('action', 80).notNullable();
    t.string('subject_type', 40);
    t.string('subject_id', 36);
    t.text('detail');
    t.string('ip', 64);
    t.string('created_at', 32).notNullable();
    t.index(['company_id', 'created_at']);
    t.index(['subject_type', 'subject_id']);
  });

  await knex.schema.createTable('mail_outbox', (t) => {
    t.increments('id').primary();
    t.string('company_id', 36).references('id').inTable('companies').onDelete('SET NULL');
    t.string('to_address', 254).notNullable();
    t.string('subject', 300).notNullable();
    t.text('text_body').notNullable();
    t.text('html_body').notNullable();
    t.string('template', 60).notNullable();
    // Sent as the Message-ID header so a receiver can drop a copy sent twice after a crash.
    t.string('message_id', 200).notNullable().unique();
    t.enu('status', ['pending', 'sent', 'failed'], { useNative: false, enumName: 'mail_status' }).notNullable().defaultTo('pending');
    t.integer('attempts').notNullable().defaultTo(0);
    t.string('next_attempt_at', 32).notNullable();
    t.string('locked_until', 32);
    t.text('last_error');
    t.string('sent_at', 32);
    t.string('created_at', 32).notNullable();
    t.index(['status', 'next_attempt_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('mail_outbox');
  await knex.schema.dropTable('audit_log');
  await knex.schema.dropTable('rate_limits');
  await knex.schema.dropTable('sessions');
  await knex.schema.dropTable('one_time_tokens');
  await knex.schema.dropTable('users');
  await knex.schema.dropTable('companies');
}
