import { describe, expect, it } from 'vitest';
import { feet, inches } from '../footage/footage.ts';
import { buildInspection } from '../testing/builders.ts';
import { analyseSlope, fallOver, inchesPerFootToPercent, minimumSlope, upcSlopeNote } from './slope.ts';

describe('minimum slope by pipe size (IPC Table 704.1)', () => {
  const table: Array<[number, string]> = [
    [1.5, '1/4'],
    [2, '1/4'],
    [2.5, '1/4'], // "2-1/2 in or less: 1/4 in per ft" — IPC Table 704.1
    [3, '1/8'], // "3 in to 6 in: 1/8 in per ft" — IPC Table 704.1
    [4, '1/8'],
    [6, '1/8'],
    [8, '1/16'], // "8 in or larger: 1/16 in per ft" — IPC Table 704.1
    [10, '1/16'],
    [12, '1/16'],
  ];
  for (const [size, fraction] of table) {
    it(`${size} in pipe: ${fraction} in per ft (IPC Table 704.1)`, () => {
      expect(minimumSlope(size).fraction).toBe(fraction);
      expect(minimumSlope(size).source).toBe('IPC Table 704.1');
    });
  }

  it('names the Uniform Plumbing Code difference (UPC §708: 1/4 in per ft for all sizes unless approved; editions differ)', () => {
    expect(upcSlopeNote).toMatch(/Uniform Plumbing Code \(section 708\)/);
    expect(upcSlopeNote).toMatch(/1\/4 inch per foot for every size/);
    expect(upcSlopeNote).toMatch(/editions differ/);
  });
});

describe('slope arithmetic (CHECKS.md units: arithmetic from NIST SP 811 definitions)', () => {
  it('1/4 in per ft = 2.083 %, 1/8 = 1.042 %, 1/16 = 0.521 %', () => {
    expect(inchesPerFootToPercent(1 / 4)).toBeCloseTo(2.083, 3);
    expect(inchesPerFootToPercent(1 / 8)).toBeCloseTo(1.042, 3);
    expect(inchesPerFootToPercent(1 / 16)).toBeCloseTo(0.521, 3);
    expect(minimumSlope(4).percent).toBeCloseTo(1.042, 3);
  });

  it('10 ft at 1/4 in per ft falls 2.5 in; 100 ft of 4 in pipe at 1/8 in per ft falls 12.5 in (worked examples in code commentary)', () => {
    expect(fallOver(feet(10), 1 / 4)).toBe(inches(2.5));
    expect(fallOver(feet(100), 1 / 8)).toBe(inches(12.5));
  });

  it('readings 100 ft apart that deepen by 12.5 in give exactly 1/8 in per ft, which meets the 4 in minimum', () => {
    const inspection = buildInspection({
      runs: [
        {
          distance: 100,
          sections: [[0, 100, 'pvc', 4]],
          depths: [
            [0, 2],
            [100, 2 + 12.5 / 12],
          ],
        },
      ],
    });
    const segment = analyseSlope(inspection).runs[0]?.segments[0];
    expect(segment?.inchesPerFoot).toBeCloseTo(0.125, 9);
    expect(segment?.percent).toBeCloseTo(1.042, 3);
    expect(segment?.status).toBe('meets_minimum');
  });
});

describe('back-fall, flat spots and sags from depth readings', () => {
  it('on a run toward the main, a pipe that gets shallower runs backward (back-fall)', () => {
    const inspection = buildInspection({
      runs: [
        {
          distance: 60,
          sections: [[0, 60, 'pvc', 4]],
          depths: [
            [0, 4],
            [30, 5],
            [60, 4.5],
          ],
        },
      ],
    });
    const run = analyseSlope(inspection).runs[0];
    expect(run?.segments.map((s) => s.status)).toEqual(['meets_minimum', 'back_fall']);
    expect(run?.sags).toHaveLength(1);
    expect(run?.sags[0]?.at).toBe(feet(30));
    expect(run?.sags[0]?.dip).toBe(feet(0.5));
    expect(run?.notes.join(' ')).toMatch(/back-fall/);
  });

  it('on a run toward the building, water flows toward lower footage, so the pipe should get shallower as footage grows', () => {
    const inspection = buildInspection({
      runs: [
        {
          direction: 'toward_building',
          distance: 40,
          sections: [[0, 40, 'pvc', 4]],
          depths: [
            [0, 5],
            [40, 3],
          ],
        },
      ],
    });
    const segment = analyseSlope(inspection).runs[0]?.segments[0];
    expect(segment?.inchesPerFoot).toBeCloseTo(24 / 40, 9);
    expect(segment?.status).toBe('meets_minimum');
  });

  it('a fall below the minimum for the size is flagged with the code reference', () => {
    // 3 in pipe (minimum 1/8 in per ft, IPC Table 704.1) falling 2 in over 40 ft = 0.05 in per ft
    const inspection = buildInspection({
      runs: [
        {
          distance: 40,
          sections: [[0, 40, 'abs', 3]],
          depths: [
            [0, 2],
            [40, 2 + 2 / 12],
          ],
        },
      ],
    });
    const run = analyseSlope(inspection).runs[0];
    expect(run?.segments[0]?.status).toBe('below_minimum');
    expect(run?.notes[0]).toMatch(/below the 1\/8 in per ft minimum for 3 in pipe \(IPC Table 704.1\)/);
  });

  it('uses ground heights when every reading has one, instead of taking the ground as level', () => {
    // the ground drops 2 ft over 40 ft while the pipe stays 4 ft deep: the pipe falls 2 ft = 0.6 in per ft
    const inspection = buildInspection({
      runs: [
        {
          distance: 40,
          sections: [[0, 40, 'pvc', 4]],
          depths: [
            [0, 4, 10],
            [40, 4, 8],
          ],
        },
      ],
    });
    const run = analyseSlope(inspection).runs[0];
    expect(run?.levelGroundAssumed).toBe(false);
    expect(run?.segments[0]?.inchesPerFoot).toBeCloseTo(0.6, 9);
  });

  it('says how uncertain the result is: locator readings ≈ a tenth of the depth (common practice, no source)', () => {
    const inspection = buildInspection({
      runs: [
        {
          distance: 20,
          sections: [[0, 20, 'pvc', 4]],
          depths: [
            [0, 4],
            [20, 4.25],
          ],
        },
      ],
    });
    const result = analyseSlope(inspection);
    const segment = result.runs[0]?.segments[0];
    // (48 in + 51 in) × 0.1 over 20 ft = 0.495 in per ft either way
    expect(segment?.uncertaintyInchesPerFoot).toBeCloseTo(0.495, 6);
    expect(segment?.certain).toBe(false);
    expect(result.caveat).toMatch(/about a tenth of the depth/);
  });

  it('runs with fewer than two readings have no slope result', () => {
    const inspection = buildInspection({ runs: [{ distance: 20, depths: [[0, 4]] }] });
    expect(analyseSlope(inspection).runs).toEqual([]);
  });
});
