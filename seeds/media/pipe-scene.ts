/**
 * Procedural pictures of the inside of a sewer pipe, as a push camera sees it: the
 * wall lit by the camera's lamp and fading into the dark, joints as rings, water lying
 * in the bottom, and the defects of the demo (roots at a joint, a crack, an offset
 * joint, debris, scale). Drawn pixel by pixel from a simple model, so the demo needs no
 * photographs: every picture here is generated.
 *
 * Model: the camera sits on the pipe's axis looking along it. A wall point at angle θ
 * and distance d ahead appears at radius r = D0 / d from the picture's centre (D0 is
 * the distance at which the wall meets the picture's edge), so each pixel maps back to
 * (θ, d). The camera lamp's light falls off with distance.
 */

export type PipeMaterial = 'clay' | 'cast_iron' | 'pvc';

export type SceneFeature =
  | { kind: 'roots'; at: number; density: number }
  | { kind: 'crack'; from: number; to: number; clock: number }
  | { kind: 'offset'; at: number; clock: number; step: number }
  | { kind: 'debris'; from: number; to: number; depth: number }
  | { kind: 'scale'; from: number; to: number }
  | { kind: 'branch'; at: number; clock: number };

export interface PipeScene {
  material: PipeMaterial;
  /** Where the camera is along the run, in feet (also shown on the footage counter). */
  position: number;
  /** Feet between joints (clay about 3 ft, cast iron 5 ft, plastic much longer). */
  jointSpacing: number;
  /** Water depth as a share of the pipe's diameter. */
  water: number;
  features: SceneFeature[];
  seed: number;
  /** Footage counter text; defaults to the position in feet. */
  counter?: string;
}

// ---------- noise ----------

function hash(x: number, y: number, seed: number): number {
  let h = (x * 374761393 + y * 668265263 + seed * 982451653) | 0;
  h = Math.imul(h ^ (h >>> 13), 1274126177);
  return ((h ^ (h >>> 16)) >>> 0) / 4294967295;
}

/** Smooth noise; with a period, x wraps around (the pipe wall has no seam). */
function valueNoise(x: number, y: number, seed: number, period = 0): number {
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  const fx = x - x0;
  const fy = y - y0;
  const sx = fx * fx * (3 - 2 * fx);
  const sy = fy * fy * (3 - 2 * fy);
  const wrap = (v: number) => (period > 0 ? ((v % period) + period) % period : v);
  const a = hash(wrap(x0), y0, seed);
  const b = hash(wrap(x0 + 1), y0, seed);
  const c = hash(wrap(x0), y0 + 1, seed);
  const d = hash(wrap(x0 + 1), y0 + 1, seed);
  return a + (b - a) * sx + (c - a) * sy + (a - b - c + d) * sx * sy;
}

/** Three octaves; `period` is the wrap of the first (the others are whole multiples of it). */
function fractal(x: number, y: number, seed: number, period = 0): number {
  return (
    valueNoise(x, y, seed, period) * 0.5 +
    valueNoise(x * 3, y * 3, seed + 7, period * 3) * 0.3 +
    valueNoise(x * 9, y * 9, seed + 13, period * 9) * 0.2
  );
}

// ---------- colours ----------

type Rgb = [number, number, number];

const wallColours: Record<PipeMaterial, { base: Rgb; dark: Rgb }> = {
  clay: { base: [178, 104, 64], dark: [120, 62, 36] },
  cast_iron: { base: [104, 82, 66], dark: [58, 44, 36] },
  pvc: { base: [214, 210, 198], dark: [168, 164, 152] },
};
const WATER: Rgb = [58, 74, 70];
const ROOT: Rgb = [226, 200, 150];
const DEBRIS: Rgb = [92, 78, 58];
const SCALE: Rgb = [150, 128, 96];

const mix = (a: Rgb, b: Rgb, t: number): Rgb => [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t, a[2] + (b[2] - a[2]) * t];
const clamp01 = (v: number) => Math.min(1, Math.max(0, v));

