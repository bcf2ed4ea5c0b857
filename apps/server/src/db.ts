import { mkdirSync } from 'node:fs';
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
    client: 'better-sqlite3',
    connection: { filename },
    useNullAsDefault: true,
    pool: {
      // better-sqlite3 is synchronous: one connection serialises writes without lock errors.
      min: 1,
      max: 1,
      afterCreate(conn: { pragma(sql: string): unknown }, done: (err: Error | null, conn: unknown) => void) {
        try {
          conn.pragma('journal_mode = WAL');
          conn.pragma('foreign_keys = ON');
          conn.pragma('busy_timeout = 5000');
          conn.pragma('synchronous = NORMAL');
          done(null, conn);
        } catch (err) {
          done(err as Error, conn);
        }
      },
    },
    migrations,
  };
}

export function createDb(settings: DbSettings): Knex {
  return knex(knexConfig(settings));
}

export async function migrateLatest(db: Knex): Promise<void> {
  await db.migrate.latest();
}

export function isSqlite(db: Knex): boolean {
  return db.client.config.client === 'better-sqlite3';
}
