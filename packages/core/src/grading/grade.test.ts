import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { buildInspection, type ObservationSpec } from '../testing/builders.ts';
import { scenarios } from '../testing/scenarios.ts';
import { defectKinds, serviceKinds, structuralKinds } from '../model/kinds.ts';
import { findClusters, gradeInfo, gradeInspection, gradeRank, gradeRules } from './grade.ts';
import { collectFindings } from '../model/findings.ts';
import { feet } from '../footage/footage.ts';

const oneRun = (
  observations: ObservationSpec[],
  extra: { sections?: Array<[number, number, 'pvc' | 'bituminous_fiber' | 'vitrified_clay', number]> } = {},
) => buildInspection({ runs: [{ distance: 80, sections: extra.sections ?? [[0, 80, 'vitrified_clay', 4]], observations }] });

describe('the five grades (PRODUCT.md §5)', () => {
  it('has five levels from best to worst with our own names', () => {
    expect(Object.values(gradeInfo).map((g) => g.name)).toEqual(['Clear', 'Maintain', 'Plan repair', 'Repair now', 'Failing']);
    expect(Object.values(gradeInfo).map((g) => g.rank)).toEqual([1, 2, 3, 4, 5]);
  });

  for (const scenario of scenarios) {
    it(`scenario "${scenario.name}" grades ${gradeInfo[scenario.expected].name}: ${scenario.why}`, () => {
      const result = gradeInspection(buildInspection(scenario.spec));
      expect(result.level).toBe(scenario.expected);
      expect(result.drivers.length).toBeGreaterThan(0);
      for (const driver of result.drivers) {
        expect(driver.level).toBe(scenario.expected);
        expect(driver.text).toMatch(/\.$/);
      }
    });
  }

  it('the scenarios cover all five grades', () => {
    expect(new Set(scenarios.map((s) => s.expected))).toEqual(new Set(Object.keys(gradeInfo)));
  });
});

