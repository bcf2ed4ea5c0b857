import { mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import knex, { type Knex } from 'knex';
import { migrationSource } from '../../../migrations/index.ts';

export interface DbSettings {
  dataDir: string;
  databaseUrl?: string | undefined;
  /** For tests: a database file of their own. */
  filename?: string;
}

/** The one Knex configuration: an SQLite file under DATA_DIR, or PostgreSQL when DATABASE_URL is set. */
export function knexConfig(settings: DbSettings): Knex.Config {
  const migrations = { migrationSource, tableName: 'knex_migrations' };
  if (settings.databaseUrl?.startsWith('postgres')) {
    return { client: 'pg', connection: settings.databaseUrl, pool: { min: 0, max: 10 }, migrations };
  }
  const filename = settings.filename ?? path.join(settings.dataDir, 'underfoot.sqlite');
  mkdirSync(path.dirname(filename), { recursive: true });
  return {
    client: SqliteClient,
    connection: { filename },
    useNullAsDefault: true,
    pool: {
      // better-sqlite3 is synchronous: one connection serialises writes without lock errors.
      min: 1,
      max: 1,
      afterCreate(conn: SqliteConnection, done: (err: Error | null, conn: unknown) => void) {
        try {
          reusePreparedStatements(conn);
          conn.pragma('journal_mode = WAL');
          conn.pragma('foreign_keys = ON');
          conn.pragma('busy_timeout = 5000');
          conn.pragma('synchronous = NORMAL');
          // Statistics for the query planner, as SQLite advises for a long-lived connection (see keepPlannerStatistics).
          conn.pragma('optimize = 0x10002');
          done(null, conn);
        } catch (err) {
          done(err as Error, conn);
        }
      },
    },
    migrations,
  };
}

interface SqliteConnection {
  pragma(sql: string): unknown;
  prepare(sql: string): unknown;
}

/** Distinct SQL texts kept prepared per connection; queries with long IN lists make many, so the oldest go. */
const PREPARED_STATEMENTS_KEPT = 500;

/**
 * Knex prepares every query afresh; on the hot read paths preparing cost as much as running.
 * A prepared statement is reusable (better-sqlite3 runs it synchronously, and SQLite
 * re-prepares it by itself after a schema change), so each connection keeps them by SQL text.
 */
function reusePreparedStatements(conn: SqliteConnection) {
  const prepare = conn.prepare.bind(conn);
  const kept = new Map<string, unknown>();
  conn.prepare = (sql: string) => {
    let statement = kept.get(sql);
    if (statement === undefined) {
      statement = prepare(sql);
      if (kept.size >= PREPARED_STATEMENTS_KEPT) kept.delete(kept.keys().next().value!);
      kept.set(sql, statement);
    }
    return statement;
  };
}

/*
 * Knex binds every LIMIT as a parameter (`.first()` is `limit ?`). SQLite (3.46 and later)
 * reads a bound LIMIT while planning, so a statement with `limit ?` is planned afresh each time
 * it is bound: the kept prepared statement above is parsed again on every run, which made a
 * primary-key lookup cost about twice as much (measured with better-sqlite3 12, SQLite 3.53).
 * Knex has already parsed every limit to an integer, so writing it into the SQL is safe; a
 * statement per distinct limit (1, a page size) is then reused as intended.
 */
const require = createRequire(import.meta.url);
type CompilerClass = new (...args: unknown[]) => {
  single: Record<string, unknown>;
  _getValueOrParameterFromAttribute(attribute: string, rawValue?: unknown): string;
};
const BetterSqliteClient = require('knex/lib/dialects/better-sqlite3/index.js') as typeof Knex.Client;
const SqliteQueryCompiler = require('knex/lib/dialects/sqlite3/query/sqlite-querycompiler.js') as CompilerClass;

class InlineLimitCompiler extends SqliteQueryCompiler {
  override _getValueOrParameterFromAttribute(attribute: string, rawValue?: unknown): string {
    const value = this.single[attribute];
    if (attribute === 'limit' && Number.isSafeInteger(value)) return String(value);
    return super._getValueOrParameterFromAttribute(attribute, rawValue);
  }
}

class SqliteClient extends BetterSqliteClient {
  // Knex passes a formatter as a second argument its typings leave out.
  override queryCompiler(builder: unknown, ...rest: unknown[]) {
    return new InlineLimitCompiler(this, builder, ...rest);
  }
}

export function createDb(settings: DbSettings): Knex {
  return knex(knexConfig(settings));
}

export async function migrateLatest(db: Knex): Promise<void> {
  await db.migrate.latest();
}

/** How often SQLite refreshes the planner's statistics of tables that changed much. */
const PLANNER_STATISTICS_EVERY_MS = 60 * 60_000;

/**
 * SQLite picks between indexes by the statistics ANALYZE leaves; without them it guesses, and
 * a guess that suits an empty database can walk a large table in the wrong order. SQLite's
 * advice for long-lived connections (https://sqlite.org/lang_analyze.html, "PRAGMA optimize"):
 * run PRAGMA optimize when the connection opens (afterCreate above), then periodically; it
 * re-analyzes only the tables whose size changed a lot, from a sample. PostgreSQL's autovacuum
 * keeps its own statistics. Returns a stop function.
 */
export async function keepPlannerStatistics(db: Knex, onError: (err: unknown) => void): Promise<() => void> {
  if (!isSqlite(db)) return () => {};
  // After the migrations too: on a new database the connection opened before the tables existed.
  await refreshPlannerStatistics(db).catch(onError);
  const timer = setInterval(() => void refreshPlannerStatistics(db).catch(onError), PLANNER_STATISTICS_EVERY_MS);
  timer.unref();
  return () => clearInterval(timer);
}

/** PRAGMA optimize: bounded by SQLite to a sample of each table, so quick even on a large file. */
export async function refreshPlannerStatistics(db: Knex): Promise<void> {
  if (isSqlite(db)) await db.raw('pragma optimize');
}

/** A unique or primary key clash, on SQLite or PostgreSQL. */
export function isUniqueViolation(err: unknown): boolean {
  const code = (err as { code?: string } | null)?.code ?? '';
  return code.startsWith('SQLITE_CONSTRAINT_UNIQUE') || code.startsWith('SQLITE_CONSTRAINT_PRIMARYKEY') || code === '23505';
}

/**
 * Check-then-insert work (an account for a new e-mail address) run again once when another
 * request inserted the same key between the check and the insert: the second run sees the row
 * and takes the path for an existing one. On PostgreSQL two requests can pass the check at the
 * same moment; SQLite runs one write at a time, so there it never repeats.
 */
export async function againOnUniqueViolation<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if (!isUniqueViolation(err)) throw err;
    return work();
  }
}

export function isSqlite(db: Knex): boolean {
  return db.client.config.client === SqliteClient;
}
