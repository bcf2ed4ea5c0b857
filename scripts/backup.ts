import path from 'node:path';
import { backupDataDir, parseConfig } from '@underfoot/server';

/** `npm run backup [-- <folder>]`: a consistent copy of the database and uploads, safe while the server runs. */
const config = parseConfig();
if (config.databaseUrl) {
  console.error(
    "DATABASE_URL points at another database server: back it up with that server's own tools (for PostgreSQL, pg_dump), and copy DATA_DIR for the uploads.",
  );
  process.exit(2);
}
const target = process.argv[2] ?? path.resolve('backups', new Date().toISOString().replace(/[:.]/g, '-'));
try {
  const manifest = await backupDataDir(config.dataDir, target);
  console.log(
    `Backup written to ${target}\n  database sha256 ${manifest.databaseSha256}\n  ${manifest.files} other files, ${manifest.migrations.length} migrations applied`,
  );
} catch (err) {
  console.error(`Backup failed: ${(err as Error).message}`);
  process.exit(1);
}
