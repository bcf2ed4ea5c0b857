import { UNITS_PER_FOOT, formatDecimalFeet, formatFeetInches, type Footage } from '../footage/footage.ts';
import type { Finding } from '../model/findings.ts';
import { surfaceNames, type SurfaceKind } from '../model/kinds.ts';
import type { Run } from '../model/schemas.ts';
import {
  spotPointsOf,
  groupIntoExcavations,
  linerCannotFix,
  planThresholds,
  type FullLengthMethod,
  type RepairPlan,
  type RunRepairPlan,
} from '../recommendations/repair-plan.ts';
import { Exact, formatCents } from './exact.ts';
import { priceUnitNames, surfaceRestorationItem, type PriceBook, type PriceItemKey, type PriceUnit } from './price-book.ts';

/** A repair pit opens about 4 ft by 6 ft of surface (common practice, no source). */
export const PIT_SURFACE_SQFT = 24;
/** An open trench for a house lateral is about 2 ft wide (common practice, no source). */
export const TRENCH_WIDTH_FT = 2;
/** Totals are rounded outward to this many cents, once, at the end. */
export const TOTAL_ROUNDING_CENTS = 1000;

export const costOptionKinds = ['cleaning', 'spot_repairs', 'sectional_liners', 'line_runs', 'burst_runs', 'replace_runs'] as const;
export type CostOptionKind = (typeof costOptionKinds)[number];

export const costOptionInfo: Record<CostOptionKind, { name: string; description: string }> = {
  cleaning: {
    name: 'Clean the line',
    description: 'Clear roots and build-up, then look again with the camera. Does not fix damage to the pipe.',
  },
  spot_repairs: {
    name: 'Dig and repair the damaged spots',
    description: 'Dig down at each damaged spot and replace that piece of pipe.',
  },
  sectional_liners: {
    name: 'Line the damaged spots',
    description: 'Seal each damaged spot from inside with a short liner; dig only where a liner cannot work.',
  },
  line_runs: {
    name: 'Line the whole run',
    description: 'Cured-in-place lining: a new pipe formed inside the old one along the whole run.',
  },
  burst_runs: {
    name: 'Replace by pipe bursting',
    description: 'Pull a new pipe through the old one, breaking the old pipe apart, from two small pits.',
  },
  replace_runs: {
    name: 'Replace in an open trench',
    description: 'Dig a trench along the run and lay new pipe.',
  },
};

const methodOption: Record<FullLengthMethod, CostOptionKind> = {
  full_lining: 'line_runs',
  pipe_bursting: 'burst_runs',
  open_trench: 'replace_runs',
};

export interface CostLine {
  /** A price-book item, or an extra worked out from one (depth, hard surface over digs). */
  item: PriceItemKey | 'depth_extra' | 'surface_extra';
  label: string;
  /** Quantity as a number (feet, locations, visits, square feet). */
  quantity: number;
  quantityText: string;
  unit: PriceUnit | null;
  /** Unit prices as listed in the price book (before the regional factor). */
  unitLowCents: number | null;
  unitHighCents: number | null;
  /** Line amounts in cents, rounded to the cent for display only. */
  lowCents: number;
  highCents: number;
  /** Exact line amounts in cents, as fractions ("123/4"). */
  exactLow: string;
  exactHigh: string;
  note: string;
}

export interface CostOption {
  kind: CostOptionKind;
  name: string;
  description: string;
  /** The option the rules propose (many spots or widespread damage switch to a full-length method). */
  proposed: boolean;
  lines: CostLine[];
  /** Totals rounded outward to $10 once, from the exact sum of the lines. */
  lowCents: number;
  highCents: number;
  /** Exact totals in cents, as fractions. */
  exactLow: string;
  exactHigh: string;
  assumptions: string[];
}

export interface CostOptionsResult {
  options: CostOption[];
  /** The kind of the proposed option, or null when nothing needs doing. */
  proposed: CostOptionKind | null;
  /** Always shown with the costs. */
  disclaimer: string;
}

export const costDisclaimer =
  'These are estimated ranges from a price book, not quotes. A licensed contractor sets the real price after seeing the site.';

