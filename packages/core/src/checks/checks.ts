import { UNITS_PER_FOOT, formatFootage, type Footage, type UnitSystem } from '../footage/footage.ts';
import { runLabel } from '../model/findings.ts';
import { kindInfo, materialNames, outdoorAccessKinds, runEndReasonNames } from '../model/kinds.ts';
import { isDefect, type Inspection, type Run } from '../model/schemas.ts';
import { DEFAULT_DIAMETER_IN, minimumSlope, type SlopeResult } from '../slope/slope.ts';
import { cfsToGpm, manningFullPipe, maxFixtureUnits } from './hydraulics.ts';
import { earlyFailureMaterials, hazardousMaterials, materialFacts } from './materials.ts';

export type CheckKind =
  | 'size_reduced'
  | 'early_failure_material'
  | 'hazardous_material'
  | 'material_newer_than_house'
  | 'material_older_than_house'
  | 'material_age'
  | 'run_ended_early'
  | 'main_not_reached'
  | 'no_outdoor_cleanout'
  | 'capacity'
  | 'checked_but_found';

export type CheckLevel = 'note' | 'advice' | 'concern';

export interface Check {
  id: string;
  kind: CheckKind;
  level: CheckLevel;
  title: string;
  text: string;
  /** The code section or reference behind it, or "common practice, no source". */
  source: string;
  runId: string | null;
  at: Footage | null;
  observationIds: string[];
}

export interface CheckOptions {
  units?: UnitSystem;
  /** The year to measure pipe age against. */
  currentYear?: number;
  /** Slope results, to base the capacity note on a measured slope. */
  slope?: SlopeResult;
}

/** Years of slack before a material is called out of its era (common practice, no source). */
export const ERA_MARGIN_YEARS = 5;

/** Transitions closer than this are the same place (common practice, no source). */
const SAME_PLACE: Footage = UNITS_PER_FOOT;

interface SizeTransition {
  at: Footage;
  /** Size on the access-point side (lower footage). */
  near: number;
  /** Size beyond (higher footage). */
  far: number;
  observationId: string | null;
}

export interface SizeReduction {
  runId: string;
  at: Footage;
  from: number;
  to: number;
  observationIds: string[];
}

function sizeTransitions(run: Run): SizeTransition[] {
  const fromObservations: SizeTransition[] = [];
  for (const obs of run.observations) {
    if (obs.kind === 'size_change') {
      fromObservations.push({ at: obs.at, near: obs.fromSize, far: obs.toSize, observationId: obs.id });
    }
  }
  const sections = [...run.sections].sort((a, b) => a.from - b.from);
  const fromSections: SizeTransition[] = [];
  for (let i = 1; i < sections.length; i += 1) {
    const a = sections[i - 1];
    const b = sections[i];
    if (a && b && a.diameterIn !== b.diameterIn) {
      fromSections.push({ at: b.from, near: a.diameterIn, far: b.diameterIn, observationId: null });
    }
  }
  // a recorded size change explains a section boundary at the same place
  const unexplained = fromSections.filter((t) => !fromObservations.some((o) => Math.abs(o.at - t.at) <= SAME_PLACE));
  return [...fromObservations, ...unexplained].sort((a, b) => a.at - b.at);
}

/**
 * IPC 704.2: drainage pipe shall not be reduced in size in the direction of flow;
 * a 4×3 closet bend is not a reduction. Camera footage grows away from the access
 * point: on a run toward the main the water flows the same way, toward the
 * building it flows the other way.
 */
export function findSizeReductions(run: Run): SizeReduction[] {
  const closetBends = run.observations.filter((o) => o.kind === 'size_change' && o.fitting === 'closet_bend');
  const found: SizeReduction[] = [];
  for (const t of sizeTransitions(run)) {
    const upstream = run.direction === 'toward_main' ? t.near : t.far;
    const downstream = run.direction === 'toward_main' ? t.far : t.near;
    if (downstream >= upstream) continue;
    if (closetBends.some((o) => Math.abs(o.at - t.at) <= SAME_PLACE)) continue;
    found.push({
      runId: run.id,
      at: t.at,
      from: upstream,
      to: downstream,
      observationIds: t.observationId ? [t.observationId] : [],
    });
  }
  return found;
}

