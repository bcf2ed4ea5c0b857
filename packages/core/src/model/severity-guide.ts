import type { DefectKind } from './kinds.ts';

/**
 * What a severity 1…5 looks like for each kind of defect, shown to the inspector in
 * the field app. These are Underfoot's own defaults (common practice, no source).
 *
 * Across every kind the scale means the same thing:
 *   1 minor, note only · 2 small, watch it · 3 moderate, will grow ·
 *   4 serious, repair soon · 5 failed here, or the line is blocked.
 *
 * Where a defect can be measured on screen (a share of the pipe's opening or
 * diameter), `measure` turns that number into a suggested severity. An inspector
 * who records a measure and chooses a different severity gives a reason.
 */
export interface SeverityGuide {
  levels: readonly [string, string, string, string, string];
  measure?: {
    /** What the percentage is of. */
    label: string;
    /** Upper bounds (inclusive) of severities 1, 2, 3 and 4; above the last is 5. */
    upperBounds: readonly [number, number, number, number];
  };
}

export const severityScale = [
  { severity: 1, name: 'Minor', meaning: 'Noted only; no action.' },
  { severity: 2, name: 'Small', meaning: 'Watch it at the next inspection.' },
  { severity: 3, name: 'Moderate', meaning: 'Will grow; plan for it.' },
  { severity: 4, name: 'Serious', meaning: 'Repair or clear soon.' },
  { severity: 5, name: 'Failed', meaning: 'The pipe has failed here, or the line is blocked.' },
] as const;

const openingShare = 'share of the pipe opening that is blocked';

export const severityGuides: Record<DefectKind, SeverityGuide> = {
  crack: {
    levels: [
      'A hairline crack, shorter than a hand.',
      'A hairline crack running along a pipe length.',
      'Several cracks, or one you can see light or water through.',
      'Cracks in a web pattern; the wall could break apart.',
      'Cracked through and pieces are moving.',
    ],
  },
  open_crack: {
    levels: [
      'A short opening, edges still flush.',
      'A visible opening, edges still flush.',
      'The edges have shifted; a small lip has formed.',
      'Wide opening; a piece could drop out.',
      'Pieces have shifted into the pipe.',
    ],
  },
  missing_piece: {
    levels: [
      'A chip on the inside surface only.',
      'A small chip deeper in the wall; no soil showing.',
      'A small piece missing; backing material visible.',
      'A hole the size of a palm or more.',
      'A hole with soil showing.',
    ],
  },
  out_of_round: {
    levels: [
      'Barely out of round.',
      'Slightly oval; flow not affected.',
      'Clearly oval; debris may catch.',
      'Badly squeezed; cracking at the sides.',
      'Squeezed so much the camera barely passes.',
    ],
    measure: { label: 'loss of diameter (%)', upperBounds: [3, 6, 10, 25] },
  },
  collapse: {
    levels: [
      'Wall sagging inward at the top, still whole.',
      'Wall sagging inward with cracks.',
      'Part of the wall has dropped; most of the opening is clear.',
      'Much of the wall has dropped; the camera just passes.',
      'Caved in: the camera cannot pass or soil fills the pipe.',
    ],
  },
  joint_offset: {
    levels: [
      'A slight step at the joint.',
      'A small step that does not catch waste.',
      'A step that catches paper or debris.',
      'A large step; the pipe ends barely overlap.',
      'The pipe ends no longer overlap.',
    ],
    measure: { label: 'step as a share of the pipe diameter (%)', upperBounds: [5, 10, 25, 50] },
  },
  joint_gap: {
    levels: [
      'A hairline gap at the joint.',
      'A narrow gap; no soil showing.',
      'A gap you can see into.',
      'A wide gap; soil or water coming in.',
      'The ends have pulled fully apart with soil showing.',
    ],
    measure: { label: 'gap as a share of the pipe diameter (%)', upperBounds: [3, 10, 25, 50] },
  },
  sag: {
    levels: [
      'A shallow puddle in the pipe.',
      'Water under a fifth of the pipe height.',
      'Water a quarter to a third of the pipe height.',
      'Water up to half the pipe height; waste settles here.',
      'The dip holds water over most of the pipe height.',
    ],
    measure: { label: 'water depth as a share of the pipe diameter (%)', upperBounds: [10, 20, 35, 50] },
  },
  worn_wall: {
    levels: [
      'Rough surface only.',
      'Light rust or wear over a short stretch.',
      'Wear along a long stretch, or the bottom is rough and pitted.',
      'The bottom of the pipe is worn through in places.',
      'The wall is gone along the bottom; soil showing.',
    ],
  },
  liner_problem: {
    levels: [
      'A small wrinkle.',
      'Wrinkles that do not catch waste.',
      'Wrinkles or a lifted edge that catch waste.',
      'The liner has split or come loose.',
      'The liner blocks the pipe or has failed.',
    ],
  },
  roots: {
    levels: [
      'A few fine roots at one joint.',
      'Fine roots at a joint, small share of the opening.',
      'A root mass at a joint, up to about a third of the opening.',
      'Thick roots across much of the opening.',
      'Roots block the line.',
    ],
    measure: { label: openingShare + ' (%)', upperBounds: [5, 15, 35, 75] },
  },
  grease: {
    levels: [
      'A thin film on the wall.',
      'A light coating.',
      'A thick coating; the opening is narrower.',
      'Heavy build-up across much of the opening.',
      'Grease blocks the line.',
    ],
    measure: { label: openingShare + ' (%)', upperBounds: [5, 15, 30, 75] },
  },
  debris: {
    levels: [
      'A little grit in the bottom.',
      'A thin layer of sludge.',
      'Sludge or debris up to about a third of the opening.',
      'Debris across much of the opening.',
      'Debris blocks the line.',
    ],
    measure: { label: openingShare + ' (%)', upperBounds: [5, 15, 30, 75] },
  },
  scale: {
    levels: [
      'A light crust.',
      'Crust over a short stretch.',
      'Crust that narrows the opening.',
      'Heavy crust across much of the opening.',
      'Crust blocks the line.',
    ],
    measure: { label: openingShare + ' (%)', upperBounds: [5, 15, 30, 75] },
  },
  standing_water: {
    levels: [
      'A film of water.',
      'Shallow water.',
      'Water a quarter to a third of the pipe height.',
      'Water half the pipe height or more.',
      'The pipe is full of water; the line is backed up.',
    ],
    measure: { label: 'water depth as a share of the pipe diameter (%)', upperBounds: [10, 20, 35, 75] },
  },
  blockage: {
    levels: [
      'A small object lying in the pipe.',
      'An object the water flows around.',
      'An object blocking up to half the opening.',
      'An object blocking most of the opening.',
      'The line is blocked.',
    ],
    measure: { label: openingShare + ' (%)', upperBounds: [10, 25, 50, 75] },
  },
  seepage: {
    levels: ['A damp stain.', 'Drips now and then.', 'Steady drips.', 'Running water coming in.', 'Water pouring in, with soil.'],
  },
};

/** The severity the guide suggests for a measured percentage, or null when the kind has no measure. */
export function suggestSeverity(kind: DefectKind, percent: number): 1 | 2 | 3 | 4 | 5 | null {
  const measure = severityGuides[kind].measure;
  if (!measure) return null;
  const [b1, b2, b3, b4] = measure.upperBounds;
  if (percent <= b1) return 1;
  if (percent <= b2) return 2;
  if (percent <= b3) return 3;
  if (percent <= b4) return 4;
  return 5;
}