interface ExactLine {
  item: CostLine['item'];
  label: string;
  quantity: Exact;
  quantityText: string;
  unit: PriceUnit | null;
  unitLowCents: number | null;
  unitHighCents: number | null;
  low: Exact;
  high: Exact;
  note: string;
}

class Pricer {
  readonly factor: Exact;
  constructor(readonly book: PriceBook) {
    this.factor = Exact.fromDecimal(book.regionalFactor, 4);
  }

  line(item: PriceItemKey, quantity: Exact, note = '', label?: string): ExactLine {
    const entry = this.book.items[item];
    const unitNames = priceUnitNames[entry.unit];
    const q = quantity.toNumber();
    const quantityText =
      entry.unit === 'per_foot'
        ? `${(Math.round(q * 10) / 10).toFixed(1)} ft`
        : entry.unit === 'per_square_foot'
          ? `${Math.round(q)} sq ft`
          : `${Math.round(q)} ${Math.round(q) === 1 ? unitNames.singular : unitNames.plural}`;
    return {
      item,
      label: label ?? entry.label,
      quantity,
      quantityText,
      unit: entry.unit,
      unitLowCents: entry.lowCents,
      unitHighCents: entry.highCents,
      low: quantity.mul(Exact.of(entry.lowCents)).mul(this.factor),
      high: quantity.mul(Exact.of(entry.highCents)).mul(this.factor),
      note,
    };
  }

  /** A line whose amounts are already worked out (before the regional factor). */
  computed(
    item: ExactLine['item'],
    label: string,
    quantity: Exact,
    quantityText: string,
    low: Exact,
    high: Exact,
    note: string,
  ): ExactLine {
    return {
      item,
      label,
      quantity,
      quantityText,
      unit: null,
      unitLowCents: null,
      unitHighCents: null,
      low: low.mul(this.factor),
      high: high.mul(this.factor),
      note,
    };
  }
}

const sortedReadings = new WeakMap<Run, Run['depthReadings']>();

/** Depth of the pipe at a footage, interpolated between readings; null without readings. */
export function depthAt(run: Run, at: Footage): Footage | null {
  const readings = run.depthReadings;
  if (readings.length === 0) return null;
  let sorted = sortedReadings.get(run);
  if (!sorted || sorted.length !== readings.length) {
    sorted = [...readings].sort((a, b) => a.at - b.at);
    sortedReadings.set(run, sorted);
  }
  const first = sorted[0];
  const last = sorted[sorted.length - 1];
  if (!first || !last) return null;
  if (at <= first.at) return first.depth;
  if (at >= last.at) return last.depth;
  for (let i = 1; i < sorted.length; i += 1) {
    const a = sorted[i - 1];
    const b = sorted[i];
    if (a && b && at <= b.at) return Math.round(a.depth + ((b.depth - a.depth) * (at - a.at)) / (b.at - a.at));
  }
  return last.depth;
}

export function surfaceAt(run: Run, at: Footage): SurfaceKind {
  for (const segment of run.surfaces) if (at >= segment.from && at <= segment.to) return segment.surface;
  return 'soil';
}

/** Sum of the n largest values: the extras of n digs, each priced at the costliest spots (never drops when a spot is added). */
function sumOfLargest(values: Exact[], n: number): Exact {
  if (n <= 0 || values.length === 0) return Exact.zero;
  const sorted = [...values].sort((a, b) => b.compare(a));
  return Exact.sum(sorted.slice(0, n));
}

interface DigPoint {
  run: Run;
  at: Footage;
}