/** Across an access point: water flows from the run toward the building into the run toward the main. */
export function findReductionsAtAccessPoints(inspection: Inspection): SizeReduction[] {
  const found: SizeReduction[] = [];
  const sizeNearAccess = (run: Run): number | null => {
    let best: { from: number; size: number } | null = null;
    for (const s of run.sections) if (!best || s.from < best.from) best = { from: s.from, size: s.diameterIn };
    return best?.size ?? null;
  };
  for (const accessPoint of inspection.accessPoints) {
    const runs = inspection.runs.filter((r) => r.accessPointId === accessPoint.id);
    for (const up of runs.filter((r) => r.direction === 'toward_building')) {
      for (const down of runs.filter((r) => r.direction === 'toward_main')) {
        const upSize = sizeNearAccess(up);
        const downSize = sizeNearAccess(down);
        if (upSize !== null && downSize !== null && downSize < upSize) {
          found.push({ runId: down.id, at: 0, from: upSize, to: downSize, observationIds: [] });
        }
      }
    }
  }
  return found;
}

function accessPointLabelFor(run: Run, accessById: Map<string, Inspection['accessPoints'][number]>): string {
  return runLabel(run, accessById.get(run.accessPointId) ?? null).replace(/^toward the (main|building) from /, '');
}

function reductionCheck(reduction: SizeReduction, label: string, units: UnitSystem): Omit<Check, 'id'> {
  const where =
    reduction.at > 0 ? `At ${formatFootage(reduction.at, units)} ${label}` : `${label[0]?.toUpperCase() ?? ''}${label.slice(1)}`;
  return {
    kind: 'size_reduced',
    level: 'concern',
    title: 'Pipe gets smaller in the direction of flow',
    text: `${where} the pipe goes from ${reduction.from} in to ${reduction.to} in in the direction the water flows. Plumbing codes do not allow a drain to get smaller downstream, because waste can catch at the step.`,
    source: 'IPC 704.2 (a 4×3 closet bend is not a reduction)',
    runId: reduction.runId,
    at: reduction.at,
    observationIds: reduction.observationIds,
  };
}

function check(partial: Omit<Check, 'id'>, index: number): Check {
  return { id: `${partial.kind}-${index}`, ...partial };
}

