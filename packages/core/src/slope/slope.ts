import { UNITS_PER_FOOT, UNITS_PER_INCH, formatFootage, type Footage, type UnitSystem } from '../footage/footage.ts';
import { runLabel } from '../model/findings.ts';
import type { DepthReading, Inspection, Run } from '../model/schemas.ts';

/** A slope in inches per foot as a percent: 1 in per 12 in is 8.333 %. */
export const inchesPerFootToPercent = (inchesPerFoot: number): number => (inchesPerFoot / 12) * 100;

export interface MinimumSlope {
  /** As the code prints it. */
  fraction: '1/4' | '1/8' | '1/16';
  inchesPerFoot: number;
  /** inches per foot ÷ 12 × 100 (1/4 in/ft = 2.083 %, printed "2 percent" in codes). */
  percent: number;
  source: string;
}

const QUARTER: MinimumSlope = Object.freeze({
  fraction: '1/4',
  inchesPerFoot: 1 / 4,
  percent: inchesPerFootToPercent(1 / 4),
  source: 'IPC Table 704.1',
});
const EIGHTH: MinimumSlope = Object.freeze({
  fraction: '1/8',
  inchesPerFoot: 1 / 8,
  percent: inchesPerFootToPercent(1 / 8),
  source: 'IPC Table 704.1',
});
const SIXTEENTH: MinimumSlope = Object.freeze({
  fraction: '1/16',
  inchesPerFoot: 1 / 16,
  percent: inchesPerFootToPercent(1 / 16),
  source: 'IPC Table 704.1',
});

/**
 * Minimum slope of a building drain or building sewer by nominal size
 * (International Plumbing Code, Table 704.1): 2-1/2 in or less → 1/4 in per ft;
 * 3 in to 6 in → 1/8 in per ft; 8 in or larger → 1/16 in per ft. Sizes between the
 * table's rows take the steeper neighbouring row.
 */
export function minimumSlope(diameterIn: number): MinimumSlope {
  if (diameterIn < 3) return QUARTER;
  if (diameterIn < 8) return EIGHTH;
  return SIXTEENTH;
}

/** The Uniform Plumbing Code differs, and its editions differ (CHECKS.md). */
export const upcSlopeNote =
  'The Uniform Plumbing Code (section 708) asks for 1/4 inch per foot for every size unless the local authority approves less for larger pipe; its editions differ on the size from which 1/8 inch per foot may be approved. Your local code governs.';

/** Fall over a length at a slope, in the footage unit: 10 ft at 1/4 in/ft falls 2.5 in. */
export function fallOver(length: Footage, inchesPerFoot: number): Footage {
  return Math.round((length / UNITS_PER_FOOT) * inchesPerFoot * UNITS_PER_INCH);
}

/** Locator depth readings are good to about a tenth of the depth (common practice, no source). */
export const LOCATOR_TOLERANCE = 0.1;

/** A house lateral is most often 4 in (common practice, no source). */
export const DEFAULT_DIAMETER_IN = 4;

export type SlopeStatus = 'meets_minimum' | 'below_minimum' | 'back_fall';

export interface SlopeSegment {
  from: Footage;
  to: Footage;
  /** Drop of the pipe in the direction of flow (negative: it climbs, water runs back). */
  fall: Footage;
  inchesPerFoot: number;
  percent: number;
  diameterIn: number;
  minimum: MinimumSlope;
  status: SlopeStatus;
  /** ± inches per foot from the readings' accuracy. */
  uncertaintyInchesPerFoot: number;
  /** True when the status holds across the whole accuracy band. */
  certain: boolean;
}

export interface Sag {
  at: Footage;
  /** How far below the neighbouring readings the pipe dips (how deep water could stand). */
  dip: Footage;
  text: string;
}

export interface RunSlope {
  runId: string;
  label: string;
  levelGroundAssumed: boolean;
  segments: SlopeSegment[];
  overall: Omit<SlopeSegment, 'uncertaintyInchesPerFoot' | 'certain'> | null;
  sags: Sag[];
  /** Plain notes on what was found. */
  notes: string[];
}

export interface SlopeResult {
  runs: RunSlope[];
  /** Always shown with any slope figure. */
  caveat: string;
  upcNote: string;
}

export const slopeCaveat =
  'Slopes come from depths read with a locator above ground. Each reading can be off by about a tenth of the depth, so over short spans the slope is a rough guide, not a survey. Confirm any problem before relying on it.';

function diameterAt(run: Run, at: Footage): number {
  for (const section of run.sections) if (at >= section.from && at <= section.to) return section.diameterIn;
  let best: number | null = null;
  for (const section of run.sections) best = best === null ? section.diameterIn : Math.max(best, section.diameterIn);
  return best ?? DEFAULT_DIAMETER_IN;
}

function classify(inchesPerFoot: number, min: number, uncertainty: number): { status: SlopeStatus; certain: boolean } {
  if (inchesPerFoot < 0) return { status: 'back_fall', certain: inchesPerFoot + uncertainty < 0 };
  if (inchesPerFoot < min) {
    return { status: 'below_minimum', certain: inchesPerFoot + uncertainty < min && inchesPerFoot - uncertainty >= 0 };
  }
  return { status: 'meets_minimum', certain: inchesPerFoot - uncertainty >= min };
}

