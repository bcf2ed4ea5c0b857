import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import { HttpError } from '../../http/errors.ts';
import { extraContentMessage, pictureProblem } from '../media/picture-structure.ts';

/** Largest logo file accepted; a logo is a small picture, and the upload is held in memory. */
export const MAX_LOGO_BYTES = 2 * 1024 * 1024;
/** Refuse images that would decode to more pixels than this (decompression bombs), before decoding them. */
const MAX_LOGO_PIXELS = 25_000_000;
/** Every logo is made to fit this box, never enlarged: wide word marks and square badges both stay sharp in e-mails and reports. */
export const LOGO_BOX = { width: 600, height: 240 } as const;

/** Decided by the file's content, never its name or the browser's claim. SVG is refused: it can carry script. */
const accepted = new Set(['image/png', 'image/jpeg', 'image/webp']);

export interface ProcessedLogo {
  png: Buffer;
  width: number;
  height: number;
}

const unsupported = () =>
  new HttpError(
    415,
    'unsupported_image',
    'The logo must be a PNG, JPEG or WebP picture. This file is not one of those (we check its content, not its name).',
  );

/**
 * Check an uploaded logo by its content, then re-encode it as a PNG that fits
 * the logo box: orientation applied, metadata (camera, location) dropped,
 * nothing of the original file kept.
 */
export async function processLogo(upload: Buffer): Promise<ProcessedLogo> {
  if (upload.length === 0) throw new HttpError(400, 'empty_file', 'The file is empty. Choose the logo picture again.');
  const detected = await fileTypeFromBuffer(upload);
  if (!detected || !accepted.has(detected.mime)) throw unsupported();
  // As for stills: a file cut off before the picture's end, or a picture with something else attached (a polyglot), is refused.
  const structure = await pictureProblem(upload);
  if (structure?.kind === 'cut_off') {
    throw new HttpError(
      422,
      'unreadable_image',
      'This picture is cut off: the file ends before the picture does. Save it again and retry.',
    );
  }
  if (structure?.kind === 'extra_content') throw new HttpError(422, 'image_extra_content', extraContentMessage(structure.found));
  try {
    const { data, info } = await sharp(upload, { limitInputPixels: MAX_LOGO_PIXELS, failOn: 'error' })
      .rotate()
      .resize({ width: LOGO_BOX.width, height: LOGO_BOX.height, fit: 'inside', withoutEnlargement: true })
      // sharp writes no metadata unless asked to (keepMetadata/withMetadata), so EXIF and GPS go.
      .png({ compressionLevel: 9 })
      .toBuffer({ resolveWithObject: true });
    return { png: data, width: info.width, height: info.height };
  } catch (err) {
    if (err instanceof Error && /pixel limit/i.test(err.message)) {
      throw new HttpError(
        413,
        'image_too_large',
        'This picture has too many pixels for a logo. Save it smaller (under 5,000 × 5,000) and try again.',
      );
    }
    throw new HttpError(
      422,
      'unreadable_image',
      'This picture could not be read; the file may be damaged. Save it again as PNG or JPEG and retry.',
    );
  }
}
