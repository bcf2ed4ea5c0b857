import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { renderMarkedUp } from './image-pipeline.ts';

const dir = mkdtempSync(path.join(tmpdir(), 'underfoot-render-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Width of the columns the label changed on a black picture. */
async function inkWidth(text: string): Promise<number> {
  const source = path.join(dir, 'black.png');
  await sharp({ create: { width: 1000, height: 200, channels: 3, background: '#000000' } })
    .png()
    .toFile(source);
  const out = path.join(dir, `label-${text.length}-${text[0]}.jpg`);
  await renderMarkedUp(source, { shapes: [{ id: 't', type: 'text', colour: 'chalk', x: 0.05, y: 0.2, text }] }, out);
  const { data, info } = await sharp(out).greyscale().raw().toBuffer({ resolveWithObject: true });
  let left = info.width;
  let right = -1;
  for (let y = 0; y < info.height; y++) {
    for (let x = 0; x < info.width; x++) {
      if (data[y * info.width + x]! > 128) {
        left = Math.min(left, x);
        right = Math.max(right, x);
      }
    }
  }
  return right - left;
}

describe('burned-in labels', () => {
  // Without a fontconfig file every glyph renders as the same box (STACK.md trap 8), so
  // six i's would be as wide as six M's. With the shipped Inter they are far narrower.
  it('are drawn with the shipped font, not placeholder boxes', async () => {
    const narrow = await inkWidth('iiiiii');
    const wide = await inkWidth('MMMMMM');
    expect(narrow).toBeGreaterThan(10);
    expect(wide / narrow).toBeGreaterThan(2.5);
  });
});
