import { createReadStream, createWriteStream, mkdirSync } from 'node:fs';
import { copyFile, readdir, rename, rm, stat, unlink } from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { assertSafeKey, type ByteRange, type MediaStorage } from './media-storage.ts';

/** Files under one folder (DATA_DIR/media by default); uploads in progress under its `.incoming`. */
export function createLocalDiskStorage(root: string): MediaStorage {
  const incomingDir = path.join(root, '.incoming');
  mkdirSync(incomingDir, { recursive: true });

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
  };
}

/** Remove upload leftovers older than an hour (a crash mid-upload); newer ones may still be in progress on another request. */
export async function sweepIncoming(storage: MediaStorage, olderThanMs = 60 * 60_000): Promise<number> {
  let removed = 0;
  let names: string[];
  try {
    names = await readdir(storage.incomingDir);
  } catch {
    return 0;
  }
  const cutoff = Date.now() - olderThanMs;
  for (const name of names) {
    const file = path.join(storage.incomingDir, name);
    try {
      const info = await stat(file);
      if (info.mtimeMs < cutoff) {
        await rm(file, { force: true });
        removed += 1;
      }
    } catch {
      // Gone already.
    }
  }
  return removed;
}