function segmentBetween(run: Run, a: DepthReading, b: DepthReading, elevA: number, elevB: number) {
  const length = b.at - a.at;
  const fall = run.direction === 'toward_main' ? elevA - elevB : elevB - elevA;
  const inchesPerFoot = (fall * 12) / length; // (fall/254 in) ÷ (length/3048 ft)
  const diameterIn = diameterAt(run, Math.round((a.at + b.at) / 2));
  const minimum = minimumSlope(diameterIn);
  return { from: a.at, to: b.at, fall, inchesPerFoot, percent: inchesPerFootToPercent(inchesPerFoot), diameterIn, minimum };
}

/** Slope between depth readings on one run. */
export function analyseRunSlope(run: Run, label: string, units: UnitSystem = 'imperial'): RunSlope | null {
  if (run.depthReadings.length < 2) return null;
  const readings = [...run.depthReadings].sort((a, b) => a.at - b.at);
  const levelGroundAssumed = readings.some((r) => r.surfaceElevation === null);
  const elevation = readings.map((r) => (levelGroundAssumed ? 0 : (r.surfaceElevation ?? 0)) - r.depth);

  const segments: SlopeSegment[] = [];
  for (let i = 0; i + 1 < readings.length; i += 1) {
    const a = readings[i] as DepthReading;
    const b = readings[i + 1] as DepthReading;
    const base = segmentBetween(run, a, b, elevation[i] as number, elevation[i + 1] as number);
    const uncertaintyInchesPerFoot = ((a.depth + b.depth) * LOCATOR_TOLERANCE * 12) / (b.at - a.at);
    const { status, certain } = classify(base.inchesPerFoot, base.minimum.inchesPerFoot, uncertaintyInchesPerFoot);
    // explicit fields rather than object spread: spreads are slow on this hot path
    segments.push({
      from: base.from,
      to: base.to,
      fall: base.fall,
      inchesPerFoot: base.inchesPerFoot,
      percent: base.percent,
      diameterIn: base.diameterIn,
      minimum: base.minimum,
      status,
      uncertaintyInchesPerFoot,
      certain,
    });
  }

  const first = readings[0] as DepthReading;
  const last = readings[readings.length - 1] as DepthReading;
  const overallBase = segmentBetween(run, first, last, elevation[0] as number, elevation[readings.length - 1] as number);
  const overall = {
    from: overallBase.from,
    to: overallBase.to,
    fall: overallBase.fall,
    inchesPerFoot: overallBase.inchesPerFoot,
    percent: overallBase.percent,
    diameterIn: overallBase.diameterIn,
    minimum: overallBase.minimum,
    status: classify(overallBase.inchesPerFoot, overallBase.minimum.inchesPerFoot, 0).status,
  };

  const sags: Sag[] = [];
  for (let i = 1; i + 1 < readings.length; i += 1) {
    const here = elevation[i] as number;
    const before = elevation[i - 1] as number;
    const after = elevation[i + 1] as number;
    if (here < before && here < after) {
      const reading = readings[i] as DepthReading;
      const dip = Math.min(before, after) - here;
      sags.push({
        at: reading.at,
        dip,
        text: `The pipe dips about ${formatFootage(dip, units).replace(/^0' /, '')} at ${formatFootage(reading.at, units)}, where water can stand.`,
      });
    }
  }

  const notes: string[] = [];
  const backFalls = segments.filter((s) => s.status === 'back_fall');
  const lows = segments.filter((s) => s.status === 'below_minimum');
  for (const s of backFalls) {
    notes.push(
      `From ${formatFootage(s.from, units)} to ${formatFootage(s.to, units)} the pipe runs uphill in the direction of flow (back-fall)${s.certain ? '' : ', within the readings’ accuracy'}.`,
    );
  }
  for (const s of lows) {
    notes.push(
      `From ${formatFootage(s.from, units)} to ${formatFootage(s.to, units)} the slope is about ${s.inchesPerFoot.toFixed(2)} in per ft (${s.percent.toFixed(2)} %), below the ${s.minimum.fraction} in per ft minimum for ${s.diameterIn} in pipe (${s.minimum.source})${s.certain ? '' : ', within the readings’ accuracy'}.`,
    );
  }
  if (backFalls.length === 0 && lows.length === 0) {
    notes.push(`Between the readings, the slope meets the minimum for the pipe size (${overall.minimum.source}).`);
  }
  if (levelGroundAssumed) notes.push('The ground is taken as level between readings.');
  return { runId: run.id, label, levelGroundAssumed, segments, overall, sags, notes };
}

/** The slope check for every run that has at least two depth readings. */
export function analyseSlope(inspection: Inspection, units: UnitSystem = 'imperial'): SlopeResult {
  const accessById = new Map(inspection.accessPoints.map((a) => [a.id, a]));
  const runs: RunSlope[] = [];
  for (const run of inspection.runs) {
    const result = analyseRunSlope(run, runLabel(run, accessById.get(run.accessPointId) ?? null), units);
    if (result) runs.push(result);
  }
  return { runs, caveat: slopeCaveat, upcNote: upcSlopeNote };
}
