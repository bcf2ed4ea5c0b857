import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync, appendFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { backupDataDir, restoreDataDir } from '@underfoot/server';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

let ctx: TestContext;
let scratch: string;
beforeAll(async () => {
  ctx = await createTestContext();
  scratch = mkdtempSync(path.join(tmpdir(), 'underfoot-backup-'));
});
afterAll(async () => {
  await ctx.close();
  rmSync(scratch, { recursive: true, force: true });
});

const countUsers = (file: string) => {
  const db = new Database(file, { readonly: true });
  try {
    return (db.prepare('select count(*) as n from users').get() as { n: number }).n;
  } finally {
    db.close();
  }
};

// Backup and restore copy the SQLite file through SQLite's online backup API; a PostgreSQL install
// is backed up with pg_dump instead (scripts/backup.ts says so), so there is nothing of ours to test there.
describe.skipIf(Boolean(process.env.DATABASE_URL))('backup and restore', () => {
  it('round-trips the database and the uploads while the server keeps running', async () => {
    // Activity in flight: a sign-in writes a session and an audit row through the live connection.
    const client = await browserLikeAgent(ctx.app);
    expect((await client.signIn(ctx.users.office.email)).status).toBe(200);
    mkdirSync(path.join(ctx.config.dataDir, 'media', 'stills'), { recursive: true });
    writeFileSync(path.join(ctx.config.dataDir, 'media', 'stills', 'frame-1.webp'), Buffer.from('still bytes'));
    const usersBefore = await ctx.services.db('users').count({ n: '*' }).first();

    const backup = path.join(scratch, 'nightly');
    const manifest = await backupDataDir(ctx.config.dataDir, backup);
    expect(manifest.migrations.length).toBeGreaterThan(0);
    expect(manifest.files).toBeGreaterThanOrEqual(1);
    expect(countUsers(path.join(backup, 'underfoot.sqlite'))).toBe(Number(usersBefore?.n));

    // Later changes are not in the backup.
    await ctx.addUser('agent', 'after.backup@realty.test');

    const restoredDir = path.join(scratch, 'restored');
    const { keptPrevious } = await restoreDataDir(backup, restoredDir);
    expect(keptPrevious).toBeNull();
    expect(countUsers(path.join(restoredDir, 'underfoot.sqlite'))).toBe(Number(usersBefore?.n));
    expect(readFileSync(path.join(restoredDir, 'media', 'stills', 'frame-1.webp'), 'utf8')).toBe('still bytes');
    const check = new Database(path.join(restoredDir, 'underfoot.sqlite'), { readonly: true });
    expect(check.pragma('integrity_check', { simple: true })).toBe('ok');
    check.close();

    // Restoring over existing data keeps the old folder aside instead of destroying it.
    const again = await restoreDataDir(backup, restoredDir);
    expect(again.keptPrevious).not.toBeNull();
    expect(existsSync(path.join(again.keptPrevious!, 'underfoot.sqlite'))).toBe(true);
  });

  it('refuses a damaged backup and leaves the data folder untouched', async () => {
    const backup = path.join(scratch, 'damaged');
    await backupDataDir(ctx.config.dataDir, backup);
    appendFileSync(path.join(backup, 'underfoot.sqlite'), Buffer.from('tampered'));
    const target = path.join(scratch, 'untouched');
    mkdirSync(target);
    writeFileSync(path.join(target, 'keep.txt'), 'mine');
    await expect(restoreDataDir(backup, target)).rejects.toThrow(/does not match its manifest/);
    expect(readFileSync(path.join(target, 'keep.txt'), 'utf8')).toBe('mine');
  });

  it('will not write over an existing backup or inside the data folder', async () => {
    await expect(backupDataDir(ctx.config.dataDir, path.join(scratch, 'nightly'))).rejects.toThrow(/already exists/);
    await expect(backupDataDir(ctx.config.dataDir, path.join(ctx.config.dataDir, 'backups', 'x'))).rejects.toThrow(
      /outside the data folder/,
    );
  });
});
