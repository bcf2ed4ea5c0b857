import { feet, formatFootage, type Footage, type UnitSystem } from '../footage/footage.ts';
import { collectFindings, runLabel, type Finding } from '../model/findings.ts';
import { kindInfo, materialNames, type DefectKind } from '../model/kinds.ts';
import type { AccessPoint, Inspection, Run } from '../model/schemas.ts';
import { earlyFailureMaterials } from '../checks/materials.ts';

/**
 * Which defects need a repair, where the digging goes, and when a full-length
 * method is the better proposal. Shared by the recommendations and the cost
 * options so both tell the same story. Thresholds are Underfoot's own (common
 * practice, no source) unless marked.
 */

/** Severity from which a structural defect needs a repair rather than monitoring. */
export const repairFromSeverity: Record<DefectKind, number | null> = {
  crack: 3,
  open_crack: 3,
  missing_piece: 3,
  out_of_round: 3,
  collapse: 3,
  // Minor offsets that do not catch debris or hold water are usually monitored (CHECKS.md, common practice).
  joint_offset: 4,
  joint_gap: 3,
  // A sag is only fixed by re-laying the pipe; moderate sags are monitored and cleaned.
  sag: 4,
  worn_wall: 3,
  liner_problem: 3,
  // Service conditions are cleaned, not dug up.
  roots: null,
  grease: null,
  debris: null,
  scale: null,
  standing_water: null,
  blockage: null,
  seepage: null,
};

export const planThresholds = {
  /** One dig exposes about this much pipe, so defects this close share one excavation. */
  excavationReach: feet(6) as Footage,
  /** This many separate digs on one run make a full-length method the proposal. */
  manyExcavations: 3,
  /** Damage over this share of a run's length is widespread. */
  widespreadShare: 0.25,
  /** One defect running this far is widespread. */
  longExtent: feet(10) as Footage,
};

export const needsRepair = (finding: Finding): boolean => {
  const from = repairFromSeverity[finding.observation.kind];
  return from !== null && finding.observation.severity >= from;
};

/** A liner needs a round, continuous host pipe at the right grade: it cannot fix these (common practice, no source). */
export const linerCannotFix = (finding: Finding): boolean => {
  const { kind, severity } = finding.observation;
  return kind === 'collapse' || kind === 'sag' || (kind === 'out_of_round' && severity >= 4);
};

export type FullLengthMethod = 'full_lining' | 'pipe_bursting' | 'open_trench';

export interface Excavation {
  runId: string;
  /** Start of the dig along the run, and the end of the stretch it exposes. */
  from: Footage;
  to: Footage;
  observationIds: string[];
}

export interface RunRepairPlan {
  run: Run;
  accessPoint: AccessPoint | null;
  label: string;
  /** Defects that need a repair on this run. */
  spots: Finding[];
  /** Points along the run that need to be reached by digging, one per defect and one per excavation reach along long defects. */
  spotPoints: Array<{ at: Footage; finding: Finding }>;
  excavations: Excavation[];
  /** Total length of pipe covered by the defects that need repair. */
  damagedLength: Footage;
  /** Why this run should be done full length; empty when spot repairs fit. */
  fullLengthReasons: string[];
  fullLengthMethod: FullLengthMethod;
  /** Early-failure material on this run. */
  earlyFailureMaterial: boolean;
}

export type Proposal = 'none' | 'cleaning' | 'spot_repairs' | 'full_length';

export interface RepairPlan {
  /** Runs that need a repair (spots or full length). */
  runs: RunRepairPlan[];
  /** Service conditions at severity 3 or more (cleaning). */
  cleaning: Finding[];
  roots: Finding[];
  proposal: Proposal;
  reasons: string[];
}

/**
 * Points a dig must reach: the start of each defect and, along a long one, a point
 * just past each dig's reach, plus its end — so the digs expose the whole defect.
 */
export function spotPointsOf(finding: Finding, reach: Footage): Footage[] {
  const points = [finding.start];
  for (let at = finding.start + reach + 1; at < finding.end; at += reach + 1) points.push(at);
  if (finding.end > finding.start) points.push(finding.end);
  return points;
}

/**
 * Fewest digs, each exposing `reach` of pipe, that reach every point: start a dig at
 * the first point not yet reached and take every point within reach. In one
 * dimension this greedy cover is the smallest possible, so adding a defect never
 * lowers the count.
 */
export function groupIntoExcavations(
  runId: string,
  points: ReadonlyArray<{ at: Footage; finding: Finding }>,
  reach: Footage,
): Excavation[] {
  const sorted = [...points].sort((a, b) => a.at - b.at);
  const excavations: Excavation[] = [];
  let current: Excavation | null = null;
  for (const point of sorted) {
    if (current && point.at <= current.from + reach) {
      current.to = Math.max(current.to, point.at);
      if (!current.observationIds.includes(point.finding.observation.id)) current.observationIds.push(point.finding.observation.id);
      continue;
    }
    current = { runId, from: point.at, to: point.at, observationIds: [point.finding.observation.id] };
    excavations.push(current);
  }
  return excavations;
}

