/**
 * A small H.264 + MP4 writer for the demo's generated video, with no encoder to install.
 *
 * Every macroblock is coded as I_PCM: its samples are stored as they are (ITU-T H.264
 * §7.3.5, mb_type 25 in an I slice), so no transform, prediction or entropy coding is
 * needed and any H.264 decoder plays it. The price is size (uncompressed 4:2:0, about
 * 1.5 bytes a pixel), which is why the demo video is small and short and is generated at
 * seed time rather than committed.
 *
 * Container: ISO/IEC 14496-12 (ISO base media) with the AVC sample entry and
 * configuration record of ISO/IEC 14496-15; the movie header comes before the media
 * data so players can start before the whole file arrives.
 */

/** A picture in 4:2:0: Y at full size, Cb and Cr at half width and height, 8 bits each. */
export interface YuvFrame {
  y: Uint8Array;
  cb: Uint8Array;
  cr: Uint8Array;
}

class BitWriter {
  private bytes: number[] = [];
  private current = 0;
  private filled = 0;

  bit(value: number) {
    this.current = (this.current << 1) | (value & 1);
    this.filled += 1;
    if (this.filled === 8) {
      this.bytes.push(this.current);
      this.current = 0;
      this.filled = 0;
    }
  }

  bits(value: number, count: number) {
    for (let i = count - 1; i >= 0; i--) this.bit((value >>> i) & 1);
  }

  /** Unsigned Exp-Golomb (§9.1). */
  ue(value: number) {
    const coded = value + 1;
    const length = Math.floor(Math.log2(coded));
    this.bits(0, length);
    this.bits(coded, length + 1);
  }

  /** Signed Exp-Golomb (§9.1.1). */
  se(value: number) {
    this.ue(value <= 0 ? -2 * value : 2 * value - 1);
  }

  get aligned() {
    return this.filled === 0;
  }

  alignZero() {
    while (!this.aligned) this.bit(0);
  }

  /** rbsp_trailing_bits: a stop bit, then zeros to the byte boundary. */
  trailing() {
    this.bit(1);
    this.alignZero();
  }

  /** Whole bytes, when aligned (PCM samples). */
  raw(data: Uint8Array) {
    if (!this.aligned) throw new Error('raw bytes need a byte-aligned writer');
    for (const byte of data) this.bytes.push(byte);
  }

  toBytes(): Uint8Array {
    if (!this.aligned) throw new Error('unaligned end of bitstream');
    return Uint8Array.from(this.bytes);
  }
}

/** Emulation prevention (§7.4.1): no 00 00 0x (x ≤ 3) inside a NAL unit. */
function escape(rbsp: Uint8Array): Uint8Array {
  const out: number[] = [];
  let zeros = 0;
  for (const byte of rbsp) {
    if (zeros >= 2 && byte <= 3) {
      out.push(3);
      zeros = 0;
    }
    out.push(byte);
    zeros = byte === 0 ? zeros + 1 : 0;
  }
  return Uint8Array.from(out);
}

function nal(refIdc: number, type: number, rbsp: Uint8Array): Uint8Array {
  const escaped = escape(rbsp);
  const unit = new Uint8Array(escaped.length + 1);
  unit[0] = (refIdc << 5) | type;
  unit.set(escaped, 1);
  return unit;
}

// Constrained Baseline profile (profile_idc 66 with constraint_set0 and set1), level 3.0.
const PROFILE = 66;
const CONSTRAINTS = 0xc0;
const LEVEL = 30;
const LOG2_MAX_FRAME_NUM = 4;
const LOG2_MAX_POC_LSB = 16;

function sequenceParameterSet(widthMbs: number, heightMbs: number): Uint8Array {
  const w = new BitWriter();
  w.bits(PROFILE, 8);
  w.bits(CONSTRAINTS, 8);
  w.bits(LEVEL, 8);
  w.ue(0); // seq_parameter_set_id
  w.ue(LOG2_MAX_FRAME_NUM - 4);
  w.ue(0); // pic_order_cnt_type 0: the order is written in each slice
  w.ue(LOG2_MAX_POC_LSB - 4);
  w.ue(1); // max_num_ref_frames
  w.bit(0); // gaps_in_frame_num_value_allowed_flag
  w.ue(widthMbs - 1);
  w.ue(heightMbs - 1);
  w.bit(1); // frame_mbs_only_flag
  w.bit(1); // direct_8x8_inference_flag
  w.bit(0); // frame_cropping_flag
  w.bit(0); // vui_parameters_present_flag
  w.trailing();
  return nal(3, 7, w.toBytes());
}

