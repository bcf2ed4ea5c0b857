import type { ByteRange } from '../../storage/media-storage.ts';

/**
 * One range from an HTTP Range header (RFC 9110 §14.1.2): `bytes=0-499`, `bytes=500-`
 * or the last N bytes `bytes=-500`. Several ranges at once are answered with the whole
 * file, which the RFC allows (a server may ignore Range). `unsatisfiable` means a 416.
 */
export function parseRange(header: string | undefined, size: number): ByteRange | 'unsatisfiable' | null {
  if (!header) return null;
  const match = /^bytes=\s*(\d*)\s*-\s*(\d*)\s*$/i.exec(header.trim());
  // A header we do not understand is ignored, as the RFC asks: the whole file is sent.
  if (!match) return null;
  const [, startText = '', endText = ''] = match;
  if (startText === '' && endText === '') return null;
  if (size === 0) return 'unsatisfiable';
  if (startText === '') {
    const suffix = Number(endText);
    if (suffix === 0) return 'unsatisfiable';
    return { start: Math.max(0, size - suffix), end: size - 1 };
  }
  const start = Number(startText);
  const end = endText === '' ? size - 1 : Math.min(Number(endText), size - 1);
  if (start >= size || end < start) return 'unsatisfiable';
  return { start, end };
}
