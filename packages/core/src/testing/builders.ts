/**
 * Small builders for invented inspections, used by the tests and the benchmark.
 * Distances are given in feet for brevity and converted with `feet()`.
 */
import { feet } from '../footage/footage.ts';
import type { AccessPointKind, Material, RunDirection, RunEndReason, SurfaceKind } from '../model/kinds.ts';
import { inspectionSchema, type Inspection, type InspectionInput, type ObservationInput } from '../model/schemas.ts';

export type ObservationSpec = { kind: string; at: number; to?: number; id?: string; [key: string]: unknown };

export interface RunSpec {
  id?: string;
  accessPointId?: string;
  direction?: RunDirection;
  /** Feet reached. */
  distance: number;
  endReason?: RunEndReason;
  /** [fromFt, toFt, material, diameterIn] */
  sections?: Array<[number, number, Material, number]>;
  observations?: ObservationSpec[];
  /** [atFt, depthFt] or [atFt, depthFt, groundHeightFt] */
  depths?: Array<[number, number] | [number, number, number]>;
  /** [fromFt, toFt, surface] */
  surfaces?: Array<[number, number, SurfaceKind]>;
}

export interface InspectionSpec {
  id?: string;
  yearBuilt?: number | null;
  accessPoints?: Array<{ id: string; kind: AccessPointKind; locationNote?: string; offsetFt?: number }>;
  runs: RunSpec[];
  checkedNotFound?: InspectionInput['checkedNotFound'];
  gradeOverride?: InspectionInput['gradeOverride'];
}

let counter = 0;

export function inspectionInput(spec: InspectionSpec): InspectionInput {
  const accessPoints = spec.accessPoints ?? [{ id: 'ap-1', kind: 'cleanout_two_way', locationNote: 'front yard' }];
  return {
    id: spec.id ?? 'inspection-1',
    property: { yearBuilt: spec.yearBuilt === undefined ? 1960 : spec.yearBuilt, type: 'single_family' },
    accessPoints: accessPoints.map((a) => ({
      id: a.id,
      kind: a.kind,
      locationNote: a.locationNote ?? '',
      offsetFromBuilding: a.offsetFt === undefined ? null : feet(a.offsetFt),
    })),
    runs: spec.runs.map((run, runIndex) => ({
      id: run.id ?? `run-${runIndex + 1}`,
      accessPointId: run.accessPointId ?? accessPoints[0]?.id ?? 'ap-1',
      direction: run.direction ?? 'toward_main',
      distanceReached: feet(run.distance),
      endReason: run.endReason ?? ((run.direction ?? 'toward_main') === 'toward_main' ? 'reached_main' : 'reached_building'),
      sections: (run.sections ?? []).map(([from, to, material, diameterIn], i) => ({
        id: `${run.id ?? `run-${runIndex + 1}`}-s${i + 1}`,
        from: feet(from),
        to: feet(to),
        material,
        diameterIn,
      })),
      observations: (run.observations ?? []).map((o) => {
        const { at, to, id, ...rest } = o;
        counter += 1;
        return {
          ...rest,
          id: id ?? `obs-${counter}`,
          at: feet(at),
          ...(to === undefined ? {} : { to: feet(to) }),
        } as ObservationInput;
      }),
      depthReadings: (run.depths ?? []).map(([at, depth, ground]) => ({
        at: feet(at),
        depth: feet(depth),
        surfaceElevation: ground === undefined ? null : feet(ground),
      })),
      surfaces: (run.surfaces ?? []).map(([from, to, surface]) => ({ from: feet(from), to: feet(to), surface })),
    })),
    checkedNotFound: spec.checkedNotFound ?? [],
    gradeOverride: spec.gradeOverride ?? null,
  };
}

/** Build and validate an invented inspection. */
export function buildInspection(spec: InspectionSpec): Inspection {
  return inspectionSchema.parse(inspectionInput(spec));
}
