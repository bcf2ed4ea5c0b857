import { describe, expect, it } from 'vitest';
import { buildInspection, type InspectionSpec } from '../testing/builders.ts';
import { analyseSlope } from '../slope/slope.ts';
import { findSizeReductions, runChecks } from './checks.ts';
import { cfsToGpm, drainageFixtureUnits, manningFullPipe, maxFixtureUnits, MANNING_K_US } from './hydraulics.ts';
import { earlyFailureMaterials, materialFacts } from './materials.ts';

const kindsOf = (spec: InspectionSpec, year = 2025) => runChecks(buildInspection(spec), { currentYear: year }).map((c) => c.kind);

describe("Manning's equation (CHECKS.md worked examples)", () => {
  it('k = 1.486 in US units', () => {
    expect(MANNING_K_US).toBe(1.486);
  });

  it('D = 0.5 ft, S = 0.05, n = 0.02 gives Q ≈ 0.82 cfs (engineering exam practice problem, engineeringprep)', () => {
    const result = manningFullPipe({ diameter: 0.5, slope: 0.05, n: 0.02 });
    expect(result.hydraulicRadius).toBe(0.125); // full pipe R = D/4
    expect(result.flow).toBeCloseTo(0.82, 2);
  });

  it('D = 8 in, n = 0.013, S = 0.005, k = 1.49 gives Q ≈ 0.854 cfs and V ≈ 2.45 ft/s within ±0.5 % (civil engineering calculator worked example)', () => {
    const result = manningFullPipe({ diameter: 8 / 12, slope: 0.005, n: 0.013, k: 1.49 });
    expect(Math.abs(result.flow - 0.854) / 0.854).toBeLessThanOrEqual(0.005);
    expect(Math.abs(result.velocity - 2.45) / 2.45).toBeLessThanOrEqual(0.005);
  });

  it('1 ft³/s is 448.8 US gal/min (1 gal = 231 in³, NIST SP 811, from memory)', () => {
    expect(cfsToGpm(1)).toBeCloseTo(448.83, 2);
  });

  it('roughness values sit inside the CHECKS.md ranges (Engineering Toolbox; FHWA)', () => {
    expect(materialFacts.cast_iron.manningN).toBeGreaterThanOrEqual(0.012);
    expect(materialFacts.cast_iron.manningN).toBeLessThanOrEqual(0.013);
    expect(materialFacts.pvc.manningN).toBeGreaterThanOrEqual(0.009);
    expect(materialFacts.pvc.manningN).toBeLessThanOrEqual(0.011);
    expect(materialFacts.vitrified_clay.manningN).toBeGreaterThanOrEqual(0.013);
    expect(materialFacts.vitrified_clay.manningN).toBeLessThanOrEqual(0.015);
    expect(materialFacts.concrete.manningN).toBe(0.013);
    expect(materialFacts.asbestos_cement.manningN).toBe(0.011);
  });
});

describe('drainage fixture units (IPC Table 710.1(1))', () => {
  it('matches the table values, with read/memory flags as in CHECKS.md', () => {
    expect(drainageFixtureUnits[3]['1/8']).toEqual({ value: 36, flag: 'read' });
    expect(drainageFixtureUnits[3]['1/4']).toEqual({ value: 42, flag: 'read' });
    expect(drainageFixtureUnits[3]['1/2']).toEqual({ value: 50, flag: 'read' });
    expect(drainageFixtureUnits[4]['1/8']).toEqual({ value: 180, flag: 'memory' });
    expect(drainageFixtureUnits[4]['1/4']).toEqual({ value: 216, flag: 'read' });
    expect(drainageFixtureUnits[4]['1/2']).toEqual({ value: 250, flag: 'read' });
    expect(drainageFixtureUnits[6]['1/8']).toEqual({ value: 700, flag: 'memory' });
    expect(drainageFixtureUnits[6]['1/4']).toEqual({ value: 840, flag: 'read' });
    expect(drainageFixtureUnits[6]['1/2']).toEqual({ value: 1000, flag: 'read' });
  });
  it('takes the steepest tabulated slope not above the measured one', () => {
    expect(maxFixtureUnits(3, 0.3)?.value).toBe(42);
    expect(maxFixtureUnits(4, 0.125)?.value).toBe(180);
    expect(maxFixtureUnits(4, 0.1)).toBeNull();
    expect(maxFixtureUnits(5, 0.25)).toBeNull();
  });
});