const u24 = (theta: number) => ((theta + Math.PI) / (2 * Math.PI)) * 24;

/** Clock position (12 = top) to the picture angle (0 = right, growing clockwise, y down). */
const clockAngle = (clock: number) => ((clock % 12) / 12) * 2 * Math.PI - Math.PI / 2;
const angleGap = (a: number, b: number) => {
  const d = Math.abs(a - b) % (2 * Math.PI);
  return d > Math.PI ? 2 * Math.PI - d : d;
};

/** The colour of the pipe wall at angle θ and footage z, and how much light reaches it from distance d. */
function wallAt(scene: PipeScene, theta: number, z: number): Rgb {
  const colours = wallColours[scene.material];
  const u = ((theta + Math.PI) / (2 * Math.PI)) * 24;
  const grain = fractal(u, z * 6, scene.seed, 24);
  let colour = mix(colours.dark, colours.base, 0.2 + grain * 0.8);
  if (scene.material === 'cast_iron') {
    // Tubercles: rusty lumps.
    const lump = valueNoise(u * 3, z * 18, scene.seed + 3, 72);
    if (lump > 0.72) colour = mix(colour, [150, 86, 42], (lump - 0.72) * 3);
  }
  // Joints: a dark ring with a lighter lip where the next pipe starts.
  const spacing = scene.jointSpacing;
  const fromJoint = ((z % spacing) + spacing) % spacing;
  const jointAt = z - fromJoint;
  const offset = scene.features.find((f) => f.kind === 'offset' && Math.abs(f.at - jointAt) < 0.01) as
    Extract<SceneFeature, { kind: 'offset' }> | undefined;
  if (fromJoint < 0.05 || spacing - fromJoint < 0.02) colour = mix(colour, [20, 16, 14], 0.75);
  else if (fromJoint < 0.12) colour = mix(colour, [255, 240, 220], 0.12);
  if (offset && fromJoint < 0.06 + offset.step) {
    const facing = Math.cos(angleGap(theta, clockAngle(offset.clock)));
    if (facing > 0.2) colour = mix(colour, [248, 236, 214], 0.55 * facing);
    else colour = mix(colour, [12, 10, 10], 0.7);
  }
  for (const f of scene.features) {
    if (f.kind === 'crack' && z >= f.from && z <= f.to) {
      const line = clockAngle(f.clock) + 0.06 * Math.sin(z * 9 + f.from) + 0.03 * Math.sin(z * 23);
      const width = 0.012 + 0.01 * valueNoise(z * 20, 1, scene.seed);
      if (angleGap(theta, line) < width) colour = mix(colour, [16, 12, 10], 0.85);
      else if (angleGap(theta, line) < width * 2.2) colour = mix(colour, [40, 30, 24], 0.35);
    }
    if (f.kind === 'scale' && z >= f.from && z <= f.to) {
      const crust = fractal(u * 2, z * 10, scene.seed + 11, 48);
      if (crust > 0.45) colour = mix(colour, SCALE, clamp01((crust - 0.45) * 3));
    }
    if (f.kind === 'branch' && Math.abs(z - f.at) < 0.35) {
      // A dark opening in the wall where another line comes in.
      const gap = angleGap(theta, clockAngle(f.clock));
      const ellipse = (gap / 0.45) ** 2 + ((z - f.at) / 0.32) ** 2;
      if (ellipse < 1) colour = mix(colour, [10, 8, 8], 0.9 - ellipse * 0.4);
    }
  }
  return colour;
}

export interface RenderedPicture {
  width: number;
  height: number;
  /** 8-bit RGB, row by row. */
  rgb: Uint8Array;
}

