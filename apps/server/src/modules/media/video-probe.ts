import { open, type FileHandle } from 'node:fs/promises';

/**
 * A look inside an uploaded video's container, enough to refuse a file that was cut
 * off and to learn its length and picture size. No decoding: only the box (MP4,
 * QuickTime) or element (WebM) headers are read.
 *
 * References: ISO/IEC 14496-12 (ISO base media file format: box header, `mvhd`,
 * `tkhd`), Apple's QuickTime File Format (the same atoms), and the Matroska / WebM
 * specifications (EBML variable-size integers, Segment, Info, Tracks).
 */
export interface VideoProbe {
  durationSeconds: number | null;
  width: number | null;
  height: number | null;
}

export class VideoDamaged extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'VideoDamaged';
  }
}

async function readAt(file: FileHandle, position: number, length: number): Promise<Buffer> {
  const buffer = Buffer.alloc(length);
  const { bytesRead } = await file.read(buffer, 0, length, position);
  return buffer.subarray(0, bytesRead);
}

// The movie header is read whole; a longer one is not a phone's or a camera's.
const MAX_MOOV_BYTES = 64 * 1024 * 1024;

export async function probeVideo(path: string, container: 'mp4' | 'mov' | 'webm'): Promise<VideoProbe> {
  const file = await open(path, 'r');
  try {
    const { size } = await file.stat();
    return container === 'webm' ? await probeWebm(file, size) : await probeIsoMedia(file, size);
  } finally {
    await file.close();
  }
}

// ---------- ISO base media (MP4, QuickTime) ----------

interface Box {
  type: string;
  start: number;
  headerSize: number;
  size: number;
}

function boxesIn(buffer: Buffer, from = 0, to = buffer.length): Box[] {
  const boxes: Box[] = [];
  let offset = from;
  while (offset + 8 <= to) {
    let size = buffer.readUInt32BE(offset);
    const type = buffer.toString('latin1', offset + 4, offset + 8);
    let headerSize = 8;
    if (size === 1) {
      if (offset + 16 > to) break;
      size = Number(buffer.readBigUInt64BE(offset + 8));
      headerSize = 16;
    } else if (size === 0) {
      size = to - offset;
    }
    if (size < headerSize || offset + size > to) break;
    boxes.push({ type, start: offset, headerSize, size });
    offset += size;
  }
  return boxes;
}

async function probeIsoMedia(file: FileHandle, fileSize: number): Promise<VideoProbe> {
  let offset = 0;
  let moov: Box | undefined;
  let sawMediaData = false;
  while (offset < fileSize) {
    const header = await readAt(file, offset, 16);
    if (header.length < 8) throw new VideoDamaged('The video ends in the middle of its header.');
    let size = header.readUInt32BE(0);
    const type = header.toString('latin1', 4, 8);
    let headerSize = 8;
    if (size === 1) {
      if (header.length < 16) throw new VideoDamaged('The video ends in the middle of its header.');
      size = Number(header.readBigUInt64BE(8));
      headerSize = 16;
    } else if (size === 0) {
      size = fileSize - offset;
    }
    if (size < headerSize) throw new VideoDamaged('The video file is damaged.');
    if (offset + size > fileSize) throw new VideoDamaged('The video file is cut off: it ends before its last part is complete.');
    if (type === 'moov') moov = { type, start: offset, headerSize, size };
    if (type === 'mdat') sawMediaData = true;
    offset += size;
  }
  if (!moov) throw new VideoDamaged('The video has no index (the file may have been cut off while it was recorded).');
  if (!sawMediaData) throw new VideoDamaged('The video holds no picture data.');
  if (moov.size > MAX_MOOV_BYTES) return { durationSeconds: null, width: null, height: null };

  const body = await readAt(file, moov.start, moov.size);
  const children = boxesIn(body, moov.headerSize);
  let durationSeconds: number | null = null;
  const mvhd = children.find((b) => b.type === 'mvhd');
  if (mvhd) {
    const at = mvhd.start + mvhd.headerSize;
    const version = body[at];
    const timescale = version === 1 ? body.readUInt32BE(at + 20) : body.readUInt32BE(at + 12);
    const duration = version === 1 ? Number(body.readBigUInt64BE(at + 24)) : body.readUInt32BE(at + 16);
    if (timescale > 0) durationSeconds = Math.round((duration / timescale) * 1000) / 1000;
  }
  let width: number | null = null;
  let height: number | null = null;
  for (const trak of children.filter((b) => b.type === 'trak')) {
    const tkhd = boxesIn(body, trak.start + trak.headerSize, trak.start + trak.size).find((b) => b.type === 'tkhd');
    if (!tkhd) continue;
    const at = tkhd.start + tkhd.headerSize;
    // Width and height are the last two 16.16 fixed-point fields of the track header.
    const end = tkhd.start + tkhd.size;
    const w = body.readUInt32BE(end - 8) / 65536;
    const h = body.readUInt32BE(end - 4) / 65536;
    if (at < end && w > 0 && h > 0) {
      width = Math.round(w);
      height = Math.round(h);
      break;
    }
  }
  return { durationSeconds, width, height };
}

// ---------- WebM (Matroska / EBML) ----------

const EBML_HEADER = 0x1a45dfa3;
const SEGMENT = 0x18538067;
const INFO = 0x1549a966;
const TIMECODE_SCALE = 0x2ad7b1;
const DURATION = 0x4489;
const TRACKS = 0x1654ae6b;
const TRACK_ENTRY = 0xae;
const VIDEO = 0xe0;
const PIXEL_WIDTH = 0xb0;
const PIXEL_HEIGHT = 0xba;
const VOID = 0xec;