describe('size reduced in the direction of flow (IPC 704.2)', () => {
  it('a run toward the main going from 4 in to 3 in is a reduction', () => {
    const inspection = buildInspection({
      runs: [
        {
          distance: 60,
          sections: [
            [0, 30, 'cast_iron', 4],
            [30, 60, 'cast_iron', 3],
          ],
        },
      ],
    });
    expect(findSizeReductions(inspection.runs[0]!)).toEqual([expect.objectContaining({ from: 4, to: 3 })]);
    const check = runChecks(inspection, { currentYear: 2025 }).find((c) => c.kind === 'size_reduced');
    expect(check?.source).toMatch(/IPC 704.2/);
    expect(check?.text).toMatch(/from 4 in to 3 in/);
  });

  it('the same sizes on a run toward the building are an increase in the direction of flow, not a reduction', () => {
    const inspection = buildInspection({
      runs: [
        {
          direction: 'toward_building',
          distance: 60,
          sections: [
            [0, 30, 'cast_iron', 4],
            [30, 60, 'cast_iron', 3],
          ],
        },
      ],
    });
    expect(findSizeReductions(inspection.runs[0]!)).toEqual([]);
  });

  it('a recorded 4-to-3 bushing on a run toward the building reduces against the flow only when sizes grow with footage', () => {
    const reduction = buildInspection({
      runs: [
        {
          direction: 'toward_building',
          distance: 20,
          observations: [{ kind: 'size_change', at: 8, fromSize: 3, toSize: 4, fitting: 'bushing' }],
        },
      ],
    });
    // water comes from the 4 in side (far) into the 3 in side (near the access point): a reduction
    expect(findSizeReductions(reduction.runs[0]!)).toHaveLength(1);
  });

  it('a 4×3 closet bend is not a reduction (IPC 704.2)', () => {
    const inspection = buildInspection({
      runs: [
        {
          distance: 60,
          sections: [
            [0, 3, 'cast_iron', 4],
            [3, 60, 'cast_iron', 3],
          ],
          observations: [{ kind: 'size_change', at: 3, fromSize: 4, toSize: 3, fitting: 'closet_bend' }],
        },
      ],
    });
    expect(findSizeReductions(inspection.runs[0]!)).toEqual([]);
  });

  it('a smaller pipe toward the main than toward the building at one cleanout is a reduction across the access point', () => {
    expect(
      kindsOf({
        runs: [
          { direction: 'toward_building', distance: 10, sections: [[0, 10, 'cast_iron', 4]] },
          { direction: 'toward_main', distance: 50, sections: [[0, 50, 'cast_iron', 3]] },
        ],
      }),
    ).toContain('size_reduced');
  });
});

describe('material checks (CHECKS.md material eras; sanity bands)', () => {
  it('bituminous fiber is known for early failure', () => {
    expect(earlyFailureMaterials).toContain('bituminous_fiber');
    expect(kindsOf({ yearBuilt: 1955, runs: [{ distance: 50, sections: [[0, 50, 'bituminous_fiber', 4]] }] })).toContain(
      'early_failure_material',
    );
  });

  it('PVC in a 1950 house is newer than the house: a clue of an earlier repair (PVC from the 1970s)', () => {
    expect(kindsOf({ yearBuilt: 1950, runs: [{ distance: 50, sections: [[0, 50, 'pvc', 4]] }] })).toContain('material_newer_than_house');
  });

  it('bituminous fiber in a 1995 house is older than the house era (late 1940s to early 1970s)', () => {
    expect(kindsOf({ yearBuilt: 1995, runs: [{ distance: 50, sections: [[0, 50, 'bituminous_fiber', 4]] }] })).toContain(
      'material_older_than_house',
    );
  });

  it('PVC in a 1990 house fits its era and is not near the end of its life', () => {
    const kinds = kindsOf({ yearBuilt: 1990, runs: [{ distance: 50, sections: [[0, 50, 'pvc', 4]] }] });
    expect(kinds.filter((k) => k.startsWith('material'))).toEqual([]);
  });

  it('cast iron in a 1960 house is at or past the start of its 50–100 year life by 2025', () => {
    expect(kindsOf({ yearBuilt: 1960, runs: [{ distance: 50, sections: [[0, 50, 'cast_iron', 4]] }] }, 2025)).toContain('material_age');
  });

  it('asbestos-cement pipe gets a handling note', () => {
    expect(kindsOf({ yearBuilt: 1960, runs: [{ distance: 50, sections: [[0, 50, 'asbestos_cement', 6]] }] })).toContain(
      'hazardous_material',
    );
  });
});

describe('coverage and other checks', () => {
  it('a run that ends before the main, and an inspection where no run reached the main', () => {
    const kinds = kindsOf({ yearBuilt: null, runs: [{ distance: 30, endReason: 'obstruction' }] });
    expect(kinds).toContain('run_ended_early');
    expect(kinds).toContain('main_not_reached');
  });

  it('a run toward the building that stops short is reported too', () => {
    const kinds = kindsOf({ yearBuilt: null, runs: [{ distance: 60 }, { direction: 'toward_building', distance: 4, endReason: 'water' }] });
    expect(kinds).toEqual(['run_ended_early']);
  });

  it('access only through a toilet or roof vent: suggest an outdoor cleanout', () => {
    expect(kindsOf({ yearBuilt: null, accessPoints: [{ id: 'ap-1', kind: 'toilet_removed' }], runs: [{ distance: 60 }] })).toContain(
      'no_outdoor_cleanout',
    );
  });

  it('a condition listed as checked and not found but recorded is flagged', () => {
    const checks = runChecks(
      buildInspection({
        yearBuilt: null,
        runs: [{ distance: 60, observations: [{ kind: 'roots', at: 10, severity: 2, id: 'r1' }] }],
        checkedNotFound: ['roots'],
      }),
    );
    expect(checks.find((c) => c.kind === 'checked_but_found')?.observationIds).toEqual(['r1']);
  });

  it('a 3 in line gets a capacity note with its fixture-unit rating (Manning; IPC Table 710.1(1))', () => {
    const inspection = buildInspection({
      yearBuilt: null,
      runs: [
        {
          distance: 40,
          sections: [[0, 40, 'abs', 3]],
          depths: [
            [0, 2],
            [40, 2 + 10 / 12],
          ],
        },
      ],
    });
    const note = runChecks(inspection, { slope: analyseSlope(inspection) }).find((c) => c.kind === 'capacity');
    // 10 in over 40 ft = 0.25 in per ft → 42 fixture units for 3 in (IPC Table 710.1(1), read)
    expect(note?.text).toMatch(/up to 42 drainage fixture units/);
    expect(note?.source).toMatch(/Manning's equation, k = 1.486, n = 0.01/);
  });

  it('a healthy 4 in line gets no capacity note', () => {
    expect(kindsOf({ yearBuilt: null, runs: [{ distance: 40, sections: [[0, 40, 'pvc', 4]] }] })).not.toContain('capacity');
  });
});
