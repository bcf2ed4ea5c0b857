import { readdirSync } from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';

/*
 * Small, structurally real media files for the upload tests: ISO base media boxes
 * (ISO/IEC 14496-12) and EBML elements (Matroska/WebM) with just enough inside for the
 * server's content checks. They are containers, not watchable video; the demo's
 * playable video comes from seeds/media.
 */

const u32 = (n: number) => {
  const b = Buffer.alloc(4);
  b.writeUInt32BE(n);
  return b;
};

const box = (type: string, ...parts: Buffer[]) => {
  const body = Buffer.concat(parts);
  return Buffer.concat([u32(body.length + 8), Buffer.from(type, 'latin1'), body]);
};

/** An MP4 (or QuickTime, with brand "qt  ") with a movie header, one video track header and some media data. */
export function sampleIsoVideo(options: { brand?: string; seconds?: number; width?: number; height?: number; payloadBytes?: number } = {}) {
  const { brand = 'isom', seconds = 12.5, width = 320, height = 240, payloadBytes = 4000 } = options;
  const timescale = 1000;
  const mvhd = box(
    'mvhd',
    Buffer.from([0, 0, 0, 0]),
    u32(0),
    u32(0),
    u32(timescale),
    u32(Math.round(seconds * timescale)),
    Buffer.alloc(80),
  );
  // tkhd v0: flags, times, track id, reserved, duration, reserved, layer, group, volume, reserved, matrix, width, height.
  const tkhd = box(
    'tkhd',
    Buffer.from([0, 0, 0, 3]),
    u32(0),
    u32(0),
    u32(1),
    u32(0),
    u32(Math.round(seconds * timescale)),
    Buffer.alloc(8),
    Buffer.alloc(8),
    Buffer.alloc(36),
    u32(width * 65536),
    u32(height * 65536),
  );
  const ftyp = box('ftyp', Buffer.from(brand.padEnd(4, ' '), 'latin1'), u32(0), Buffer.from('isomiso2avc1mp41', 'latin1'));
  const payload = Buffer.alloc(payloadBytes);
  for (let i = 0; i < payload.length; i++) payload[i] = (i * 31 + 7) % 251;
  return Buffer.concat([ftyp, box('moov', mvhd, box('trak', tkhd)), box('mdat', payload)]);
}

const ebmlSize = (n: number) => {
  // Always the 8-byte form: 0x01 then 7 bytes of size.
  const b = Buffer.alloc(8);
  b[0] = 0x01;
  b.writeUIntBE(n, 2, 6);
  return b;
};
const element = (id: number[], ...parts: Buffer[]) => {
  const body = Buffer.concat(parts);
  return Buffer.concat([Buffer.from(id), ebmlSize(body.length), body]);
};
const uintBytes = (n: number, length: number) => {
  const b = Buffer.alloc(length);
  b.writeUIntBE(n, 0, length);
  return b;
};

/** A WebM with an EBML header, Info (duration), Tracks (picture size) and one cluster. */
export function sampleWebm(options: { seconds?: number; width?: number; height?: number; payloadBytes?: number } = {}) {
  const { seconds = 8, width = 640, height = 360, payloadBytes = 3000 } = options;
  const header = element(
    [0x1a, 0x45, 0xdf, 0xa3],
    element([0x42, 0x86], uintBytes(1, 1)),
    element([0x42, 0x82], Buffer.from('webm')),
    element([0x42, 0x87], uintBytes(2, 1)),
  );
  const duration = Buffer.alloc(8);
  duration.writeDoubleBE(seconds * 1000);
  const info = element([0x15, 0x49, 0xa9, 0x66], element([0x2a, 0xd7, 0xb1], uintBytes(1_000_000, 3)), element([0x44, 0x89], duration));
  const tracks = element(
    [0x16, 0x54, 0xae, 0x6b],
    element(
      [0xae],
      element([0xd7], uintBytes(1, 1)),
      element([0x86], Buffer.from('V_VP8')),
      element([0xe0], element([0xb0], uintBytes(width, 2)), element([0xba], uintBytes(height, 2))),
    ),
  );
  const cluster = element([0x1f, 0x43, 0xb6, 0x75], element([0xe7], uintBytes(0, 1)), element([0xa3], Buffer.alloc(payloadBytes, 0x5a)));
  return Buffer.concat([header, element([0x18, 0x53, 0x80, 0x67], info, tracks, cluster)]);
}

/** A JPEG as a phone writes it: rotated by an EXIF orientation tag, with the camera make and a GPS position. */
export function phoneJpeg(width = 600, height = 400) {
  return sharp({ create: { width, height, channels: 3, background: '#6b5a48' } })
    .composite([
      {
        input: { create: { width: Math.round(width / 4), height: Math.round(height / 4), channels: 3, background: '#ff0000' } },
        top: 0,
        left: 0,
      },
    ])
    .withExif({ IFD0: { Make: 'Pocket Camera Co', Model: 'Field 7' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '45/1 30/1 12/1' } })
    .withMetadata({ orientation: 6 })
    .jpeg({ quality: 90 })
    .toBuffer();
}

export function plainPng(width = 300, height = 200) {
  return sharp({ create: { width, height, channels: 4, background: { r: 30, g: 90, b: 130, alpha: 1 } } })
    .png()
    .toBuffer();
}

/** A PNG header claiming 30,000 × 30,000 pixels (900 MP) over a few bytes: a decompression bomb's calling card. */
export function enormousPngHeader() {
  const crcTable = Array.from({ length: 256 }, (_, n) => {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    return c >>> 0;
  });
  const crc = (buf: Buffer) => {
    let c = 0xffffffff;
    for (const byte of buf) c = crcTable[(c ^ byte) & 0xff]! ^ (c >>> 8);
    return (c ^ 0xffffffff) >>> 0;
  };
  const chunk = (type: string, data: Buffer) => {
    const typed = Buffer.concat([Buffer.from(type, 'latin1'), data]);
    return Buffer.concat([u32(data.length), typed, u32(crc(typed))]);
  };
  const ihdr = Buffer.concat([u32(30_000), u32(30_000), Buffer.from([8, 2, 0, 0, 0])]);
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', Buffer.from([0x78, 0x9c, 0x03, 0x00, 0x00, 0x00, 0x00, 0x01])),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

export const svgPicture = Buffer.from(
  '<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="100" height="100"><script>alert(1)</script><circle cx="50" cy="50" r="40"/></svg>',
);
export const htmlPage = Buffer.from('<!doctype html><html><head><title>x</title></head><body><script>alert(1)</script></body></html>');

/** Every stored file under the media folder, leftovers in `.incoming` included. */
export function filesUnder(dir: string): string[] {
  const found: string[] = [];
  const walk = (folder: string) => {
    let entries;
    try {
      entries = readdirSync(folder, { withFileTypes: true });
    } catch {
      return;
    }
    for (const entry of entries) {
      const full = path.join(folder, entry.name);
      if (entry.isDirectory()) walk(full);
      else found.push(path.relative(dir, full));
    }
  };
  walk(dir);
  return found.sort();
}
