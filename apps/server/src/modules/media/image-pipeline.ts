import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp, { type Metadata } from 'sharp';
import { renderMarkupSvg, type Markup } from '@underfoot/core';
import { extraContentMessage, pictureProblem } from './picture-structure.ts';

/*
 * Text in SVG overlays is drawn by librsvg through fontconfig, which needs a config
 * naming a folder with TTF files (STACK.md trap 8: without one, labels render as
 * boxes). Set once, before the first render; an operator's own setting wins.
 */
const fontsDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../assets/fonts');
process.env.FONTCONFIG_FILE ??= path.join(fontsDir, 'fonts.conf');

/** Long edge of the copy shown on screens and in the PDF. */
export const DISPLAY_EDGE = 1600;
/** Long edge of the thumbnail in lists. */
export const THUMBNAIL_EDGE = 320;

/** Image types accepted as stills, by their content. */
export const stillTypes = new Map([
  ['image/jpeg', 'JPEG'],
  ['image/png', 'PNG'],
  ['image/webp', 'WebP'],
]);

export class ImageRefused extends Error {
  constructor(
    public readonly code: 'image_too_large' | 'image_damaged' | 'image_extra_content',
    message: string,
  ) {
    super(message);
    this.name = 'ImageRefused';
  }
}

export interface IngestedStill {
  width: number;
  height: number;
  sizeBytes: number;
  thumbnailBytes: number;
}

/**
 * One photo or frame in, two JPEGs out: the display copy and the thumbnail. The pixel
 * count is checked from the header before anything is decoded (a small file can claim
 * enormous dimensions), orientation is applied from EXIF, and nothing of the original's
 * metadata is written out (sharp drops EXIF, GPS and XMP unless asked to keep them).
 */
export async function ingestStill(
  inputPath: string,
  output: { display: string; thumbnail: string },
  limits: { maxPixels: number },
): Promise<IngestedStill> {
  let header: Metadata;
  try {
    header = await sharp(inputPath, { limitInputPixels: false }).metadata();
  } catch {
    throw new ImageRefused('image_damaged', 'This picture could not be read; the file may be damaged or cut off.');
  }
  const pixels = (header.width ?? 0) * (header.height ?? 0);
  if (!header.width || !header.height) throw new ImageRefused('image_damaged', 'This picture has no size; the file may be damaged.');
  if (pixels > limits.maxPixels) {
    throw new ImageRefused(
      'image_too_large',
      `This picture is ${header.width} × ${header.height} pixels; pictures up to ${Math.round(limits.maxPixels / 1_000_000)} megapixels are accepted.`,
    );
  }
  // The decoder forgives a missing end chunk and ignores what follows the picture; a cut-off file or a polyglot is refused here.
  const structure = await pictureProblem(await readFile(inputPath));
  if (structure?.kind === 'cut_off')
    throw new ImageRefused('image_damaged', 'This picture is cut off: the file ends before the picture does.');
  if (structure?.kind === 'extra_content') throw new ImageRefused('image_extra_content', extraContentMessage(structure.found));
  try {
    const display = await sharp(inputPath, { limitInputPixels: limits.maxPixels })
      .rotate()
      .resize({ width: DISPLAY_EDGE, height: DISPLAY_EDGE, fit: 'inside', withoutEnlargement: true })
      .flatten({ background: '#ffffff' })
      .jpeg({ quality: 82 })
      .toFile(output.display);
    // The thumbnail comes from the display copy: already upright, small and quick to decode.
    const thumbnail = await sharp(output.display)
      .resize({ width: THUMBNAIL_EDGE, height: THUMBNAIL_EDGE, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 75 })
      .toFile(output.thumbnail);
    return { width: display.width, height: display.height, sizeBytes: display.size, thumbnailBytes: thumbnail.size };
  } catch (err) {
    if (err instanceof ImageRefused) throw err;
    throw new ImageRefused('image_damaged', 'This picture could not be read to the end; the file may be damaged or cut off.');
  }
}

/** Burn the markup into a copy of the display image: the same element list the field app draws. */
export async function renderMarkedUp(displayPath: string, markup: Markup, outputPath: string): Promise<{ sizeBytes: number }> {
  const image = sharp(displayPath);
  const { width, height } = await image.metadata();
  if (!width || !height) throw new ImageRefused('image_damaged', 'The stored picture could not be read.');
  const overlay = renderMarkupSvg(markup, { width, height });
  const info = await image
    .composite([{ input: Buffer.from(overlay), top: 0, left: 0 }])
    .jpeg({ quality: 85 })
    .toFile(outputPath);
  return { sizeBytes: info.size };
}
