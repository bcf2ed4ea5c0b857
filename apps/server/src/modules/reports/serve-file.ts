import type { Request, Response } from 'express';
import { pipeline } from 'node:stream/promises';
import type { MediaStorage } from '../../storage/media-storage.ts';
import { parseRange } from '../media/byte-range.ts';

export interface StoredFile {
  key: string;
  size: number;
  mime: string;
  fileName: string;
  etag: string;
}

/**
 * Send a stored file with byte ranges (206), so a player can seek to a finding. Guests'
 * copies are revalidated on every use (`no-cache` with an ETag): a revoked link stops
 * working at once, and an unchanged file still costs only a 304.
 */
export async function sendStoredFile(req: Request, res: Response, storage: MediaStorage, file: StoredFile): Promise<void> {
  res.set({
    'Accept-Ranges': 'bytes',
    'Content-Type': file.mime,
    ETag: file.etag,
    'Cache-Control': 'private, no-cache',
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
