import { UNITS_PER_FOOT, UNITS_PER_METRE, formatFootage, type Footage, type UnitSystem } from '../footage/footage.ts';
import { accessPointLabel, runLabel, type Finding } from '../model/findings.ts';
import {
  accessPointNames,
  bendInfo,
  kindInfo,
  materialNames,
  materialShortNames,
  outdoorAccessKinds,
  runDirectionNames,
  type Material,
} from '../model/kinds.ts';
import { isDefect, type AccessPoint, type Inspection, type Observation, type Run } from '../model/schemas.ts';
import { materialStyles, severityStyle, type PinShape } from './palette.ts';

/**
 * A schematic of the line from the building (left) to the main (right), in a
 * 360-unit-wide coordinate space so it reads at phone width with 1 unit = 1 px.
 * The web page and the PDF draw the same model.
 */
export const DIAGRAM_WIDTH = 360;
const MARGIN = 8;
const BOX_WIDTH = 46;
const AXIS_X0 = MARGIN + BOX_WIDTH;
const AXIS_X1 = DIAGRAM_WIDTH - MARGIN - BOX_WIDTH;
/** Room kept for the unseen stretch when no run reached the main. */
const UNSEEN_GAP = 26;
const PIN_ROW = 18;
const PIN_GAP_X = 16;
const MAX_PIN_ROWS = 6;
const LANE_BASE = 44;
const TOP = 28;

export interface DiagramBox {
  x: number;
  y: number;
  width: number;
  height: number;
  label: string;
}

export interface DiagramSegment {
  runId: string;
  sectionId: string | null;
  x1: number;
  x2: number;
  y: number;
  material: Material;
  color: string;
  dash: string | null;
  /** Short label drawn on the section when it is wide enough, e.g. "Clay 4 in". */
  label: string | null;
  /** Full description for screen readers. */
  description: string;
}

export interface DiagramPin {
  /** The finding's observation id, so the web can link a pin to its finding. */
  observationId: string;
  runId: string;
  number: number;
  /** Where the pin touches the line, and where its head sits. */
  x: number;
  /** Other end of a continuous defect, or null for a spot. */
  extentX: number | null;
  lineY: number;
  headY: number;
  severity: number;
  shape: PinShape;
  shapeName: string;
  color: string;
  /** "3. Open crack, severity 4, at 23' 4" toward the main" */
  text: string;
}

export interface DiagramMark {
  observationId: string;
  runId: string;
  x: number;
  y: number;
  label: string;
  text: string;
}

export interface DiagramAccessPoint {
  accessPointId: string;
  x: number;
  y: number;
  label: string;
  /** Where the label sits (kept clear of the house and the main). */
  labelX: number;
  labelAnchor: 'start' | 'end';
  outdoor: boolean;
  text: string;
}

export interface DiagramLane {
  accessPointId: string;
  y: number;
  accessPoint: DiagramAccessPoint;
  segments: DiagramSegment[];
  /** Stretches on a run with no section recorded. */
  unknownStretches: Array<{ runId: string; x1: number; x2: number; y: number }>;
  /** Where each run stopped, with its reason. */
  runEnds: Array<{ runId: string; x: number; y: number; reachedTarget: boolean; text: string }>;
  pins: DiagramPin[];
  marks: DiagramMark[];
}

export interface DiagramTick {
  x: number;
  label: string;
}

export interface DiagramLegendItem {
  kind: 'material' | 'severity';
  label: string;
  color: string;
  dash: string | null;
  shape: PinShape | null;
}

export interface DiagramModel {
  width: number;
  height: number;
  units: UnitSystem;
  title: string;
  description: string;
  building: DiagramBox;
  main: DiagramBox & { reached: boolean };
  /** Dashed stretch before the main when no run reached it. */
  unseenBeforeMain: { x1: number; x2: number; y: number } | null;
  lanes: DiagramLane[];
  scale: { y: number; x0: number; x1: number; ticks: DiagramTick[]; unitLabel: string };
  legend: Array<DiagramLegendItem & { x: number; y: number }>;
}

export interface DiagramOptions {
  units?: UnitSystem;
}

const interiorKinds = new Set(['interior_cleanout', 'roof_vent', 'toilet_removed']);

/** Distance of each access point from the building wall along the line. */
export function accessPointOffsets(inspection: Inspection): Map<string, Footage> {
  const offsets = new Map<string, Footage>();
  for (const accessPoint of inspection.accessPoints) {
    if (accessPoint.offsetFromBuilding !== null) {
      offsets.set(accessPoint.id, accessPoint.offsetFromBuilding);
      continue;
    }
    const towardBuilding = inspection.runs.filter((r) => r.accessPointId === accessPoint.id && r.direction === 'toward_building');
    const reached = towardBuilding.find((r) => r.endReason === 'reached_building');
    if (reached) offsets.set(accessPoint.id, reached.distanceReached);
    else if (interiorKinds.has(accessPoint.kind)) offsets.set(accessPoint.id, 0);
    else
      offsets.set(
        accessPoint.id,
        towardBuilding.reduce((m, r) => Math.max(m, r.distanceReached), 0),
      );
  }
  return offsets;
}