function pictureParameterSet(): Uint8Array {
  const w = new BitWriter();
  w.ue(0); // pic_parameter_set_id
  w.ue(0); // seq_parameter_set_id
  w.bit(0); // entropy_coding_mode_flag: CAVLC
  w.bit(0); // bottom_field_pic_order_in_frame_present_flag
  w.ue(0); // num_slice_groups_minus1
  w.ue(0); // num_ref_idx_l0_default_active_minus1
  w.ue(0); // num_ref_idx_l1_default_active_minus1
  w.bit(0); // weighted_pred_flag
  w.bits(0, 2); // weighted_bipred_idc
  w.se(0); // pic_init_qp_minus26
  w.se(0); // pic_init_qs_minus26
  w.se(0); // chroma_qp_index_offset
  w.bit(0); // deblocking_filter_control_present_flag (PCM macroblocks are not filtered: qP 0)
  w.bit(0); // constrained_intra_pred_flag
  w.bit(0); // redundant_pic_cnt_present_flag
  w.trailing();
  return nal(3, 8, w.toBytes());
}

/**
 * One picture, one slice, every macroblock I_PCM. The first picture is an IDR picture;
 * the rest are non-reference intra pictures (nal_ref_idc 0, so each has frame_num 1
 * after the IDR, §7.4.3), ordered by pic_order_cnt_lsb.
 */
function slice(frame: YuvFrame, width: number, widthMbs: number, heightMbs: number, index: number): Uint8Array {
  const idr = index === 0;
  const w = new BitWriter();
  w.ue(0); // first_mb_in_slice
  w.ue(7); // slice_type: I (all slices of the picture)
  w.ue(0); // pic_parameter_set_id
  w.bits(idr ? 0 : 1, LOG2_MAX_FRAME_NUM); // frame_num
  if (idr) w.ue(0); // idr_pic_id
  w.bits((2 * index) % (1 << LOG2_MAX_POC_LSB), LOG2_MAX_POC_LSB); // pic_order_cnt_lsb
  if (idr) {
    // dec_ref_pic_marking() of an IDR picture
    w.bit(0); // no_output_of_prior_pics_flag
    w.bit(0); // long_term_reference_flag
  }
  w.se(0); // slice_qp_delta
  const luma = new Uint8Array(256);
  const chroma = new Uint8Array(64);
  const chromaWidth = width / 2;
  for (let my = 0; my < heightMbs; my++) {
    for (let mx = 0; mx < widthMbs; mx++) {
      w.ue(25); // mb_type I_PCM
      w.alignZero(); // pcm_alignment_zero_bit
      for (let row = 0; row < 16; row++) {
        luma.set(frame.y.subarray((my * 16 + row) * width + mx * 16, (my * 16 + row) * width + mx * 16 + 16), row * 16);
      }
      w.raw(luma);
      for (const plane of [frame.cb, frame.cr]) {
        for (let row = 0; row < 8; row++) {
          chroma.set(plane.subarray((my * 8 + row) * chromaWidth + mx * 8, (my * 8 + row) * chromaWidth + mx * 8 + 8), row * 8);
        }
        w.raw(chroma);
      }
    }
  }
  w.trailing();
  return idr ? nal(3, 5, w.toBytes()) : nal(0, 1, w.toBytes());
}

// ---------- MP4 boxes ----------

function u32(n: number) {
  const b = new Uint8Array(4);
  new DataView(b.buffer).setUint32(0, n);
  return b;
}
function u16(n: number) {
  const b = new Uint8Array(2);
  new DataView(b.buffer).setUint16(0, n);
  return b;
}
const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));
function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let offset = 0;
  for (const p of parts) {
    out.set(p, offset);
    offset += p.length;
  }
  return out;
}
function box(type: string, ...parts: Uint8Array[]) {
  const body = concat(parts);
  return concat([u32(body.length + 8), ascii(type), body]);
}
const fullBox = (type: string, version: number, flags: number, ...parts: Uint8Array[]) =>
  box(type, Uint8Array.of(version, (flags >> 16) & 0xff, (flags >> 8) & 0xff, flags & 0xff), ...parts);
// The identity transformation matrix (§8.2.2): 16.16 fixed point, w in 2.30.
const MATRIX = concat([u32(0x00010000), u32(0), u32(0), u32(0), u32(0x00010000), u32(0), u32(0), u32(0), u32(0x40000000)]);

export interface VideoOptions {
  width: number;
  height: number;
  fps: number;
}