/** Lines for digging `count` pits that must reach `points`: the digs, extra depth, surface restoration. */
function digLines(pricer: Pricer, points: DigPoint[], count: number, label: string): { lines: ExactLine[]; deep: boolean; hard: boolean } {
  if (count === 0) return { lines: [], deep: false, hard: false };
  const { book } = pricer;
  const lines: ExactLine[] = [pricer.line('spot_repair', Exact.of(count), 'Nearby defects share one dig.', label)];

  const spot = book.items.spot_repair;
  const depthLow: Exact[] = [];
  const depthHigh: Exact[] = [];
  const surfaceLow: Exact[] = [];
  const surfaceHigh: Exact[] = [];
  const surfacesSeen = new Set<SurfaceKind>();
  for (const point of points) {
    const depth = depthAt(point.run, point.at);
    const extra = depth === null ? 0 : Math.max(0, depth - book.depth.includedDepth);
    const extraFeet = Exact.of(extra, UNITS_PER_FOOT);
    depthLow.push(extraFeet.mul(Exact.of(spot.lowCents * book.depth.extraPercentPerFootLow, 100)));
    depthHigh.push(extraFeet.mul(Exact.of(spot.highCents * book.depth.extraPercentPerFootHigh, 100)));
    const surface = surfaceAt(point.run, point.at);
    const item = surfaceRestorationItem[surface];
    if (item) surfacesSeen.add(surface);
    surfaceLow.push(item ? Exact.of(PIT_SURFACE_SQFT * book.items[item].lowCents) : Exact.zero);
    surfaceHigh.push(item ? Exact.of(PIT_SURFACE_SQFT * book.items[item].highCents) : Exact.zero);
  }
  const dLow = sumOfLargest(depthLow, count);
  const dHigh = sumOfLargest(depthHigh, count);
  const deep = dHigh.compare(Exact.zero) > 0;
  if (deep) {
    lines.push(
      pricer.computed(
        'depth_extra',
        'Digging deeper than usual',
        Exact.of(count),
        `${count} ${count === 1 ? 'dig' : 'digs'}`,
        dLow,
        dHigh,
        `${book.depth.extraPercentPerFootLow}–${book.depth.extraPercentPerFootHigh} % of the dig price per foot below ${formatFeetInches(book.depth.includedDepth)}.`,
      ),
    );
  }
  const sLow = sumOfLargest(surfaceLow, count);
  const sHigh = sumOfLargest(surfaceHigh, count);
  const hard = sHigh.compare(Exact.zero) > 0;
  if (hard) {
    const names = [...surfacesSeen].map((s) => surfaceNames[s].toLowerCase()).join(', ');
    lines.push(
      pricer.computed(
        'surface_extra',
        'Hard surface cut and restored',
        Exact.of(count),
        `up to ${count} × ${PIT_SURFACE_SQFT} sq ft`,
        sLow,
        sHigh,
        `Digs under ${names}; each opens about ${PIT_SURFACE_SQFT} sq ft.`,
      ),
    );
  }
  return { lines, deep, hard };
}

function cleaningLines(pricer: Pricer, plan: RepairPlan, purpose: string): ExactLine[] {
  const lines: ExactLine[] = [];
  if (plan.roots.length > 0) lines.push(pricer.line('root_cutting', Exact.of(1), purpose));
  const jettable = plan.cleaning.filter((f) => f.observation.kind !== 'roots' && f.observation.kind !== 'seepage');
  if (jettable.length > 0) lines.push(pricer.line('hydro_jetting', Exact.of(1), purpose));
  return lines;
}

function runLength(plan: RunRepairPlan): Exact {
  return Exact.of(plan.run.distanceReached, UNITS_PER_FOOT);
}

function finish(kind: CostOptionKind, lines: ExactLine[], assumptions: string[], proposed: boolean): CostOption {
  const low = Exact.sum(lines.map((l) => l.low));
  const high = Exact.sum(lines.map((l) => l.high));
  const step = BigInt(TOTAL_ROUNDING_CENTS);
  // the one rounding: outward to the step, so the range always contains the exact total
  const lowCents = Number(Exact.of(low.numerator, low.denominator * step).floor() * step);
  const highCents = Number(Exact.of(high.numerator, high.denominator * step).ceil() * step);
  return {
    kind,
    ...costOptionInfo[kind],
    proposed,
    lines: lines.map((l) => ({
      item: l.item,
      label: l.label,
      quantity: l.quantity.toNumber(),
      quantityText: l.quantityText,
      unit: l.unit,
      unitLowCents: l.unitLowCents,
      unitHighCents: l.unitHighCents,
      lowCents: Number(l.low.round()),
      highCents: Number(l.high.round()),
      exactLow: l.low.toString(),
      exactHigh: l.high.toString(),
      note: l.note,
    })),
    lowCents,
    highCents,
    exactLow: low.toString(),
    exactHigh: high.toString(),
    assumptions,
  };
}

