import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { encodeMp4, rgbToYuv420, type YuvFrame } from './mp4-writer.ts';
import { renderPipe, type PipeScene, type SceneFeature } from './pipe-scene.ts';

/**
 * The demo's media, generated rather than committed: pipe-interior stills (JPEG) and one
 * short run video (MP4). Generation takes a few seconds, so results are kept in a cache
 * folder keyed by this file's settings; a fresh machine makes them once.
 */

const STILL_WIDTH = 1280;
const STILL_HEIGHT = 960;
const VIDEO = { width: 320, height: 240, fps: 8, seconds: 8 } as const;
/** The video's camera moves 3 ft a second, so a finding at F feet shows at F / 3 seconds. */
export const DEMO_VIDEO_FEET_PER_SECOND = 3;
/** Bump to regenerate cached media after changing the scenes. */
const GENERATION = 1;

/** Features along the demo run toward the main (a clay lateral), shared by the video and its stills. */
export const demoRunFeatures: SceneFeature[] = [
  { kind: 'roots', at: 6.7, density: 0.7 },
  { kind: 'offset', at: 9, clock: 3, step: 0.07 },
  { kind: 'crack', from: 14, to: 17, clock: 2 },
  { kind: 'debris', from: 18.5, to: 21, depth: 0.12 },
];

export const demoStillScenes = {
  /** Root mass hanging at a clay joint. */
  roots: { material: 'clay', position: 4.9, jointSpacing: 3, water: 0.08, features: demoRunFeatures, seed: 3 },
  /** The joint at 9 ft, stepped. */
  offset: { material: 'clay', position: 8.2, jointSpacing: 3, water: 0.1, features: demoRunFeatures, seed: 7 },
  /** A crack running along the crown. */
  crack: { material: 'clay', position: 13.6, jointSpacing: 3, water: 0.22, features: demoRunFeatures, seed: 5 },
  /** Sludge in the invert, cast iron under the slab and clay beyond. */
  debris: {
    material: 'clay',
    position: 29,
    jointSpacing: 3,
    water: 0.1,
    features: [{ kind: 'debris', from: 30, to: 36, depth: 0.16 }],
    seed: 11,
  },
  /** Fine roots at a joint further out. */
  rootsLight: {
    material: 'clay',
    position: 45.6,
    jointSpacing: 3,
    water: 0.06,
    features: [{ kind: 'roots', at: 47, density: 0.2 }],
    seed: 13,
  },
  /** Scale on old cast iron. */
  scale: {
    material: 'cast_iron',
    position: 1,
    jointSpacing: 5,
    water: 0.08,
    features: [{ kind: 'scale', from: 1, to: 9 }],
    seed: 17,
  },
} satisfies Record<string, PipeScene>;

export type DemoStillName = keyof typeof demoStillScenes;

function cacheDir(): string {
  const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../node_modules/.cache/underfoot-demo-media');
  const key = createHash('sha256')
    .update(JSON.stringify({ GENERATION, demoStillScenes, demoRunFeatures, VIDEO, STILL_WIDTH, STILL_HEIGHT }))
    .digest('hex')
    .slice(0, 16);
  const dir = path.join(root, key);
  mkdirSync(dir, { recursive: true });
  return dir;
}

async function cached(name: string, make: () => Promise<Uint8Array>): Promise<Buffer> {
  const file = path.join(cacheDir(), name);
  if (existsSync(file)) return readFileSync(file);
  const bytes = await make();
  // Write then rename, so a half-written file is never read as finished.
  writeFileSync(`${file}.partial`, bytes);
  renameSync(`${file}.partial`, file);
  return Buffer.from(bytes);
}

/** One generated still as a JPEG, 1280 × 960. */
export function demoStill(name: DemoStillName): Promise<Buffer> {
  return cached(`still-${name}.jpg`, async () => {
    const picture = renderPipe(demoStillScenes[name], STILL_WIDTH, STILL_HEIGHT);
    return sharp(picture.rgb, { raw: { width: picture.width, height: picture.height, channels: 3 } })
      .jpeg({ quality: 84 })
      .toBuffer();
  });
}

/**
 * The demo run video: a push camera travelling the first 24 ft of a clay lateral past
 * roots, an offset joint, a crack and some debris, with the footage counter running.
 */
export function demoVideo(): Promise<Buffer> {
  return cached('run-toward-main.mp4', async () => {
    const frames: YuvFrame[] = [];
    const count = VIDEO.fps * VIDEO.seconds;
    for (let i = 0; i < count; i++) {
      const position = (i / VIDEO.fps) * DEMO_VIDEO_FEET_PER_SECOND;
      // Water gathers where the crack's section sags.
      const water = position > 12 && position < 17 ? 0.2 : 0.09;
      const picture = renderPipe(
        { material: 'clay', position, jointSpacing: 3, water, features: demoRunFeatures, seed: 21 },
        VIDEO.width,
        VIDEO.height,
      );
      frames.push(rgbToYuv420(picture.rgb, picture.width, picture.height));
    }
    return encodeMp4(frames, { width: VIDEO.width, height: VIDEO.height, fps: VIDEO.fps });
  });
}

/** Write the demo video to a file (for the browser tests and for trying the upload by hand). */
export async function writeDemoVideo(file: string): Promise<string> {
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, await demoVideo());
  return file;
}