/** Code and risk checks (PRODUCT.md §5.5). */
export function runChecks(inspection: Inspection, options: CheckOptions = {}): Check[] {
  const units = options.units ?? 'imperial';
  const currentYear = options.currentYear ?? new Date().getUTCFullYear();
  const accessById = new Map(inspection.accessPoints.map((a) => [a.id, a]));
  const out: Array<Omit<Check, 'id'>> = [];
  const yearBuilt = inspection.property.yearBuilt;

  for (const run of inspection.runs) {
    const label = runLabel(run, accessById.get(run.accessPointId) ?? null);

    for (const reduction of findSizeReductions(run)) {
      out.push(reductionCheck(reduction, label, units));
    }

    const seenMaterials = new Set<string>();
    for (const section of run.sections) {
      const facts = materialFacts[section.material];
      if (earlyFailureMaterials.includes(section.material) && !seenMaterials.has(`early-${section.material}`)) {
        seenMaterials.add(`early-${section.material}`);
        out.push({
          kind: 'early_failure_material',
          level: 'concern',
          title: `${materialNames[section.material]} pipe`,
          text: `${materialNames[section.material]} pipe from ${formatFootage(section.from, units)} to ${formatFootage(section.to, units)} ${label}. ${facts.weakness ?? ''} It typically lasts ${facts.lifeYears?.[0]}–${facts.lifeYears?.[1]} years.`,
          source: 'CHECKS.md material eras and service life (read)',
          runId: run.id,
          at: section.from,
          observationIds: [],
        });
      }
      if (hazardousMaterials.includes(section.material) && !seenMaterials.has(`hazard-${section.material}`)) {
        seenMaterials.add(`hazard-${section.material}`);
        out.push({
          kind: 'hazardous_material',
          level: 'advice',
          title: `${materialNames[section.material]} pipe`,
          text: `${materialNames[section.material]} pipe ${label}. ${facts.weakness ?? ''}`,
          source: 'Asbestos handling rules vary by place (from memory); local rules govern',
          runId: run.id,
          at: section.from,
          observationIds: [],
        });
      }
      if (yearBuilt !== null && !seenMaterials.has(`era-${section.material}`)) {
        seenMaterials.add(`era-${section.material}`);
        const start = facts.eraStart;
        const end = facts.eraEnd;
        if (start !== null && yearBuilt + ERA_MARGIN_YEARS < start) {
          out.push({
            kind: 'material_newer_than_house',
            level: 'note',
            title: 'Newer pipe than the house',
            text: `${materialNames[section.material]} pipe ${label} came into use around ${start}, after the house was built in ${yearBuilt}. This part of the line was probably replaced or repaired. Ask the seller for records.`,
            source: 'CHECKS.md material eras (sanity bands; several weak)',
            runId: run.id,
            at: section.from,
            observationIds: [],
          });
        } else if (end !== null && yearBuilt - ERA_MARGIN_YEARS > end) {
          out.push({
            kind: 'material_older_than_house',
            level: 'note',
            title: 'Older kind of pipe than the house',
            text: `${materialNames[section.material]} pipe ${label} was mostly used until about ${end}, before the house was built in ${yearBuilt}. It may be reused older pipe, or the material may need a second look.`,
            source: 'CHECKS.md material eras (sanity bands; several weak)',
            runId: run.id,
            at: section.from,
            observationIds: [],
          });
        } else if (facts.lifeYears !== null && currentYear - yearBuilt >= facts.lifeYears[0]) {
          const age = currentYear - yearBuilt;
          out.push({
            kind: 'material_age',
            level: 'note',
            title: 'Pipe near the end of its usual life',
            text: `If the ${materialNames[section.material].toLowerCase()} pipe ${label} is original, it is about ${age} years old. This kind of pipe typically lasts ${facts.lifeYears[0]}–${facts.lifeYears[1]} years.`,
            source: 'CHECKS.md material service life (sanity bands; several weak)',
            runId: run.id,
            at: section.from,
            observationIds: [],
          });
        }
      }
    }

    const reachedEnd =
      (run.direction === 'toward_main' && run.endReason === 'reached_main') ||
      (run.direction === 'toward_building' && run.endReason === 'reached_building');
    if (!reachedEnd) {
      const target = run.direction === 'toward_main' ? 'the main' : 'the building';
      out.push({
        kind: 'run_ended_early',
        level: 'advice',
        title: `Camera did not reach ${target}`,
        text: `The run ${label} ended at ${formatFootage(run.distanceReached, units)}: ${runEndReasonNames[run.endReason].toLowerCase()}${run.endNote ? ` (${run.endNote})` : ''}. The rest of the line to ${target} was not seen.`,
        source: 'common practice, no source',
        runId: run.id,
        at: run.distanceReached,
        observationIds: run.observations.filter((o) => o.kind === 'run_end').map((o) => o.id),
      });
    }
  }

  for (const reduction of findReductionsAtAccessPoints(inspection)) {
    const run = inspection.runs.find((r) => r.id === reduction.runId);
    const label = run ? `at ${accessPointLabelFor(run, accessById)}` : 'at an access point';
    out.push(reductionCheck(reduction, label, units));
  }

  if (inspection.runs.length > 0 && !inspection.runs.some((r) => r.endReason === 'reached_main')) {
    out.push({
      kind: 'main_not_reached',
      level: 'advice',
      title: 'The main was not reached',
      text: 'No run reached the public sewer main, so the line between the last point seen and the main is unknown. A second look from another access point, or after cleaning, may reach it.',
      source: 'common practice, no source',
      runId: null,
      at: null,
      observationIds: [],
    });
  }

  if (inspection.accessPoints.length > 0 && !inspection.accessPoints.some((a) => outdoorAccessKinds.includes(a.kind))) {
    out.push({
      kind: 'no_outdoor_cleanout',
      level: 'advice',
      title: 'No outdoor cleanout',
      text: 'The line was reached from inside the house. An outdoor cleanout makes cleaning and future camera checks easier and less messy.',
      source: 'common practice, no source',
      runId: null,
      at: null,
      observationIds: [],
    });
  }

  // "Checked and not found" must not contradict what was recorded.
  const observedKinds = new Map<string, string[]>();
  for (const run of inspection.runs) {
    for (const obs of run.observations) {
      if (!isDefect(obs)) continue;
      const list = observedKinds.get(obs.kind);
      if (list) list.push(obs.id);
      else observedKinds.set(obs.kind, [obs.id]);
    }
  }
  for (const kind of inspection.checkedNotFound) {
    const ids = observedKinds.get(kind);
    if (ids) {
      out.push({
        kind: 'checked_but_found',
        level: 'concern',
        title: 'Listed as not found, but recorded',
        text: `${kindInfo[kind].name} is listed as checked and not found, but ${ids.length === 1 ? 'one observation records it' : `${ids.length} observations record it`}. Fix one of the two before publishing.`,
        source: 'common practice, no source',
        runId: null,
        at: null,
        observationIds: ids,
      });
    }
  }

  out.push(...capacityNotes(inspection, options.slope, accessById));
  return out.map(check);
}