/** Along-the-line position (from the building wall) of a footage on a run. */
const positionOf = (run: Run, offset: Footage, at: Footage): Footage => (run.direction === 'toward_main' ? offset + at : offset - at);

/**
 * How far from the house a finding starts, on the diagram's scale: findings are measured from
 * the access point the camera went in at, the diagram from the building wall, and a reader
 * holding one against the other needs both. Pass `offsets` when asking for many findings.
 */
export function findingFromBuilding(
  inspection: Inspection,
  finding: Pick<Finding, 'run' | 'start'>,
  offsets: Map<string, Footage> = accessPointOffsets(inspection),
): Footage {
  return Math.max(0, positionOf(finding.run, offsets.get(finding.run.accessPointId) ?? 0, finding.start));
}

function niceStep(span: number, units: UnitSystem): number {
  const perUnit = units === 'metric' ? UNITS_PER_METRE : UNITS_PER_FOOT;
  const target = span / perUnit / 4; // about four intervals fit at phone width
  const steps = units === 'metric' ? [1, 2, 5, 10, 20, 25, 50, 100, 200, 500] : [5, 10, 20, 25, 50, 100, 200, 250, 500];
  const chosen = steps.find((s) => s >= target) ?? steps[steps.length - 1] ?? 100;
  return chosen * perUnit;
}

function featureLabel(obs: Observation): string {
  switch (obs.kind) {
    case 'bend':
      return bendInfo[obs.angle].degrees + '°';
    case 'branch':
      return obs.fitting === 'unknown' ? 'Branch' : obs.fitting === 'wye' ? 'Wye' : 'Tee';
    case 'size_change':
      return `${obs.fromSize}→${obs.toSize} in`;
    case 'material_change':
      return `${materialShortNames[obs.fromMaterial]}→${materialShortNames[obs.toMaterial]}`;
    case 'cleanout':
      return 'Cleanout';
    case 'main_connection':
      return 'Main';
    default:
      return '';
  }
}

