/**
 * Invented inspections, one per grade, each with the reason its grade is right.
 * Invented properties and findings; no real job.
 */
import type { GradeLevel } from '../model/schemas.ts';
import type { InspectionSpec } from './builders.ts';

export interface Scenario {
  name: string;
  expected: GradeLevel;
  /** Why the expected grade is right, by the rules in grade.ts. */
  why: string;
  spec: InspectionSpec;
}

export const scenarios: Scenario[] = [
  {
    name: 'PVC line, 1988 house, one fine root',
    expected: 'clear',
    why: 'The only defect is roots at severity 1; Clear means no defect above severity 2 (PRODUCT.md §5).',
    spec: {
      yearBuilt: 1988,
      runs: [
        {
          direction: 'toward_main',
          distance: 64,
          sections: [[0, 64, 'pvc', 4]],
          observations: [
            { kind: 'bend', at: 20, angle: 'deg_45' },
            { kind: 'roots', at: 31.5, severity: 1 },
            { kind: 'main_connection', at: 64 },
          ],
        },
        {
          direction: 'toward_building',
          distance: 7,
          sections: [[0, 7, 'pvc', 4]],
          observations: [{ kind: 'branch', at: 3, fitting: 'wye' }],
        },
      ],
      checkedNotFound: ['crack', 'sag', 'standing_water', 'joint_offset'],
    },
  },
  {
    name: 'Clay line, 1957 house, roots at two joints',
    expected: 'maintain',
    why: 'Roots at severity 3 are a moderate service condition and no structural defect reaches 3, so cleaning is the answer: Maintain.',
    spec: {
      yearBuilt: 1957,
      runs: [
        {
          direction: 'toward_main',
          distance: 71,
          sections: [[0, 71, 'vitrified_clay', 4]],
          observations: [
            { kind: 'roots', at: 22, severity: 3, clock: 12 },
            { kind: 'roots', at: 45, severity: 3 },
            { kind: 'debris', at: 50, to: 53, severity: 2 },
            { kind: 'joint_offset', at: 60, severity: 2 },
            { kind: 'main_connection', at: 71 },
          ],
        },
      ],
      checkedNotFound: ['collapse', 'missing_piece'],
    },
  },
  {
    name: 'Cast iron line, 1962 house, one moderate crack',
    expected: 'plan_repair',
    why: 'One structural defect at severity 3 (a crack that will grow) and nothing worse: Plan repair.',
    spec: {
      yearBuilt: 1962,
      runs: [
        {
          direction: 'toward_main',
          distance: 58,
          sections: [[0, 58, 'cast_iron', 4]],
          observations: [
            { kind: 'crack', at: 18, severity: 3, clock: 6 },
            { kind: 'scale', at: 5, to: 40, severity: 2 },
            { kind: 'joint_offset', at: 40, severity: 2 },
            { kind: 'main_connection', at: 58 },
          ],
        },
      ],
    },
  },
  {
    name: 'Clay line, 1949 house, three moderate defects within five feet',
    expected: 'repair_now',
    why: 'Each defect alone is severity 3 (Plan repair), but three structural defects within 5 ft form a cluster, which counts as significant damage: Repair now.',
    spec: {
      yearBuilt: 1949,
      runs: [
        {
          direction: 'toward_main',
          distance: 66,
          sections: [[0, 66, 'vitrified_clay', 4]],
          observations: [
            { kind: 'crack', at: 30, severity: 3 },
            { kind: 'open_crack', at: 32, severity: 3 },
            { kind: 'joint_gap', at: 34.5, severity: 3 },
            { kind: 'roots', at: 34.5, severity: 2 },
            { kind: 'main_connection', at: 66 },
          ],
        },
      ],
    },
  },
  {
    name: 'Clay and cast iron line, 1938 house, collapsed under the driveway',
    expected: 'failing',
    why: 'A collapsed section at severity 5 stopped the camera: the pipe has failed there, which is Failing whatever else is found.',
    spec: {
      yearBuilt: 1938,
      runs: [
        {
          direction: 'toward_main',
          distance: 48,
          endReason: 'camera_blocked',
          sections: [
            [0, 12, 'cast_iron', 4],
            [12, 48, 'vitrified_clay', 4],
          ],
          observations: [
            { kind: 'material_change', at: 12, fromMaterial: 'cast_iron', toMaterial: 'vitrified_clay' },
            { kind: 'joint_offset', at: 24, severity: 3 },
            { kind: 'collapse', at: 47, to: 48, severity: 5 },
            { kind: 'run_end', at: 48, reason: 'camera_blocked' },
          ],
          depths: [
            [0, 3],
            [24, 4.5],
            [48, 6.5],
          ],
          surfaces: [[40, 48, 'concrete']],
        },
      ],
    },
  },
];