/** Render the scene at a size; both dimensions should be even. */
export function renderPipe(scene: PipeScene, width: number, height: number): RenderedPicture {
  const rgb = new Uint8Array(width * height * 3);
  const cx = width / 2 + width * 0.01;
  const cy = height / 2 - height * 0.02;
  const edge = Math.min(width, height) * 0.62;
  // The wall meets the picture's edge about 0.55 ft ahead of the lens.
  const nearest = 0.55;
  // Water surface: distance below the axis, in pipe radii (radius 1).
  const waterSurface = 1 - 2 * scene.water;
  for (let py = 0; py < height; py++) {
    for (let px = 0; px < width; px++) {
      const nx = (px - cx) / edge;
      const ny = (py - cy) / edge;
      const r = Math.max(1e-4, Math.hypot(nx, ny));
      const theta = Math.atan2(ny, nx);
      let distance = nearest / r;
      let colour: Rgb;
      // Below the water line the ray meets the water before the wall.
      const below = Math.sin(theta);
      if (scene.water > 0 && below > waterSurface && below > 0) {
        distance = distance * (waterSurface / below);
        const z = scene.position + distance;
        // Across the water surface, in pipe radii from the middle.
        const across = (nx / Math.max(1e-4, ny)) * waterSurface;
        const ripple = fractal(across * 6 + 50, z * 3, scene.seed + 5);
        colour = mix(WATER, [120, 140, 128], ripple * 0.35);
        // The lamp's reflection: a bright smear near the middle of the water.
        const glint = Math.exp(-((nx * 3) ** 2)) * Math.exp(-(((distance - 1.5) / 0.8) ** 2));
        colour = mix(colour, [235, 240, 230], clamp01(glint * 0.8 * ripple));
      } else {
        colour = wallAt(scene, theta, scene.position + distance);
        for (const f of scene.features) {
          const z = scene.position + distance;
          if (f.kind === 'debris' && z >= f.from && z <= f.to && below > 1 - f.depth * 2) {
            const lumps = fractal(u24(theta) * 2, z * 8, scene.seed + 17, 48);
            colour = mix(colour, mix(DEBRIS, [140, 120, 90], lumps), clamp01(0.6 + lumps * 0.4));
          }
        }
      }
      // The camera's lamp: bright near, dark far (inverse-square-like fall-off, softened).
      const light = clamp01(1.35 / (1 + (distance / 2.2) ** 2)) * (0.92 + 0.08 * hash(px, py, scene.seed));
      const vignette = 1 - 0.25 * clamp01(r - 0.9);
      const i = (py * width + px) * 3;
      rgb[i] = Math.round(clamp01((colour[0] * light * vignette) / 255) * 255);
      rgb[i + 1] = Math.round(clamp01((colour[1] * light * vignette) / 255) * 255);
      rgb[i + 2] = Math.round(clamp01((colour[2] * light * vignette) / 255) * 255);
    }
  }
  for (const f of scene.features) if (f.kind === 'roots') drawRoots(rgb, width, height, cx, cy, edge, nearest, scene, f);
  drawCounter(rgb, width, height, scene.counter ?? `${scene.position.toFixed(1)} FT`);
  return { width, height, rgb };
}