function pointsOf(findings: readonly Finding[], reach: Footage): Array<{ at: Footage; finding: Finding }> {
  return findings.flatMap((finding) => spotPointsOf(finding, reach).map((at) => ({ at, finding })));
}

/** Digs for a set of findings across runs: count (greedy per run) and the points they reach. */
function digsFor(findings: readonly Finding[]): { count: number; points: DigPoint[] } {
  const reach = planThresholds.excavationReach;
  const byRun = new Map<string, Finding[]>();
  for (const f of findings) {
    const list = byRun.get(f.run.id);
    if (list) list.push(f);
    else byRun.set(f.run.id, [f]);
  }
  let count = 0;
  const points: DigPoint[] = [];
  for (const list of byRun.values()) {
    const runPoints = pointsOf(list, reach);
    count += groupIntoExcavations(list[0]?.run.id ?? '', runPoints, reach).length;
    for (const p of runPoints) points.push({ run: p.finding.run, at: p.at });
  }
  return { count, points };
}

function hardSurfaceLines(pricer: Pricer, runs: readonly RunRepairPlan[]): ExactLine[] {
  const areaBySurface = new Map<SurfaceKind, Exact>();
  for (const r of runs) {
    for (const segment of r.run.surfaces) {
      const from = Math.max(0, segment.from);
      const to = Math.min(r.run.distanceReached, segment.to);
      if (to <= from || surfaceRestorationItem[segment.surface] === null) continue;
      const area = Exact.of((to - from) * TRENCH_WIDTH_FT, UNITS_PER_FOOT);
      areaBySurface.set(segment.surface, (areaBySurface.get(segment.surface) ?? Exact.zero).add(area));
    }
  }
  const lines: ExactLine[] = [];
  for (const [surface, area] of areaBySurface) {
    const item = surfaceRestorationItem[surface];
    if (item) lines.push(pricer.line(item, area, `Trench ${TRENCH_WIDTH_FT} ft wide under ${surfaceNames[surface].toLowerCase()}.`));
  }
  return lines;
}

export interface CostOptions {
  /** Whether the price book is the demo one, to say so in the assumptions. */
  demoPrices?: boolean;
}

/**
 * Repair cost options from the repair plan and a price book: each a low–high range
 * with itemised lines and its assumptions. Amounts stay exact until the totals are
 * rounded once, outward, at the end.
 */
