import type { Request, Response } from 'express';
import { pipeline } from 'node:stream/promises';
import type { MediaStorage } from '../../storage/media-storage.ts';
import { parseRange } from './byte-range.ts';

export interface StoredFile {
  key: string;
  size: number;
  mime: string;
  fileName: string;
  etag: string;
}

/**
 * How long a browser may keep a file. Signed-in readers keep theirs a day: files never change
 * under an id (new markup makes a new rendered copy). Guests revalidate on every use: a revoked
 * link stops working at once, and an unchanged file still costs only a 304.
 */
export const fileCaching = {
  signedIn: 'private, max-age=86400',
  guest: 'private, no-cache',
} as const;

/** Send a stored file with ETag revalidation and byte ranges (206), so a player can seek to a finding. */
export async function sendStoredFile(
  req: Request,
  res: Response,
  storage: MediaStorage,
  file: StoredFile,
  caching: (typeof fileCaching)[keyof typeof fileCaching],
): Promise<void> {
  res.set({
    'Accept-Ranges': 'bytes',
    'Content-Type': file.mime,
    ETag: file.etag,
    'Cache-Control': caching,
    'Content-Disposition': `inline; filename="${file.fileName}"`,
  });
  if (req.headers['if-none-match'] === file.etag) {
    res.status(304).end();
    return;
  }
  const ifRange = req.headers['if-range'];
  const range = ifRange && ifRange !== file.etag ? null : parseRange(req.headers.range, file.size);
  if (range === 'unsatisfiable') {
    res.status(416).set('Content-Range', `bytes */${file.size}`).end();
    return;
  }
  if (range) {
    res
      .status(206)
      .set({ 'Content-Range': `bytes ${range.start}-${range.end}/${file.size}`, 'Content-Length': String(range.end - range.start + 1) });
  } else {
    res.status(200).set('Content-Length', String(file.size));
  }
  if (req.method === 'HEAD') {
    res.end();
    return;
  }
  try {
    await pipeline(await storage.get(file.key, range ?? undefined), res);
  } catch (err) {
    // A player that stops reading (seeking elsewhere, tab closed) is ordinary, not an error.
    const code = (err as NodeJS.ErrnoException).code;
    if (code !== 'ERR_STREAM_PREMATURE_CLOSE' && code !== 'EPIPE' && code !== 'ECONNRESET') throw err;
  }
}