/** The diagram model of an inspection. */
export function layoutDiagram(inspection: Inspection, options: DiagramOptions = {}): DiagramModel {
  const units = options.units ?? 'imperial';
  const offsets = accessPointOffsets(inspection);
  const runsByAccess = new Map<string, Run[]>();
  for (const run of inspection.runs) {
    const list = runsByAccess.get(run.accessPointId);
    if (list) list.push(run);
    else runsByAccess.set(run.accessPointId, [run]);
  }

  // the span of positions to draw
  let minPos = 0;
  let maxPos = 0;
  for (const run of inspection.runs) {
    const offset = offsets.get(run.accessPointId) ?? 0;
    const end = positionOf(run, offset, run.distanceReached);
    minPos = Math.min(minPos, offset, end);
    maxPos = Math.max(maxPos, offset, end);
  }
  for (const value of offsets.values()) maxPos = Math.max(maxPos, value);
  if (maxPos - minPos <= 0) maxPos = minPos + 10 * UNITS_PER_FOOT;
  const mainReached = inspection.runs.some((r) => r.endReason === 'reached_main');
  const drawEnd = mainReached ? AXIS_X1 : AXIS_X1 - UNSEEN_GAP;
  const scaleX = (pos: Footage) => AXIS_X0 + ((pos - minPos) / (maxPos - minPos)) * (drawEnd - AXIS_X0);

  const accessPoints = [...inspection.accessPoints].sort((a, b) => (offsets.get(a.id) ?? 0) - (offsets.get(b.id) ?? 0));
  const lanes: DiagramLane[] = [];
  let y = TOP;
  let pinNumber = 0;
  const materialsUsed = new Set<Material>();
  const severitiesUsed = new Set<number>();

  for (const accessPoint of accessPoints) {
    const runs = runsByAccess.get(accessPoint.id) ?? [];
    const offset = offsets.get(accessPoint.id) ?? 0;
    const lane = buildLane(accessPoint, runs, offset, scaleX, units);
    // stack pins in rows so heads do not overlap
    const rowsLastX: number[] = [];
    const rowOf = new Map<DiagramPin, number>();
    const sortedPins = lane.pins.sort((a, b) => a.x - b.x);
    for (const pin of sortedPins) {
      let row = rowsLastX.findIndex((lastX) => pin.x - lastX >= PIN_GAP_X);
      if (row === -1) {
        if (rowsLastX.length < MAX_PIN_ROWS) row = rowsLastX.length;
        else {
          // all rows full: use the row whose last pin is farthest left
          row = rowsLastX.reduce((best, lastX, i) => (lastX < (rowsLastX[best] ?? Infinity) ? i : best), 0);
        }
      }
      rowsLastX[row] = pin.x;
      rowOf.set(pin, row);
    }
    const rows = Math.max(1, rowsLastX.length);
    const lineY = y + rows * PIN_ROW + 14;
    for (const pin of sortedPins) {
      pinNumber += 1;
      pin.number = pinNumber;
      pin.text = `${pin.number}. ${pin.text}`;
      pin.lineY = lineY;
      pin.headY = lineY - 14 - (rowOf.get(pin) ?? 0) * PIN_ROW;
      severitiesUsed.add(pin.severity);
    }
    for (const s of lane.segments) {
      s.y = lineY;
      materialsUsed.add(s.material);
    }
    for (const u of lane.unknownStretches) u.y = lineY;
    for (const m of lane.marks) m.y = lineY;
    for (const e of lane.runEnds) e.y = lineY;
    lane.y = lineY;
    lane.accessPoint.y = lineY;
    lanes.push(lane);
    y = lineY + LANE_BASE - 14;
  }
  if (lanes.length === 0) y = TOP + 40;

  const boxTop = TOP - 6;
  const boxHeight = Math.max(40, y - boxTop - 6);
  const firstLaneY = lanes[0]?.y ?? TOP + 20;
  const building: DiagramBox = { x: MARGIN, y: boxTop, width: BOX_WIDTH, height: boxHeight, label: 'House' };
  const main = { x: AXIS_X1, y: boxTop, width: BOX_WIDTH, height: boxHeight, label: 'Main', reached: mainReached };
  const unseenBeforeMain = mainReached ? null : { x1: drawEnd, x2: AXIS_X1, y: firstLaneY };

  // footage scale
  const scaleY = y + 4;
  const step = niceStep(maxPos - minPos, units);
  const ticks: DiagramTick[] = [];
  const perUnit = units === 'metric' ? UNITS_PER_METRE : UNITS_PER_FOOT;
  const firstTick = Math.ceil(minPos / step) * step;
  for (let pos = firstTick; pos <= maxPos + 1; pos += step) {
    ticks.push({ x: round1(scaleX(pos)), label: `${Math.round(pos / perUnit)}` });
  }
  const unitLabel = units === 'metric' ? 'm from the house' : 'ft from the house';

  // legend
  const legendItems: DiagramLegendItem[] = [];
  for (const material of [...materialsUsed].sort()) {
    const style = materialStyles[material];
    legendItems.push({ kind: 'material', label: materialNames[material], color: style.color, dash: style.dash, shape: null });
  }
  for (const severity of [...severitiesUsed].sort()) {
    const style = severityStyle(severity);
    legendItems.push({
      kind: 'severity',
      label: `Severity ${severity}`,
      color: style.color,
      dash: null,
      shape: style.shape,
    });
  }
  const legend: DiagramModel['legend'] = [];
  let lx = MARGIN;
  let ly = scaleY + 36;
  for (const item of legendItems) {
    const width = 26 + item.label.length * 5.6;
    if (lx + width > DIAGRAM_WIDTH - MARGIN) {
      lx = MARGIN;
      ly += 16;
    }
    legend.push({ kind: item.kind, label: item.label, color: item.color, dash: item.dash, shape: item.shape, x: round1(lx), y: ly });
    lx += width + 8;
  }
  const height = Math.ceil((legend.length > 0 ? ly + 12 : scaleY + 30) + MARGIN);

  const pinCount = lanes.reduce((n, l) => n + l.pins.length, 0);
  const description =
    `The sewer line from the house on the left to the public main on the right, with a footage scale. ` +
    `${lanes.length} access ${lanes.length === 1 ? 'point' : 'points'}, ${inspection.runs.length} camera ${inspection.runs.length === 1 ? 'run' : 'runs'}, ` +
    `${pinCount} ${pinCount === 1 ? 'finding' : 'findings'} pinned at ${pinCount === 1 ? 'its' : 'their'} footage. ` +
    (mainReached ? 'The camera reached the main.' : 'The camera did not reach the main; the last stretch is drawn dashed.');

  return {
    width: DIAGRAM_WIDTH,
    height,
    units,
    title: 'Sewer line diagram',
    description,
    building,
    main,
    unseenBeforeMain,
    lanes,
    scale: { y: scaleY, x0: AXIS_X0, x1: drawEnd, ticks, unitLabel },
    legend,
  };
}

const round1 = (value: number) => Math.round(value * 10) / 10;

/** Approximate text width at 9 px (for placing labels; no font metrics in core). */
const textWidth = (text: string) => text.length * 5;