describe('rules', () => {
  it('nothing recorded is Clear, with a driver that says so', () => {
    const result = gradeInspection(oneRun([]));
    expect(result.level).toBe('clear');
    expect(result.drivers[0]?.text).toBe('No defect above severity 2 was found.');
  });

  it('the grade comes with the findings that drove it, in words', () => {
    const result = gradeInspection(oneRun([{ kind: 'open_crack', at: 23 + 4 / 12, severity: 4, id: 'oc' }]));
    expect(result.level).toBe('repair_now');
    expect(result.drivers).toEqual([
      {
        ruleId: 'serious_structural',
        level: 'repair_now',
        text: `Open crack, severity 4, at 23' 4" toward the main from the two-way cleanout (front yard).`,
        observationIds: ['oc'],
      },
    ]);
  });

  it('service conditions up to moderate stay Maintain; heavy ones mean Plan repair; severity 5 (blocked) is Failing', () => {
    expect(gradeInspection(oneRun([{ kind: 'grease', at: 10, severity: 3 }])).level).toBe('maintain');
    expect(gradeInspection(oneRun([{ kind: 'roots', at: 10, severity: 4 }])).level).toBe('plan_repair');
    expect(gradeInspection(oneRun([{ kind: 'blockage', at: 10, severity: 5 }])).level).toBe('failing');
  });

  it('three moderate defects close together count more than the same three spread out', () => {
    const close = oneRun([
      { kind: 'crack', at: 10, severity: 3 },
      { kind: 'crack', at: 12, severity: 3 },
      { kind: 'joint_gap', at: 15, severity: 3 },
    ]);
    const spread = oneRun([
      { kind: 'crack', at: 10, severity: 3 },
      { kind: 'crack', at: 30, severity: 3 },
      { kind: 'joint_gap', at: 50, severity: 3 },
    ]);
    expect(gradeInspection(close).level).toBe('repair_now');
    expect(gradeInspection(close).drivers[0]?.ruleId).toBe('cluster_of_moderate');
    expect(gradeInspection(spread).level).toBe('plan_repair');
  });

  it('many moderate defects, or one long one, are widespread damage: Repair now', () => {
    const many = oneRun([10, 20, 30, 40, 50].map((at) => ({ kind: 'crack', at, severity: 3 })));
    expect(gradeInspection(many).drivers.map((d) => d.ruleId)).toContain('many_moderate');
    expect(gradeInspection(many).level).toBe('repair_now');
    const long = oneRun([{ kind: 'worn_wall', at: 10, to: 25, severity: 3 }]);
    expect(gradeInspection(long).level).toBe('repair_now');
    expect(gradeInspection(long).drivers[0]?.text).toMatch(/damage along 15' 0" of pipe/);
  });

  it('three serious defects close together are Failing', () => {
    const result = gradeInspection(
      oneRun([
        { kind: 'open_crack', at: 40, severity: 4 },
        { kind: 'missing_piece', at: 41, severity: 4 },
        { kind: 'out_of_round', at: 43, severity: 4 },
      ]),
    );
    expect(result.level).toBe('failing');
    expect(result.drivers[0]?.ruleId).toBe('cluster_of_serious');
  });

  it('clusters are counted per run: the same footage on two runs is two places', () => {
    const inspection = buildInspection({
      runs: [
        {
          direction: 'toward_main',
          distance: 40,
          observations: [
            { kind: 'crack', at: 10, severity: 3 },
            { kind: 'crack', at: 11, severity: 3 },
          ],
        },
        { direction: 'toward_building', distance: 20, observations: [{ kind: 'crack', at: 10, severity: 3 }] },
      ],
    });
    expect(gradeInspection(inspection).level).toBe('plan_repair');
    expect(findClusters(collectFindings(inspection), feet(5), 3)).toHaveLength(0);
  });

  it('bituminous fiber pipe means Plan repair even without visible defects (CHECKS.md: known for early failure)', () => {
    const result = gradeInspection(oneRun([], { sections: [[0, 80, 'bituminous_fiber', 4]] }));
    expect(result.level).toBe('plan_repair');
    expect(result.drivers[0]?.ruleId).toBe('early_failure_material');
  });

  it('an inspector override replaces the grade shown but keeps the computed grade and its drivers', () => {
    const spec = scenarios.find((s) => s.expected === 'maintain')!.spec;
    const result = gradeInspection(
      buildInspection({ ...spec, gradeOverride: { level: 'clear', reason: 'Roots were cut during the visit; re-run clean.' } }),
    );
    expect(result.level).toBe('clear');
    expect(result.name).toBe('Clear');
    expect(result.computedLevel).toBe('maintain');
    expect(result.override?.reason).toMatch(/Roots were cut/);
    expect(result.drivers.length).toBeGreaterThan(0);
  });

  it('every rule is described in words', () => {
    for (const rule of gradeRules) expect(rule.description.length).toBeGreaterThan(20);
  });
});

describe('properties (fast-check)', () => {
  const observation = fc.record({
    kind: fc.constantFrom(...defectKinds),
    at: fc.integer({ min: 0, max: 70 }),
    severity: fc.integer({ min: 1, max: 5 }),
  });

  it('adding a defect never improves the grade', () => {
    fc.assert(
      fc.property(fc.array(observation, { maxLength: 12 }), observation, (list, extra) => {
        const before = gradeInspection(oneRun(list)).level;
        const after = gradeInspection(oneRun([...list, extra])).level;
        expect(gradeRank(after)).toBeGreaterThanOrEqual(gradeRank(before));
      }),
    );
  });

  it('Clear exactly when no defect is above severity 2 (and no early-failure pipe)', () => {
    fc.assert(
      fc.property(fc.array(observation, { maxLength: 12 }), (list) => {
        const level = gradeInspection(oneRun(list)).level;
        expect(level === 'clear').toBe(list.every((o) => o.severity <= 2));
      }),
    );
  });

  it('service conditions alone never grade worse than Plan repair unless one is at 5', () => {
    const service = fc.record({
      kind: fc.constantFrom(...serviceKinds),
      at: fc.integer({ min: 0, max: 70 }),
      severity: fc.integer({ min: 1, max: 4 }),
    });
    fc.assert(
      fc.property(fc.array(service, { maxLength: 12 }), (list) => {
        expect(gradeRank(gradeInspection(oneRun(list)).level)).toBeLessThanOrEqual(3);
      }),
    );
    expect(structuralKinds.length + serviceKinds.length).toBe(defectKinds.length);
  });
});
