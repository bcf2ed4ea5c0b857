import { describe, expect, it } from 'vitest';
import { feet } from '../footage/footage.ts';
import { inspectionInput } from '../testing/builders.ts';
import { bendAngles, bendInfo, defectKinds, kindInfo, observationKinds, structuralKinds } from './kinds.ts';
import { footageTextSchema, inspectionSchema, observationSchema, runSchema, gradeOverrideSchema } from './schemas.ts';
import { severityGuides, suggestSeverity } from './severity-guide.ts';

const baseRun = {
  id: 'run-1',
  accessPointId: 'ap-1',
  direction: 'toward_main',
  distanceReached: feet(60),
  endReason: 'reached_main',
} as const;

const messages = (result: { success: boolean; error?: { issues: Array<{ message: string }> } }) =>
  result.success ? [] : (result.error?.issues.map((i) => i.message) ?? []);

describe('observation schema', () => {
  it('accepts a defect with severity, clock and extent, and fills defaults', () => {
    const obs = observationSchema.parse({ id: 'o1', kind: 'roots', at: feet(22), severity: 3, clock: 12, to: feet(24) });
    expect(obs).toMatchObject({ kind: 'roots', severity: 3, clock: 12, note: '', videoTime: null, stillIds: [] });
  });

  it('requires a severity 1–5 for defects', () => {
    expect(observationSchema.safeParse({ id: 'o1', kind: 'crack', at: 0 }).success).toBe(false);
    expect(messages(observationSchema.safeParse({ id: 'o1', kind: 'crack', at: 0, severity: 6 }))).toContain(
      'Choose a severity from 1 to 5.',
    );
    expect(observationSchema.safeParse({ id: 'o1', kind: 'crack', at: 0, severity: 2.5 }).success).toBe(false);
  });

  it('features carry their own attributes and no severity', () => {
    const bend = observationSchema.parse({ id: 'b', kind: 'bend', at: feet(20), angle: 'deg_45', severity: 4 });
    expect(bend).not.toHaveProperty('severity');
    expect(observationSchema.safeParse({ id: 'b', kind: 'bend', at: 0 }).success).toBe(false);
    expect(observationSchema.parse({ id: 's', kind: 'size_change', at: 0, fromSize: 4, toSize: 3 })).toMatchObject({
      fitting: 'unknown',
    });
    expect(observationSchema.parse({ id: 'e', kind: 'run_end', at: 0, reason: 'water' })).toMatchObject({ reason: 'water' });
  });

  it('rejects an unknown kind with a readable message', () => {
    expect(messages(observationSchema.safeParse({ id: 'x', kind: 'gremlin', at: 0 }))[0]).toMatch(/./);
  });

  it('rejects an extent that ends before it starts, and a clock position outside 1–12', () => {
    expect(messages(observationSchema.safeParse({ id: 'o', kind: 'crack', at: feet(10), to: feet(5), severity: 2 }))).toContain(
      'The end of the defect must be at or after its start.',
    );
    expect(observationSchema.safeParse({ id: 'o', kind: 'crack', at: 0, severity: 2, clock: 13 }).success).toBe(false);
  });

  it('a measured severity that differs from the guide needs a reason (the guide is a default the inspector can override)', () => {
    // roots over 35 % and up to 75 % of the opening: the guide suggests 4 (common practice, no source)
    expect(suggestSeverity('roots', 50)).toBe(4);
    const without = observationSchema.safeParse({ id: 'o', kind: 'roots', at: 0, severity: 2, measurePercent: 50 });
    expect(messages(without)[0]).toMatch(/guide suggests severity 4 for 50%/);
    const withReason = observationSchema.safeParse({
      id: 'o',
      kind: 'roots',
      at: 0,
      severity: 2,
      measurePercent: 50,
      severityReason: 'Fine hair roots, easily pushed aside by flow.',
    });
    expect(withReason.success).toBe(true);
    expect(observationSchema.safeParse({ id: 'o', kind: 'roots', at: 0, severity: 4, measurePercent: 50 }).success).toBe(true);
    expect(messages(observationSchema.safeParse({ id: 'o', kind: 'crack', at: 0, severity: 2, measurePercent: 10 }))[0]).toMatch(
      /no measure/,
    );
  });
});