/**
 * A capacity note where it helps: small pipe (3 in or less), or a measured slope
 * below the code minimum. Flow by Manning's equation (full pipe), fixture units by
 * IPC Table 710.1(1).
 */
function capacityNotes(
  inspection: Inspection,
  slope: SlopeResult | undefined,
  accessById: Map<string, Inspection['accessPoints'][number]>,
): Array<Omit<Check, 'id'>> {
  const notes: Array<Omit<Check, 'id'>> = [];
  for (const run of inspection.runs) {
    const widest = run.sections.reduce<number | null>((m, s) => (m === null ? s.diameterIn : Math.max(m, s.diameterIn)), null);
    const diameterIn = widest ?? DEFAULT_DIAMETER_IN;
    const measured = slope?.runs.find((r) => r.runId === run.id)?.overall ?? null;
    const belowMinimum = measured !== null && measured.inchesPerFoot > 0 && measured.status === 'below_minimum';
    if (diameterIn > 3 && !belowMinimum) continue;
    if (widest === null) continue;

    const inchesPerFoot = measured !== null && measured.inchesPerFoot > 0 ? measured.inchesPerFoot : minimumSlope(diameterIn).inchesPerFoot;
    const material = run.sections.find((s) => s.diameterIn === diameterIn)?.material ?? 'unknown';
    const n = materialFacts[material].manningN;
    const flow = manningFullPipe({ diameter: diameterIn / 12, slope: inchesPerFoot / 12, n });
    const gpm = cfsToGpm(flow.flow);
    const dfu = maxFixtureUnits(diameterIn, inchesPerFoot);
    const basis = measured !== null && measured.inchesPerFoot > 0 ? 'the measured slope' : 'the code minimum slope';
    const label = runLabel(run, accessById.get(run.accessPointId) ?? null);
    notes.push({
      kind: 'capacity',
      level: 'note',
      title: 'How much this pipe can carry',
      text:
        `At ${basis} of about ${inchesPerFoot.toFixed(2)} in per ft, the ${diameterIn} in pipe ${label} can carry about ${Math.round(gpm)} gallons a minute when running full.` +
        (dfu
          ? ` The plumbing code rates a ${diameterIn} in building sewer at ${dfu.slope} in per ft for up to ${dfu.value} drainage fixture units.`
          : '') +
        (belowMinimum ? ' A flatter pipe moves water but leaves solids behind more easily.' : ''),
      source: `Manning's equation, k = 1.486, n = ${n} for ${materialNames[material].toLowerCase()}${dfu ? `; ${dfu.source}${dfu.flag === 'memory' ? ' (value from memory)' : ''}` : ''}`,
      runId: run.id,
      at: null,
      observationIds: [],
    });
  }
  return notes;
}
