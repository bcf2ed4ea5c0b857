import { createHash } from 'node:crypto';
import {
  cpSync,
  createReadStream,
  existsSync,
  mkdirSync,
  readdirSync,
  readFileSync,
  renameSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';

/**
 * Backups of an SQLite install: the database through SQLite's online backup API
 * (a consistent copy while the server keeps running), then every other file under
 * DATA_DIR (uploaded media, logos). Media files are written once and never edited,
 * so copying them after the database snapshot leaves no file the copy refers to missing.
 */

export const DATABASE_FILE = 'underfoot.sqlite';
const MANIFEST = 'manifest.json';
/** SQLite's own companions of the database file; the backup API folds their content into the copy. */
const DATABASE_COMPANIONS = [DATABASE_FILE, `${DATABASE_FILE}-wal`, `${DATABASE_FILE}-shm`, `${DATABASE_FILE}-journal`];

export interface BackupManifest {
  format: 'underfoot-backup-1';
  createdAt: string;
  databaseSha256: string;
  migrations: string[];
  files: number;
}

function sha256Of(file: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const hash = createHash('sha256');
    createReadStream(file)
      .on('data', (chunk) => hash.update(chunk))
      .on('end', () => resolve(hash.digest('hex')))
      .on('error', reject);
  });
}

function countFiles(dir: string): number {
  if (!existsSync(dir)) return 0;
  let n = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    n += entry.isDirectory() ? countFiles(path.join(dir, entry.name)) : 1;
  }
  return n;
}

function checkIntegrity(file: string): void {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const result = db.pragma('integrity_check', { simple: true });
    if (result !== 'ok') throw new Error(`the database copy failed SQLite's integrity check: ${String(result)}`);
  } finally {
    db.close();
  }
}

/** Write a backup of `dataDir` into `targetDir` (created; must not exist yet). */
export async function backupDataDir(dataDir: string, targetDir: string): Promise<BackupManifest> {
  const source = path.join(dataDir, DATABASE_FILE);
  if (!existsSync(source)) throw new Error(`There is no database at ${source} to back up.`);
  if (existsSync(targetDir)) throw new Error(`${targetDir} already exists; choose a new folder for the backup.`);
  const resolvedTarget = path.resolve(targetDir);
  if (resolvedTarget.startsWith(path.resolve(dataDir) + path.sep)) throw new Error('Put the backup outside the data folder.');
  mkdirSync(targetDir, { recursive: true });

  const db = new Database(source, { fileMustExist: true });
  let migrations: string[];
  try {
    db.pragma('busy_timeout = 5000');
    await db.backup(path.join(targetDir, DATABASE_FILE));
    migrations = (db.prepare('select name from knex_migrations order by id').all() as { name: string }[]).map((r) => r.name);
  } finally {
    db.close();
  }
  checkIntegrity(path.join(targetDir, DATABASE_FILE));

  const filesDir = path.join(targetDir, 'files');
  mkdirSync(filesDir);
  for (const entry of readdirSync(dataDir)) {
    if (DATABASE_COMPANIONS.includes(entry)) continue;
    cpSync(path.join(dataDir, entry), path.join(filesDir, entry), { recursive: true, preserveTimestamps: true });
  }

  const manifest: BackupManifest = {
    format: 'underfoot-backup-1',
    createdAt: new Date().toISOString(),
    databaseSha256: await sha256Of(path.join(targetDir, DATABASE_FILE)),
    migrations,
    files: countFiles(filesDir),
  };
  writeFileSync(path.join(targetDir, MANIFEST), `${JSON.stringify(manifest, null, 2)}\n`);
  return manifest;
}

/**
 * Bring a backup back into `dataDir`. The server must be stopped. What was there
 * is kept beside it as `<dataDir>.before-restore-<time>` until someone deletes it.
 */
export async function restoreDataDir(
  backupDir: string,
  dataDir: string,
): Promise<{ keptPrevious: string | null; manifest: BackupManifest }> {
  const manifestFile = path.join(backupDir, MANIFEST);
  if (!existsSync(manifestFile)) throw new Error(`${backupDir} is not an Underfoot backup (no ${MANIFEST}).`);
  const manifest = JSON.parse(readFileSync(manifestFile, 'utf8')) as BackupManifest;
  if (manifest.format !== 'underfoot-backup-1') throw new Error(`Unknown backup format ${String(manifest.format)}.`);
  const database = path.join(backupDir, DATABASE_FILE);
  if ((await sha256Of(database)) !== manifest.databaseSha256)
    throw new Error('The backup database does not match its manifest; it may be damaged.');
  checkIntegrity(database);

  let keptPrevious: string | null = null;
  if (existsSync(dataDir) && readdirSync(dataDir).length > 0) {
    keptPrevious = `${path.resolve(dataDir)}.before-restore-${new Date().toISOString().replace(/[:.]/g, '-')}`;
    renameSync(dataDir, keptPrevious);
  }
  mkdirSync(dataDir, { recursive: true });
  cpSync(database, path.join(dataDir, DATABASE_FILE));
  const filesDir = path.join(backupDir, 'files');
  if (existsSync(filesDir) && statSync(filesDir).isDirectory()) cpSync(filesDir, dataDir, { recursive: true, preserveTimestamps: true });
  return { keptPrevious, manifest };
}

export function removeBackup(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}
