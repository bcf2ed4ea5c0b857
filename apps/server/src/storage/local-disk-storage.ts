import { createHash, randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream, mkdirSync } from 'node:fs';
import { copyFile, readdir, rename, rm, rmdir, stat, unlink } from 'node:fs/promises';
import { hostname } from 'node:os';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { assertSafeKey, KEY_PATTERN, type ByteRange, type MediaStorage } from './media-storage.ts';

/** This machine in incoming folder names, so a sweep only judges processes it can see. */
const hostTag = createHash('sha256').update(hostname()).digest('hex').slice(0, 8);
/** Incoming folders this process made: alive by definition, whatever their name says. */
const ownIncomingDirs = new Set<string>();

/**
 * A folder of this process's own for uploads in progress, `<parent>/.incoming/<pid>-<host>-<random>`,
 * so the start-up sweep can tell a dead process's leftovers from another live process's uploads.
 */
export function processIncomingDir(parent: string): string {
  const dir = path.join(parent, '.incoming', `${process.pid}-${hostTag}-${randomBytes(4).toString('hex')}`);
  mkdirSync(dir, { recursive: true });
  ownIncomingDirs.add(dir);
  return dir;
}

/** Files under one folder (DATA_DIR/media by default); uploads in progress in a folder of this process under its `.incoming`. */
export function createLocalDiskStorage(root: string): MediaStorage {
  const incomingDir = processIncomingDir(root);

  const fileOf = (key: string) => {
    assertSafeKey(key);
    return path.join(root, ...key.split('/'));
  };

  return {
    incomingDir,

    async putFile(key, tempPath) {
      const target = fileOf(key);
      mkdirSync(path.dirname(target), { recursive: true });
      try {
        await rename(tempPath, target);
      } catch (err) {
        // Another disk (EXDEV): copy, then drop the temporary file.
        if ((err as NodeJS.ErrnoException).code !== 'EXDEV') throw err;
        await copyFile(tempPath, target);
        await unlink(tempPath);
      }
    },

    async putStream(key, source) {
      const target = fileOf(key);
      mkdirSync(path.dirname(target), { recursive: true });
      const partial = `${target}.partial`;
      try {
        await pipeline(source, createWriteStream(partial));
        await rename(partial, target);
      } catch (err) {
        await rm(partial, { force: true });
        throw err;
      }
    },

    async get(key: string, range?: ByteRange): Promise<Readable> {
      const file = fileOf(key);
      const stream = createReadStream(file, range ? { start: range.start, end: range.end } : {});
      // Surface a missing file as an error from this call rather than later from the stream.
      await new Promise<void>((resolve, reject) => {
        stream.once('open', () => resolve());
        stream.once('error', reject);
      });
      return stream;
    },

    async stat(key) {
      try {
        const info = await stat(fileOf(key));
        return { size: info.size };
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw err;
      }
    },

    async delete(key) {
      await rm(fileOf(key), { force: true });
    },

    async *list(prefix) {
      const start = path.join(root, ...prefix.split('/').filter(Boolean));
      const walk = async function* (folder: string): AsyncGenerator<{ key: string; modifiedAt: Date }> {
        let entries;
        try {
          entries = await readdir(folder, { withFileTypes: true });
        } catch {
          return;
        }
        for (const entry of entries) {
          const full = path.join(folder, entry.name);
          if (entry.isDirectory()) {
            if (full !== path.dirname(incomingDir)) yield* walk(full);
            continue;
          }
          const key = path.relative(root, full).split(path.sep).join('/');
          // Only real keys: a `.partial` being written is not one.
          if (!KEY_PATTERN.test(key)) continue;
          try {
            yield { key, modifiedAt: (await stat(full)).mtime };
          } catch {
            // Removed meanwhile.
          }
        }
      };
      yield* walk(start);
    },
  };
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    // EPERM: it exists, under another user.
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

async function newestChange(file: string): Promise<number> {
  const info = await stat(file);
  if (!info.isDirectory()) return info.mtimeMs;
  let newest = info.mtimeMs;
  for (const name of await readdir(file)) newest = Math.max(newest, await newestChange(path.join(file, name)));
  return newest;
}

/**
 * Remove what uploads cut off by a crash or restart left in `.incoming`: at once when the
 * process that wrote it is gone from this machine (or its pid is now ours: a container
 * restarted), otherwise once untouched for an hour, as a live upload elsewhere keeps writing.
 * An incoming folder not made by `processIncomingDir` is only cleared of its own old files.
 */
export async function sweepIncoming(storage: MediaStorage, olderThanMs = 60 * 60_000): Promise<number> {
  const perProcess = ownIncomingDirs.has(storage.incomingDir);
  const folder = perProcess ? path.dirname(storage.incomingDir) : storage.incomingDir;
  let entries;
  try {
    entries = await readdir(folder, { withFileTypes: true });
  } catch {
    return 0;
  }
  const cutoff = Date.now() - olderThanMs;
  let removed = 0;
  for (const entry of entries) {
    const full = path.join(folder, entry.name);
    if (ownIncomingDirs.has(full) || (!perProcess && entry.isDirectory())) continue;
    const owner = entry.isDirectory() ? /^(\d+)-([0-9a-f]{8})-[0-9a-f]+$/.exec(entry.name) : null;
    const pid = Number(owner?.[1]);
    const ownerGone = owner?.[2] === hostTag && (pid === process.pid || !processAlive(pid));
    try {
      if (ownerGone || (await newestChange(full)) < cutoff) {
        await rm(full, { recursive: true, force: true });
        removed += 1;
      }
    } catch {
      // Gone already.
    }
  }
  return removed;
}

/** On a clean stop: this process's incoming folder goes, if nothing is left in it. */
export async function releaseIncoming(storage: MediaStorage): Promise<void> {
  if (!ownIncomingDirs.delete(storage.incomingDir)) return;
  await rmdir(storage.incomingDir).catch(() => undefined);
}