function unionLength(intervals: Array<[Footage, Footage]>): Footage {
  const sorted = intervals.filter(([a, b]) => b > a).sort((x, y) => x[0] - y[0]);
  let total = 0;
  let start = -1;
  let end = -1;
  for (const [a, b] of sorted) {
    if (a > end) {
      if (end > start) total += end - start;
      start = a;
      end = b;
    } else if (b > end) end = b;
  }
  if (end > start) total += end - start;
  return total;
}

export function planRepairs(inspection: Inspection, options: { units?: UnitSystem; findings?: Finding[] } = {}): RepairPlan {
  const units = options.units ?? 'imperial';
  const findings = options.findings ?? collectFindings(inspection);
  const accessById = new Map(inspection.accessPoints.map((a) => [a.id, a]));
  const reach = planThresholds.excavationReach;

  const spotsByRun = new Map<string, Finding[]>();
  for (const finding of findings) {
    if (!needsRepair(finding)) continue;
    const list = spotsByRun.get(finding.run.id);
    if (list) list.push(finding);
    else spotsByRun.set(finding.run.id, [finding]);
  }

  const runs: RunRepairPlan[] = [];
  for (const run of inspection.runs) {
    const spots = spotsByRun.get(run.id) ?? [];
    const earlyFailureSections = run.sections.filter((s) => earlyFailureMaterials.includes(s.material));
    if (spots.length === 0 && earlyFailureSections.length === 0) continue;

    const accessPoint = accessById.get(run.accessPointId) ?? null;
    const label = runLabel(run, accessPoint);
    const spotPoints = spots.flatMap((finding) => spotPointsOf(finding, reach).map((at) => ({ at, finding })));
    const excavations = groupIntoExcavations(run.id, spotPoints, reach);
    const damagedLength = unionLength(spots.map((f) => [f.start, f.end] as [Footage, Footage]));

    const reasons: string[] = [];
    if (excavations.length >= planThresholds.manyExcavations) {
      reasons.push(`${excavations.length} separate spots need digging ${label}.`);
    }
    if (run.distanceReached > 0 && damagedLength >= run.distanceReached * planThresholds.widespreadShare) {
      reasons.push(
        `Damage covers ${formatFootage(damagedLength, units)} of the ${formatFootage(run.distanceReached, units)} run ${label}.`,
      );
    }
    for (const f of spots) {
      if (f.end - f.start >= planThresholds.longExtent) {
        reasons.push(
          `${kindInfo[f.observation.kind].name} runs from ${formatFootage(f.start, units)} to ${formatFootage(f.end, units)} ${label}.`,
        );
      }
    }
    for (const s of earlyFailureSections) {
      reasons.push(`${materialNames[s.material]} pipe ${label} is known to fail early.`);
    }

    const hasSagRepair = spots.some((f) => f.observation.kind === 'sag');
    const cannotLine =
      spots.some((f) => f.observation.kind === 'collapse' || (f.observation.kind === 'out_of_round' && f.observation.severity >= 4)) ||
      earlyFailureSections.length > 0;
    const fullLengthMethod: FullLengthMethod = hasSagRepair ? 'open_trench' : cannotLine ? 'pipe_bursting' : 'full_lining';

    runs.push({
      run,
      accessPoint,
      label,
      spots,
      spotPoints,
      excavations,
      damagedLength,
      fullLengthReasons: reasons,
      fullLengthMethod,
      earlyFailureMaterial: earlyFailureSections.length > 0,
    });
  }

  const cleaning = findings.filter((f) => f.group === 'service' && f.observation.severity >= 3);
  const roots = cleaning.filter((f) => f.observation.kind === 'roots');
  const reasons: string[] = [];
  let proposal: Proposal = 'none';
  if (runs.some((r) => r.fullLengthReasons.length > 0)) {
    proposal = 'full_length';
    for (const r of runs) reasons.push(...r.fullLengthReasons);
  } else if (runs.some((r) => r.spots.length > 0)) {
    proposal = 'spot_repairs';
    const count = runs.reduce((n, r) => n + r.excavations.length, 0);
    reasons.push(`${count} ${count === 1 ? 'spot needs' : 'spots need'} repair; the rest of the pipe can stay.`);
  } else if (cleaning.length > 0) {
    proposal = 'cleaning';
    reasons.push('Build-up or roots need cleaning; the pipe itself does not need repair.');
  }
  return { runs, cleaning, roots, proposal, reasons };
}