export function buildCostOptions(plan: RepairPlan, book: PriceBook, options: CostOptions = {}): CostOptionsResult {
  const pricer = new Pricer(book);
  const common: string[] = [
    options.demoPrices
      ? 'Prices are demo defaults from consumer cost guides (weak, demo defaults), not this company’s prices.'
      : 'Prices come from the company’s price book.',
  ];
  if (book.regionalFactor !== 1) common.push(`Every price is multiplied by ${book.regionalFactor} for the local market.`);
  const anyReadings = plan.runs.some((r) => r.run.depthReadings.length > 0);
  const depthNote = anyReadings
    ? `Digging is priced to ${formatFeetInches(book.depth.includedDepth)} deep; deeper spots, from the depth readings, add ${book.depth.extraPercentPerFootLow}–${book.depth.extraPercentPerFootHigh} % of the dig price per extra foot.`
    : `No depth readings: digs are priced as no deeper than ${formatFeetInches(book.depth.includedDepth)}.`;
  const stoppedEarly = plan.runs
    .filter((r) => r.run.endReason !== 'reached_main' && r.run.endReason !== 'reached_building')
    .map((r) => `The run ${r.label} stopped at ${formatFeetInches(r.run.distanceReached)}; pipe beyond that is not priced.`);

  const result: CostOption[] = [];
  const repairRuns = plan.runs;
  const cleanFirst = cleaningLines(pricer, plan, 'Clear roots and build-up first.');
  const cleaningAssumption = cleanFirst.length > 0 ? ['Roots and build-up are cleared before the repair.'] : [];

  if (cleanFirst.length > 0) {
    const lines = [
      ...cleaningLines(pricer, plan, 'Clear roots and build-up.'),
      pricer.line('camera_inspection', Exact.of(1), 'Look again after cleaning.'),
    ];
    result.push(
      finish('cleaning', lines, [...common, 'One visit clears the whole line.', 'Cleaning does not fix damage to the pipe.'], false),
    );
  }

  const spots = repairRuns.flatMap((r) => r.spots);
  if (spots.length > 0) {
    const digs = digsFor(spots);
    const dig = digLines(pricer, digs.points, digs.count, 'Spot repair by excavation');
    const lines = [...dig.lines, pricer.line('permit', Exact.of(1), 'Digging needs a permit in most places.'), ...cleanFirst];
    result.push(
      finish(
        'spot_repairs',
        lines,
        [
          ...common,
          `Defects within ${formatFeetInches(planThresholds.excavationReach)} of each other share one dig; a long defect needs a dig every ${formatFeetInches(planThresholds.excavationReach)}.`,
          depthNote,
          'Soil and lawn are put back as part of the dig price; hard surfaces are extra.',
          'When defects share a dig, the dig is priced for the deepest and hardest-surfaced spots among them.',
          ...cleaningAssumption,
          ...stoppedEarly,
        ],
        false,
      ),
    );

    const linable = spots.filter((f) => !linerCannotFix(f));
    const unlinable = spots.filter((f) => linerCannotFix(f));
    const liners = digsFor(linable).count;
    const unlinableDigs = digsFor(unlinable);
    const linerDig = digLines(pricer, unlinableDigs.points, unlinableDigs.count, 'Spot repair where a liner cannot work');
    const linerLines: ExactLine[] = [];
    if (liners > 0) linerLines.push(pricer.line('sectional_liner', Exact.of(liners), 'One liner per damaged stretch.'));
    linerLines.push(...linerDig.lines);
    if (unlinableDigs.count > 0) linerLines.push(pricer.line('permit', Exact.of(1), 'Digging needs a permit in most places.'));
    const prep = cleanFirst.some((l) => l.item === 'hydro_jetting')
      ? cleanFirst
      : [...cleanFirst, pricer.line('hydro_jetting', Exact.of(1), 'The pipe is cleaned before lining.')];
    linerLines.push(...prep);
    result.push(
      finish(
        'sectional_liners',
        linerLines,
        [
          ...common,
          'A liner needs a round pipe at the right slope: sags, collapses and badly squeezed pipe are dug up instead.',
          `One sectional liner covers up to ${formatFeetInches(planThresholds.excavationReach)} of pipe.`,
          'The pipe is cleaned before lining.',
          ...(unlinableDigs.count > 0 ? [depthNote] : []),
          ...stoppedEarly,
        ],
        false,
      ),
    );
  }

  if (repairRuns.length > 0) {
    const totalLength = Exact.sum(repairRuns.map(runLength));
    const lengthText = repairRuns.map((r) => `${formatDecimalFeet(r.run.distanceReached)} ${r.label}`).join('; ');

    // line the whole run
    const unlinable = repairRuns.flatMap((r) => r.spots.filter(linerCannotFix));
    const unlinableDigs = digsFor(unlinable);
    const lineDig = digLines(pricer, unlinableDigs.points, unlinableDigs.count, 'Spot repair where a liner cannot work');
    const liningLines = [
      pricer.line('full_lining', totalLength, `Whole run: ${lengthText}.`),
      ...lineDig.lines,
      ...(unlinableDigs.count > 0 ? [pricer.line('permit', Exact.of(1), 'Digging needs a permit in most places.')] : []),
      ...cleanFirst,
    ];
    result.push(
      finish(
        'line_runs',
        liningLines,
        [
          ...common,
          'Each run is lined from the access point to where the camera stopped.',
          'The per-foot lining price is taken as the whole job: cleaning before lining, reopening branch lines and a camera check after, as consumer cost guides quote it.',
          'If your city needs a permit for lining, add it.',
          'A liner cannot fix a sag or a collapse; those spots are dug up.',
          ...(unlinableDigs.count > 0 ? [depthNote] : []),
          ...stoppedEarly,
        ],
        false,
      ),
    );

    result.push(
      finish(
        'burst_runs',
        [
          pricer.line('pipe_bursting', totalLength, `Whole run: ${lengthText}.`),
          pricer.line('permit', Exact.of(1), 'The two pits need a permit in most places.'),
          ...cleanFirst,
        ],
        [
          ...common,
          'The per-foot bursting price includes the two small pits at the ends of each run.',
          'Bursting follows the old pipe, so it does not remove a sag.',
          ...stoppedEarly,
        ],
        false,
      ),
    );

    const trenchLines = [pricer.line('open_trench', totalLength, `Whole run: ${lengthText}.`)];
    const open = book.items.open_trench;
    let depthLow = Exact.zero;
    let depthHigh = Exact.zero;
    for (const r of repairRuns) {
      let deepest = 0;
      for (const reading of r.run.depthReadings) deepest = Math.max(deepest, reading.depth);
      const extra = Exact.of(Math.max(0, deepest - book.depth.includedDepth), UNITS_PER_FOOT);
      const length = runLength(r);
      depthLow = depthLow.add(length.mul(extra).mul(Exact.of(open.lowCents * book.depth.extraPercentPerFootLow, 100)));
      depthHigh = depthHigh.add(length.mul(extra).mul(Exact.of(open.highCents * book.depth.extraPercentPerFootHigh, 100)));
    }
    if (depthHigh.compare(Exact.zero) > 0) {
      trenchLines.push(
        pricer.computed(
          'depth_extra',
          'Trench deeper than usual',
          totalLength,
          `${(Math.round(totalLength.toNumber() * 10) / 10).toFixed(1)} ft`,
          depthLow,
          depthHigh,
          `Priced at the deepest reading of each run: ${book.depth.extraPercentPerFootLow}–${book.depth.extraPercentPerFootHigh} % per foot below ${formatFeetInches(book.depth.includedDepth)}.`,
        ),
      );
    }
    trenchLines.push(...hardSurfaceLines(pricer, repairRuns));
    trenchLines.push(pricer.line('permit', Exact.of(1), 'Digging needs a permit in most places.'));
    trenchLines.push(...cleanFirst);
    result.push(
      finish(
        'replace_runs',
        trenchLines,
        [
          ...common,
          `The trench is about ${TRENCH_WIDTH_FT} ft wide; hard surfaces over it are cut and restored.`,
          anyReadings
            ? 'Trench depth is priced at the deepest reading of each run.'
            : `No depth readings: the trench is priced as no deeper than ${formatFeetInches(book.depth.includedDepth)}.`,
          'Soil and lawn are put back as part of the trench price.',
          ...stoppedEarly,
        ],
        false,
      ),
    );
  }

  // the proposal
  let proposed: CostOptionKind | null = null;
  if (plan.proposal === 'full_length') {
    const methods = plan.runs.filter((r) => r.fullLengthReasons.length > 0).map((r) => r.fullLengthMethod);
    const method: FullLengthMethod = methods.includes('open_trench')
      ? 'open_trench'
      : methods.includes('pipe_bursting')
        ? 'pipe_bursting'
        : 'full_lining';
    proposed = methodOption[method];
  } else if (plan.proposal === 'spot_repairs') proposed = 'spot_repairs';
  else if (plan.proposal === 'cleaning' && result.some((o) => o.kind === 'cleaning')) proposed = 'cleaning';
  for (const option of result) option.proposed = option.kind === proposed;
  if (proposed !== null) {
    const chosen = result.find((o) => o.kind === proposed);
    if (chosen) chosen.assumptions.unshift(`Proposed because: ${plan.reasons.join(' ')}`);
  }
  return { options: result, proposed, disclaimer: costDisclaimer };
}

/** "$4,800–$15,000" */
export function formatRange(option: Pick<CostOption, 'lowCents' | 'highCents'>): string {
  return `${formatCents(option.lowCents)}–${formatCents(option.highCents)}`;
}