function labelPlacement(x: number, label: string): { labelX: number; labelAnchor: 'start' | 'end' } {
  const start = Math.max(AXIS_X0 + 2, x - 6);
  if (start + textWidth(label) <= AXIS_X1 - 2) return { labelX: round1(start), labelAnchor: 'start' };
  return { labelX: round1(Math.min(AXIS_X1 - 2, x + 6)), labelAnchor: 'end' };
}

function buildLane(
  accessPoint: AccessPoint,
  runs: readonly Run[],
  offset: Footage,
  scaleX: (pos: Footage) => number,
  units: UnitSystem,
): DiagramLane {
  const segments: DiagramSegment[] = [];
  const unknownStretches: DiagramLane['unknownStretches'] = [];
  const pins: DiagramPin[] = [];
  const marks: DiagramMark[] = [];
  const runEnds: DiagramLane['runEnds'] = [];
  const apLabel = accessPointLabel(accessPoint);

  for (const run of runs) {
    const label = runLabel(run, accessPoint);
    const direction = runDirectionNames[run.direction];
    const xAt = (at: Footage) => round1(scaleX(positionOf(run, offset, at)));
    const sections = [...run.sections].sort((a, b) => a.from - b.from);
    let covered = 0;
    for (const section of sections) {
      if (section.from > covered) {
        unknownStretches.push({
          runId: run.id,
          x1: Math.min(xAt(covered), xAt(section.from)),
          x2: Math.max(xAt(covered), xAt(section.from)),
          y: 0,
        });
      }
      covered = Math.max(covered, section.to);
      const x1 = Math.min(xAt(section.from), xAt(section.to));
      const x2 = Math.max(xAt(section.from), xAt(section.to));
      const style = materialStyles[section.material];
      const short = `${materialShortNames[section.material]} ${section.diameterIn} in`;
      segments.push({
        runId: run.id,
        sectionId: section.id,
        x1,
        x2,
        y: 0,
        material: section.material,
        color: style.color,
        dash: style.dash,
        label: x2 - x1 >= short.length * 5.6 + 6 ? short : null,
        description: `${materialNames[section.material]}, ${section.diameterIn} in, from ${formatFootage(section.from, units)} to ${formatFootage(section.to, units)} ${label}`,
      });
    }
    if (covered < run.distanceReached) {
      unknownStretches.push({
        runId: run.id,
        x1: Math.min(xAt(covered), xAt(run.distanceReached)),
        x2: Math.max(xAt(covered), xAt(run.distanceReached)),
        y: 0,
      });
    }
    const reachedTarget =
      (run.direction === 'toward_main' && run.endReason === 'reached_main') ||
      (run.direction === 'toward_building' && run.endReason === 'reached_building');
    runEnds.push({
      runId: run.id,
      x: xAt(run.distanceReached),
      y: 0,
      reachedTarget,
      text: `Run ${label} ended at ${formatFootage(run.distanceReached, units)}`,
    });

    for (const obs of run.observations) {
      if (isDefect(obs)) {
        const style = severityStyle(obs.severity);
        const where =
          obs.to !== null && obs.to > obs.at
            ? `from ${formatFootage(obs.at, units)} to ${formatFootage(obs.to, units)}`
            : `at ${formatFootage(obs.at, units)}`;
        pins.push({
          observationId: obs.id,
          runId: run.id,
          number: 0,
          x: xAt(obs.at),
          extentX: obs.to !== null && obs.to > obs.at ? xAt(obs.to) : null,
          lineY: 0,
          headY: 0,
          severity: obs.severity,
          shape: style.shape,
          shapeName: style.shapeName,
          color: style.color,
          text: `${kindInfo[obs.kind].name}, severity ${obs.severity}, ${where} ${direction}`,
        });
      } else if (obs.kind !== 'run_end') {
        const name = obs.kind === 'bend' ? bendInfo[obs.angle].name : kindInfo[obs.kind].name;
        marks.push({
          observationId: obs.id,
          runId: run.id,
          x: xAt(obs.at),
          y: 0,
          label: featureLabel(obs),
          text: `${name}, ${formatFootage(obs.at, units)} ${direction}`,
        });
      }
    }
  }

  const placement = labelPlacement(round1(scaleX(offset)), accessPointNames[accessPoint.kind]);
  return {
    accessPointId: accessPoint.id,
    y: 0,
    accessPoint: {
      accessPointId: accessPoint.id,
      x: round1(scaleX(offset)),
      y: 0,
      label: accessPointNames[accessPoint.kind],
      labelX: placement.labelX,
      labelAnchor: placement.labelAnchor,
      outdoor: outdoorAccessKinds.includes(accessPoint.kind),
      text: `Access: ${apLabel}`,
    },
    segments,
    unknownStretches,
    runEnds,
    pins,
    marks,
  };
}