/** Root strands hanging into the pipe from the top of a joint, drawn over the picture. */
function drawRoots(
  rgb: Uint8Array,
  width: number,
  height: number,
  cx: number,
  cy: number,
  edge: number,
  nearest: number,
  scene: PipeScene,
  roots: Extract<SceneFeature, { kind: 'roots' }>,
) {
  const distance = roots.at - scene.position;
  if (distance < 0.3 || distance > 14) return;
  const ringRadius = (nearest / distance) * edge;
  const light = clamp01(1.35 / (1 + (distance / 2.2) ** 2));
  const strands = Math.round(14 + roots.density * 60);
  const thickness = Math.max(1, (Math.min(width, height) / 300) * (2.2 / Math.max(0.6, distance)));
  for (let s = 0; s < strands; s++) {
    // Strands start on the upper part of the joint ring and hang toward the middle and down.
    const start = -Math.PI / 2 + (hash(s, 1, scene.seed) - 0.5) * Math.PI * 1.1;
    let x = cx + Math.cos(start) * ringRadius;
    let y = cy + Math.sin(start) * ringRadius;
    const length = ringRadius * (0.35 + hash(s, 2, scene.seed) * 0.7 * (0.4 + roots.density));
    const steps = Math.ceil(length / 2);
    let angle = Math.atan2(cy - y, cx - x) + (hash(s, 3, scene.seed) - 0.5) * 1.2;
    const shade = 0.7 + hash(s, 4, scene.seed) * 0.3;
    for (let k = 0; k < steps; k++) {
      angle += (hash(s * 97 + k, 5, scene.seed) - 0.5) * 0.35 + 0.03; // droop
      x += Math.cos(angle) * 2;
      y += Math.sin(angle) * 2 + 0.4;
      const t = thickness * (1 - (k / steps) * 0.7);
      for (let oy = -Math.ceil(t); oy <= Math.ceil(t); oy++) {
        for (let ox = -Math.ceil(t); ox <= Math.ceil(t); ox++) {
          if (ox * ox + oy * oy > t * t) continue;
          const px = Math.round(x + ox);
          const py = Math.round(y + oy);
          if (px < 0 || py < 0 || px >= width || py >= height) continue;
          const i = (py * width + px) * 3;
          const edgeShade = 1 - 0.35 * Math.sqrt((ox * ox + oy * oy) / (t * t + 0.01));
          rgb[i] = Math.round(ROOT[0] * light * shade * edgeShade);
          rgb[i + 1] = Math.round(ROOT[1] * light * shade * edgeShade);
          rgb[i + 2] = Math.round(ROOT[2] * light * shade * edgeShade);
        }
      }
    }
  }
}

// A 5 × 7 pixel font for the camera's footage counter (our own glyphs).
const GLYPHS: Record<string, string[]> = {
  '0': ['01110', '10001', '10011', '10101', '11001', '10001', '01110'],
  '1': ['00100', '01100', '00100', '00100', '00100', '00100', '01110'],
  '2': ['01110', '10001', '00001', '00010', '00100', '01000', '11111'],
  '3': ['11110', '00001', '00001', '01110', '00001', '00001', '11110'],
  '4': ['00010', '00110', '01010', '10010', '11111', '00010', '00010'],
  '5': ['11111', '10000', '11110', '00001', '00001', '10001', '01110'],
  '6': ['00110', '01000', '10000', '11110', '10001', '10001', '01110'],
  '7': ['11111', '00001', '00010', '00100', '01000', '01000', '01000'],
  '8': ['01110', '10001', '10001', '01110', '10001', '10001', '01110'],
  '9': ['01110', '10001', '10001', '01111', '00001', '00010', '01100'],
  '.': ['00000', '00000', '00000', '00000', '00000', '01100', '01100'],
  F: ['11111', '10000', '10000', '11110', '10000', '10000', '10000'],
  T: ['11111', '00100', '00100', '00100', '00100', '00100', '00100'],
  ' ': ['00000', '00000', '00000', '00000', '00000', '00000', '00000'],
};

/** The counter in the lower left, white on a dark shadow, like a camera's overlay. */
function drawCounter(rgb: Uint8Array, width: number, height: number, text: string) {
  const scale = Math.max(2, Math.round(height / 160));
  const x0 = Math.round(width * 0.04);
  const y0 = height - Math.round(height * 0.05) - 7 * scale;
  const put = (x: number, y: number, v: number) => {
    if (x < 0 || y < 0 || x >= width || y >= height) return;
    const i = (y * width + x) * 3;
    rgb[i] = v;
    rgb[i + 1] = v;
    rgb[i + 2] = v;
  };
  for (const [pass, offset, value] of [
    ['shadow', 1, 10],
    ['ink', 0, 250],
  ] as const) {
    void pass;
    [...text].forEach((ch, index) => {
      const glyph = GLYPHS[ch] ?? GLYPHS[' ']!;
      glyph.forEach((row, gy) => {
        [...row].forEach((bit, gx) => {
          if (bit !== '1') return;
          for (let sy = 0; sy < scale; sy++) {
            for (let sx = 0; sx < scale; sx++)
              put(x0 + (index * 6 + gx) * scale + sx + offset * scale, y0 + gy * scale + sy + offset * scale, value);
          }
        });
      });
    });
  }
}
