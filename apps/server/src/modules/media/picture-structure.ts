import { fileTypeFromBuffer } from 'file-type';

/*
 * A picture's own bytes, found by following its structure, and what comes after them. A file
 * that ends before the picture does was cut off; a picture with a page, a script, an archive or
 * a program after its end is a polyglot (valid as both), made to slip the second thing past a
 * check that looks only at the start. Both are refused, on the stills and the logo alike.
 *
 * References: JPEG, ITU-T T.81 Annex B (markers, segment lengths, entropy-coded data with 0xFF00
 * stuffing and RSTn markers, EOI 0xFFD9); PNG, W3C PNG (Third Edition) §5.3 (chunks of length,
 * type, data, CRC; IEND last); WebP, RFC 9649 §2 (a RIFF container: "RIFF", size, "WEBP").
 */

export type PictureProblem = { kind: 'cut_off' } | { kind: 'extra_content'; found: string };

/** Where the picture ends, 'cut off' if the file ends first, null if the structure cannot be followed (the decoder judges). */
export function pictureEnd(bytes: Buffer): number | 'cut off' | null {
  if (bytes[0] === 0xff && bytes[1] === 0xd8) return jpegEnd(bytes);
  if (bytes.subarray(0, 8).equals(PNG_SIGNATURE)) return pngEnd(bytes);
  if (bytes.toString('latin1', 0, 4) === 'RIFF' && bytes.toString('latin1', 8, 12) === 'WEBP') {
    const size = bytes.readUInt32LE(4);
    // A RIFF chunk's data is padded to an even length.
    const end = 8 + size + (size % 2);
    return end > bytes.length ? 'cut off' : end;
  }
  return null;
}

function jpegEnd(b: Buffer): number | 'cut off' | null {
  let i = 2;
  for (;;) {
    if (i >= b.length) return 'cut off';
    if (b[i] !== 0xff) return null;
    while (b[i] === 0xff) i++; // fill bytes before a marker
    if (i >= b.length) return 'cut off';
    const marker = b[i]!;
    i += 1;
    if (marker === 0xd9) return i; // EOI
    if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) continue; // TEM, RSTn: no length
    if (i + 2 > b.length) return 'cut off';
    const length = b.readUInt16BE(i);
    if (length < 2) return null;
    i += length;
    if (i > b.length) return 'cut off';
    if (marker !== 0xda) continue;
    // After a start of scan: entropy-coded data up to the next marker that is not a stuffed 0x00 or a restart.
    for (;;) {
      i = b.indexOf(0xff, i);
      if (i < 0 || i + 1 >= b.length) return 'cut off';
      const next = b[i + 1]!;
      if (next === 0x00 || (next >= 0xd0 && next <= 0xd7)) i += 2;
      else if (next === 0xff) i += 1;
      else break;
    }
  }
}

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

function pngEnd(b: Buffer): number | 'cut off' | null {
  let i = 8;
  for (;;) {
    if (i + 12 > b.length) return 'cut off';
    const length = b.readUInt32BE(i);
    // The format caps a chunk at 2^31 − 1 bytes (§5.3).
    if (length > 0x7fffffff) return null;
    const type = b.toString('latin1', i + 4, i + 8);
    i += 12 + length;
    if (i > b.length) return 'cut off';
    if (type === 'IEND') return i;
  }
}

/**
 * Markup and script after a picture: page and SVG tags, script URLs, event handlers. Each marker
 * is five bytes or more, so the chance of one turning up at random in megabytes of a phone's
 * binary trailer stays negligible.
 */
const MARKUP =
  /<(script|html|head|body|iframe|frame|object|embed|svg|form|meta|link|style|!doctype|\?php)(?=[\s>/])|javascript:|vbscript:|\bon(load|error|begin|click|focus|mouseover|pageshow|toggle)\s*=|document\.(cookie|domain|write)|\beval\s*\(|\bfetch\s*\(/i;

/** Bytes that appear in binary data and never in text (all C0 controls but tab, line feed, carriage return; DEL). */
// eslint-disable-next-line no-control-regex -- control characters are what marks data as binary
const BINARY_BYTE = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;

/** The end of central directory record (PKWARE APPNOTE 4.3.16); readers find a ZIP from it, whatever precedes the archive. */
const ZIP_END = Buffer.from([0x50, 0x4b, 0x05, 0x06]);
/** The record sits in the last 22 bytes plus at most a 65,535-byte comment. */
const ZIP_END_REACH = 22 + 0xffff;

/** Padding some cameras and editors leave after the end marker: zeros, spaces, line ends, and 0xFF fill (not the start of a JPEG). */
const isPadding = (b: Buffer, i: number) => [0x00, 0x20, 0x09, 0x0a, 0x0d].includes(b[i]!) || (b[i] === 0xff && b[i + 1] !== 0xd8);

/**
 * What follows a picture that should not: null for nothing, padding, or what phones themselves
 * append (a second picture such as a gain map or a depth map, a motion photo's video, a maker's
 * binary trailer); otherwise a few words naming what was found.
 */
async function extraContentAfter(bytes: Buffer, end: number, depth = 0): Promise<string | null> {
  let start = end;
  while (start < bytes.length && isPadding(bytes, start)) start++;
  if (start >= bytes.length) return null;
  const trailer = bytes.subarray(start);
  const zipEnd = bytes.lastIndexOf(ZIP_END);
  if (zipEnd >= start && zipEnd >= bytes.length - ZIP_END_REACH) return 'a ZIP archive';
  const detected = await fileTypeFromBuffer(trailer);
  if (detected?.mime.startsWith('video/')) return null;
  if (detected?.mime.startsWith('image/')) {
    // A second picture is followed in turn: what rides after it counts the same.
    const next = pictureEnd(trailer);
    return typeof next === 'number' && depth < 4 ? extraContentAfter(trailer, next, depth + 1) : null;
  }
  if (detected) return `${detected.ext.toUpperCase()} data`;
  const asText = trailer.toString('latin1');
  if (MARKUP.test(asText)) return 'a web page or script';
  if (asText.includes('%PDF-')) return 'a PDF document';
  // Phones append binary data; text after a picture (a script in any language) is not theirs.
  if (trailer.length >= 8 && !BINARY_BYTE.test(asText)) return 'text, such as a script';
  return null;
}

/** Whether a picture's bytes end where its structure says, with nothing foreign after them. */
export async function pictureProblem(bytes: Buffer): Promise<PictureProblem | null> {
  const end = pictureEnd(bytes);
  if (end === 'cut off') return { kind: 'cut_off' };
  if (end === null) return null;
  const found = await extraContentAfter(bytes, end);
  return found ? { kind: 'extra_content', found } : null;
}

/** The words for a picture refused for carrying something else. */
export const extraContentMessage = (found: string) =>
  `This picture has something else attached after its end (${found}). Save the picture again, for example from a photo app, and upload that copy.`;