interface Element {
  id: number;
  /** Where the element's data starts. */
  dataStart: number;
  /** null when the size is "unknown" (live recordings write clusters that way). */
  size: number | null;
}

/** Read an element header (id with its marker bits, size without) at `offset` of `buffer`. */
function elementHeader(buffer: Buffer, offset: number): { id: number; size: number | null; length: number } | null {
  const first = buffer[offset];
  if (first === undefined || first === 0) return null;
  const idLength = Math.clz32(first) - 23;
  if (idLength > 4 || offset + idLength > buffer.length) return null;
  let id = 0;
  for (let i = 0; i < idLength; i++) id = id * 256 + buffer[offset + i]!;
  const sizeFirst = buffer[offset + idLength];
  if (sizeFirst === undefined || sizeFirst === 0) return null;
  const sizeLength = Math.clz32(sizeFirst) - 23;
  if (offset + idLength + sizeLength > buffer.length) return null;
  let size = sizeFirst & (0xff >> sizeLength);
  let allOnes = size === 0xff >> sizeLength;
  for (let i = 1; i < sizeLength; i++) {
    const byte = buffer[offset + idLength + i]!;
    size = size * 256 + byte;
    if (byte !== 0xff) allOnes = false;
  }
  return { id, size: allOnes ? null : size, length: idLength + sizeLength };
}

function childrenOf(buffer: Buffer, from: number, to: number): Element[] {
  const elements: Element[] = [];
  let offset = from;
  while (offset < to) {
    const header = elementHeader(buffer, offset);
    if (!header || header.size === null) break;
    elements.push({ id: header.id, dataStart: offset + header.length, size: header.size });
    offset += header.length + header.size;
  }
  return elements;
}

const uint = (buffer: Buffer, el: Element) => {
  let value = 0;
  for (let i = 0; i < (el.size ?? 0); i++) value = value * 256 + buffer[el.dataStart + i]!;
  return value;
};

async function probeWebm(file: FileHandle, fileSize: number): Promise<VideoProbe> {
  const head = await readAt(file, 0, 64);
  const ebml = elementHeader(head, 0);
  if (!ebml || ebml.id !== EBML_HEADER || ebml.size === null) throw new VideoDamaged('The video file is damaged.');
  const segmentOffset = ebml.length + ebml.size;
  const segmentHead = await readAt(file, segmentOffset, 12);
  const segment = elementHeader(segmentHead, 0);
  if (!segment || segment.id !== SEGMENT) throw new VideoDamaged('The video ends before its first part.');
  const dataStart = segmentOffset + segment.length;
  const dataEnd = segment.size === null ? fileSize : dataStart + segment.size;
  if (dataEnd > fileSize) throw new VideoDamaged('The video file is cut off: it ends before its last part is complete.');

  let durationSeconds: number | null = null;
  let width: number | null = null;
  let height: number | null = null;
  let timecodeScale = 1_000_000;
  let rawDuration: number | null = null;
  let sawCluster = false;
  let offset = dataStart;
  // Walk the segment's top-level elements; each must fit in the file. An element of unknown
  // size (a live recording's cluster) cannot be checked further, so the walk stops there.
  while (offset < dataEnd) {
    const head = await readAt(file, offset, 12);
    const header = elementHeader(head, 0);
    if (!header) throw new VideoDamaged('The video file is damaged.');
    if (header.id === 0x1f43b675) sawCluster = true;
    if (header.size === null) break;
    const end = offset + header.length + header.size;
    if (end > dataEnd) throw new VideoDamaged('The video file is cut off: it ends before its last part is complete.');
    if ((header.id === INFO || header.id === TRACKS) && header.size < 1_000_000) {
      const body = await readAt(file, offset + header.length, header.size);
      if (header.id === INFO) {
        for (const el of childrenOf(body, 0, body.length)) {
          if (el.id === TIMECODE_SCALE) timecodeScale = uint(body, el);
          if (el.id === DURATION && el.size === 4) rawDuration = body.readFloatBE(el.dataStart);
          if (el.id === DURATION && el.size === 8) rawDuration = body.readDoubleBE(el.dataStart);
        }
      } else {
        for (const entry of childrenOf(body, 0, body.length).filter((el) => el.id === TRACK_ENTRY)) {
          const video = childrenOf(body, entry.dataStart, entry.dataStart + entry.size!).find((el) => el.id === VIDEO);
          if (!video) continue;
          for (const el of childrenOf(body, video.dataStart, video.dataStart + video.size!)) {
            if (el.id === PIXEL_WIDTH) width = uint(body, el);
            if (el.id === PIXEL_HEIGHT) height = uint(body, el);
          }
          break;
        }
      }
    }
    offset = end;
  }
  if (!sawCluster) throw new VideoDamaged('The video holds no picture data (the file may have been cut off).');
  // After a segment of known size only more EBML may follow (another header and segment, or Void), each whole.
  // Anything else (a web page, an archive) rode along with the video, and the video is served as it came.
  if (segment.size !== null) {
    let after = dataEnd;
    while (after < fileSize) {
      const header = elementHeader(await readAt(file, after, 12), 0);
      // A further segment of unknown size (a live recording) cannot be checked past, as above.
      if (header?.id === SEGMENT && header.size === null) break;
      const end = header && header.size !== null ? after + header.length + header.size : Infinity;
      if (!header || ![EBML_HEADER, SEGMENT, VOID].includes(header.id) || end > fileSize) {
        throw new VideoDamaged('The video file has something after its end that is not video.');
      }
      after = end;
    }
  }
  // Duration is in units of the timecode scale (nanoseconds per unit; 1,000,000 = milliseconds by default).
  if (rawDuration !== null) durationSeconds = Math.round(((rawDuration * timecodeScale) / 1e9) * 1000) / 1000;
  return { durationSeconds, width, height };
}