/** Encode the frames as an MP4 file (H.264, I_PCM, constant frame rate). */
export function encodeMp4(frames: YuvFrame[], { width, height, fps }: VideoOptions): Uint8Array {
  if (width % 16 !== 0 || height % 16 !== 0) throw new Error('width and height must be multiples of 16');
  const widthMbs = width / 16;
  const heightMbs = height / 16;
  const sps = sequenceParameterSet(widthMbs, heightMbs);
  const pps = pictureParameterSet();
  // Each sample: one slice NAL unit with a 4-byte length in front (ISO/IEC 14496-15).
  const samples = frames.map((frame, i) => {
    const unit = slice(frame, width, widthMbs, heightMbs, i);
    return concat([u32(unit.length), unit]);
  });
  const timescale = fps * 1000;
  const sampleDelta = 1000;
  const durationMs = Math.round((frames.length / fps) * 1000);
  const mediaDuration = frames.length * sampleDelta;

  const avcC = box(
    'avcC',
    Uint8Array.of(1, PROFILE, CONSTRAINTS, LEVEL, 0xff, 0xe1),
    u16(sps.length),
    sps,
    Uint8Array.of(1),
    u16(pps.length),
    pps,
  );
  const compressorName = new Uint8Array(32);
  const avc1 = box(
    'avc1',
    new Uint8Array(6),
    u16(1), // data_reference_index
    new Uint8Array(16), // pre_defined, reserved, pre_defined
    u16(width),
    u16(height),
    u32(0x00480000), // 72 dpi
    u32(0x00480000),
    u32(0),
    u16(1), // frame_count
    compressorName,
    u16(0x0018), // depth
    u16(0xffff), // pre_defined = -1
    avcC,
  );

  const sampleOffsets = (start: number) => {
    const offsets: number[] = [];
    let at = start;
    for (const sample of samples) {
      offsets.push(at);
      at += sample.length;
    }
    return offsets;
  };
  const moovFor = (mdatDataOffset: number) =>
    box(
      'moov',
      fullBox(
        'mvhd',
        0,
        0,
        u32(0),
        u32(0),
        u32(1000),
        u32(durationMs),
        u32(0x00010000),
        u16(0x0100),
        new Uint8Array(10),
        MATRIX,
        new Uint8Array(24),
        u32(2),
      ),
      box(
        'trak',
        fullBox(
          'tkhd',
          0,
          3,
          u32(0),
          u32(0),
          u32(1),
          u32(0),
          u32(durationMs),
          new Uint8Array(8),
          u16(0),
          u16(0),
          u16(0),
          u16(0),
          MATRIX,
          u32(width << 16),
          u32(height << 16),
        ),
        box(
          'mdia',
          fullBox('mdhd', 0, 0, u32(0), u32(0), u32(timescale), u32(mediaDuration), u16(0x55c4) /* "und" */, u16(0)),
          fullBox('hdlr', 0, 0, u32(0), ascii('vide'), new Uint8Array(12), ascii('Underfoot demo video\0')),
          box(
            'minf',
            fullBox('vmhd', 0, 1, new Uint8Array(8)),
            box('dinf', fullBox('dref', 0, 0, u32(1), fullBox('url ', 0, 1))),
            box(
              'stbl',
              fullBox('stsd', 0, 0, u32(1), avc1),
              fullBox('stts', 0, 0, u32(1), u32(frames.length), u32(sampleDelta)),
              // Decoding starts at the IDR picture; a seek decodes forward from it (cheap: PCM needs no arithmetic).
              fullBox('stss', 0, 0, u32(1), u32(1)),
              // One sample per chunk, each with its own offset: the layout players handle best when seeking.
              fullBox('stsc', 0, 0, u32(1), u32(1), u32(1), u32(1)),
              fullBox('stsz', 0, 0, u32(0), u32(frames.length), ...samples.map((s) => u32(s.length))),
              fullBox('stco', 0, 0, u32(samples.length), ...sampleOffsets(mdatDataOffset).map(u32)),
            ),
          ),
        ),
      ),
    );

  const ftyp = box('ftyp', ascii('isom'), u32(512), ascii('isomiso2avc1mp41'));
  const moovSize = moovFor(0).length;
  const mediaBytes = samples.reduce((n, s) => n + s.length, 0);
  const mdatHeader = concat([u32(mediaBytes + 8), ascii('mdat')]);
  const moov = moovFor(ftyp.length + moovSize + 8);
  return concat([ftyp, moov, mdatHeader, ...samples]);
}

/** RGB (8 bits, interleaved) to 4:2:0 with BT.601 studio range (ITU-R BT.601: Y 16–235, Cb/Cr 16–240). */
export function rgbToYuv420(rgb: Uint8Array | Buffer, width: number, height: number): YuvFrame {
  const y = new Uint8Array(width * height);
  const cb = new Uint8Array((width / 2) * (height / 2));
  const cr = new Uint8Array((width / 2) * (height / 2));
  for (let row = 0; row < height; row++) {
    for (let col = 0; col < width; col++) {
      const i = (row * width + col) * 3;
      const r = rgb[i]!;
      const g = rgb[i + 1]!;
      const b = rgb[i + 2]!;
      y[row * width + col] = Math.round(16 + (65.481 * r + 128.553 * g + 24.966 * b) / 255);
    }
  }
  for (let row = 0; row < height / 2; row++) {
    for (let col = 0; col < width / 2; col++) {
      let r = 0;
      let g = 0;
      let b = 0;
      for (const [dy, dx] of [
        [0, 0],
        [0, 1],
        [1, 0],
        [1, 1],
      ] as const) {
        const i = ((row * 2 + dy) * width + col * 2 + dx) * 3;
        r += rgb[i]!;
        g += rgb[i + 1]!;
        b += rgb[i + 2]!;
      }
      r /= 4;
      g /= 4;
      b /= 4;
      cb[row * (width / 2) + col] = Math.round(128 + (-37.797 * r - 74.203 * g + 112 * b) / 255);
      cr[row * (width / 2) + col] = Math.round(128 + (112 * r - 93.786 * g - 18.214 * b) / 255);
    }
  }
  return { y, cb, cr };
}
