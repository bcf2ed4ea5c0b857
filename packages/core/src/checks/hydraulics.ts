/**
 * Pipe capacity by Manning's equation, and the drainage fixture unit table,
 * for "can this pipe carry the house" notes.
 *
 *   V = (k / n) · R^(2/3) · S^(1/2),  Q = V · A
 *
 * k = 1.486 in US units (ft, s); 1.49 is a common rounding; 1.0 in SI (m, s).
 * For a pipe flowing full, R = A / P = D / 4. (CHECKS.md, "Pipe capacity".)
 */

/** Manning's unit constant for feet and seconds (CHECKS.md; 1.49 is a common rounding). */
export const MANNING_K_US = 1.486;
/** Manning's unit constant for metres and seconds. */
export const MANNING_K_SI = 1.0;

export interface ManningInput {
  /** Inside diameter, in feet (US) or metres (SI). */
  diameter: number;
  /** Slope as a ratio (fall over run), e.g. 0.0104 for 1/8 in per ft. */
  slope: number;
  /** Manning roughness coefficient. */
  n: number;
  /** Unit constant: 1.486 for feet (default), 1.0 for metres. */
  k?: number;
}

export interface ManningResult {
  /** Flow area, ft² (or m²). */
  area: number;
  /** Hydraulic radius D/4, ft (or m). */
  hydraulicRadius: number;
  /** Mean velocity, ft/s (or m/s). */
  velocity: number;
  /** Flow, ft³/s (or m³/s). */
  flow: number;
}

/** Full-pipe flow by Manning's equation. */
export function manningFullPipe({ diameter, slope, n, k = MANNING_K_US }: ManningInput): ManningResult {
  if (!(diameter > 0) || !(n > 0)) throw new RangeError('Diameter and roughness must be positive.');
  if (!(slope >= 0)) throw new RangeError('Slope must not be negative for a flow estimate.');
  const area = (Math.PI * diameter * diameter) / 4;
  const hydraulicRadius = diameter / 4;
  const velocity = (k / n) * Math.cbrt(hydraulicRadius * hydraulicRadius) * Math.sqrt(slope);
  return { area, hydraulicRadius, velocity, flow: velocity * area };
}

/** US gallons per cubic foot: 1 gal = 231 in³ exactly, so 1 ft³ = 1728/231 gal (NIST SP 811, from memory). */
export const GALLONS_PER_CUBIC_FOOT = 1728 / 231;

export const cfsToGpm = (cfs: number): number => cfs * GALLONS_PER_CUBIC_FOOT * 60;

export type FixtureUnitSlope = '1/8' | '1/4' | '1/2';

/**
 * Most drainage fixture units a building drain or sewer may carry, by size and slope
 * (IPC Table 710.1(1)). Flags say which values were read from the table and which
 * are from memory (CHECKS.md).
 */
export const drainageFixtureUnits: Record<3 | 4 | 6, Record<FixtureUnitSlope, { value: number; flag: 'read' | 'memory' }>> = {
  3: { '1/8': { value: 36, flag: 'read' }, '1/4': { value: 42, flag: 'read' }, '1/2': { value: 50, flag: 'read' } },
  4: { '1/8': { value: 180, flag: 'memory' }, '1/4': { value: 216, flag: 'read' }, '1/2': { value: 250, flag: 'read' } },
  6: { '1/8': { value: 700, flag: 'memory' }, '1/4': { value: 840, flag: 'read' }, '1/2': { value: 1000, flag: 'read' } },
};

/**
 * The table's limit for a size and a measured slope (inches per foot): the steepest
 * tabulated slope not above the measured one. Null when the size is not tabulated
 * here or the slope is below 1/8 in per ft.
 */
export function maxFixtureUnits(
  diameterIn: number,
  inchesPerFoot: number,
): { value: number; slope: FixtureUnitSlope; flag: 'read' | 'memory'; source: string } | null {
  if (diameterIn !== 3 && diameterIn !== 4 && diameterIn !== 6) return null;
  const row = drainageFixtureUnits[diameterIn];
  const slope: FixtureUnitSlope | null =
    inchesPerFoot >= 0.5 ? '1/2' : inchesPerFoot >= 0.25 ? '1/4' : inchesPerFoot >= 0.125 ? '1/8' : null;
  if (!slope) return null;
  return { ...row[slope], slope, source: 'IPC Table 710.1(1)' };
}