describe('run schema', () => {
  it('rejects overlapping sections and things past the distance reached', () => {
    const result = runSchema.safeParse({
      ...baseRun,
      sections: [
        { id: 's1', from: 0, to: feet(30), material: 'cast_iron', diameterIn: 4 },
        { id: 's2', from: feet(25), to: feet(70), material: 'pvc', diameterIn: 4 },
      ],
      observations: [{ id: 'o1', kind: 'crack', at: feet(65), severity: 2 }],
    });
    const list = messages(result);
    expect(list).toContain(`Pipe sections overlap at 25' 0".`);
    expect(list.some((m) => m.startsWith(`This section ends at 70' 0"`))).toBe(true);
    expect(list.some((m) => m.startsWith(`This observation is at 65' 0"`))).toBe(true);
  });

  it('rejects a section that ends where it starts, and a pipe size not in quarter inches', () => {
    expect(
      runSchema.safeParse({ ...baseRun, sections: [{ id: 's', from: feet(5), to: feet(5), material: 'pvc', diameterIn: 4 }] }).success,
    ).toBe(false);
    expect(
      runSchema.safeParse({ ...baseRun, sections: [{ id: 's', from: 0, to: feet(5), material: 'pvc', diameterIn: 4.1 }] }).success,
    ).toBe(false);
  });

  it('rejects two depth readings at one footage', () => {
    const result = runSchema.safeParse({
      ...baseRun,
      depthReadings: [
        { at: feet(10), depth: feet(4) },
        { at: feet(10), depth: feet(5) },
      ],
    });
    expect(messages(result)).toContain(`Two depth readings at 10' 0".`);
  });
});

describe('inspection schema', () => {
  it('parses a whole invented inspection', () => {
    const inspection = inspectionSchema.parse(
      inspectionInput({
        runs: [{ distance: 60, sections: [[0, 60, 'pvc', 4]], observations: [{ kind: 'roots', at: 10, severity: 2 }] }],
        checkedNotFound: ['crack'],
      }),
    );
    expect(inspection.runs[0]?.observations).toHaveLength(1);
    expect(inspection.gradeOverride).toBeNull();
  });

  it('rejects a run from an unknown access point, duplicate observation ids and a condition listed twice', () => {
    const input = inspectionInput({
      runs: [
        {
          distance: 60,
          accessPointId: 'nowhere',
          observations: [
            { kind: 'roots', at: 1, severity: 2, id: 'dup' },
            { kind: 'crack', at: 2, severity: 2, id: 'dup' },
          ],
        },
      ],
      checkedNotFound: ['crack', 'crack'],
    });
    const list = messages(inspectionSchema.safeParse(input));
    expect(list).toContain('This run starts from an access point that is not in the inspection.');
    expect(list).toContain('Two observations share one id.');
    expect(list).toContain('A condition is listed twice.');
  });

  it('a grade override needs a reason', () => {
    expect(messages(gradeOverrideSchema.safeParse({ level: 'clear', reason: 'ok' }))).toContain(
      'Say why you changed the grade (at least 10 characters).',
    );
    expect(gradeOverrideSchema.safeParse({ level: 'clear', reason: 'Roots were cut on site during the visit.' }).success).toBe(true);
  });

  it('footage typed by a person parses through the schema with the same error text', () => {
    expect(footageTextSchema.parse(`52' 7"`)).toBe(52 * 3048 + 7 * 254);
    expect(messages(footageTextSchema.safeParse(`5' 14"`))[0]).toMatch(/less than 12/);
  });
});

describe('kinds and guides', () => {
  it('every kind has our own plain name, a phrase and an explanation', () => {
    for (const kind of observationKinds) {
      const info = kindInfo[kind];
      expect(info.name.length).toBeGreaterThan(2);
      expect(info.phrase.length).toBeGreaterThan(2);
      expect(info.explanation.endsWith('.')).toBe(true);
      // identifiers are our own snake_case words, not short codes
      expect(kind).toMatch(/^[a-z]+(_[a-z]+)*$/);
      expect(kind.length).toBeGreaterThanOrEqual(3);
    }
    expect(structuralKinds).toContain('joint_offset');
  });

  it('every defect kind has a five-level severity guide; measures rise with severity', () => {
    for (const kind of defectKinds) {
      const guide = severityGuides[kind];
      expect(guide.levels).toHaveLength(5);
      if (guide.measure) {
        const bounds = guide.measure.upperBounds;
        for (let i = 1; i < bounds.length; i += 1) expect(bounds[i]).toBeGreaterThan(bounds[i - 1] as number);
        expect(suggestSeverity(kind, 0)).toBe(1);
        expect(suggestSeverity(kind, 100)).toBe(5);
      } else {
        expect(suggestSeverity(kind, 50)).toBeNull();
      }
    }
  });

  it('bend angle = fraction of a full turn × 360° (trade fitting tables; IRC 2012 Table P3005.1 names the sixth bend; ASTM A74 fifth bend, from memory)', () => {
    const expected: Record<string, number> = {
      deg_11_25: 11.25,
      deg_22_5: 22.5,
      deg_45: 45,
      deg_60: 60,
      deg_72: 72,
      deg_90: 90,
      long_sweep: 90,
    };
    for (const angle of bendAngles) {
      const [n, d] = bendInfo[angle].fraction;
      expect((n / d) * 360).toBe(expected[angle]);
      expect(bendInfo[angle].degrees).toBe(expected[angle]);
    }
    expect(bendInfo.deg_90.fitting).toBe('1/4 bend');
    expect(bendInfo.deg_60.fitting).toBe('1/6 bend');
    expect(bendInfo.deg_11_25.fitting).toBe('1/32 bend');
  });
});
