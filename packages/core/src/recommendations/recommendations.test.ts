import { describe, expect, it } from 'vitest';
import { buildInspection, type InspectionSpec } from '../testing/builders.ts';
import { defectKinds } from '../model/kinds.ts';
import { collectFindings } from '../model/findings.ts';
import { gradeInspection } from '../grading/grade.ts';
import { planRepairs, groupIntoExcavations, spotPointsOf } from './repair-plan.ts';
import { findingRules, recommend, recommendationInfo, recommendationKinds, ruleFor } from './recommendations.ts';
import { feet } from '../footage/footage.ts';

const recommendationsFor = (spec: InspectionSpec) => {
  const inspection = buildInspection(spec);
  const findings = collectFindings(inspection);
  const plan = planRepairs(inspection, { findings });
  return recommend(inspection, findings, plan, gradeInspection(inspection, { findings }).level);
};

describe('per-finding rules', () => {
  it('every defect kind at every severity has exactly one first-matching rule', () => {
    for (const kind of defectKinds) {
      for (let severity = 1; severity <= 5; severity += 1) {
        expect(ruleFor(kind, severity), `${kind} ${severity}`).not.toBeNull();
      }
    }
  });

  it('rule ids are unique and every action is a known recommendation with a plain explanation', () => {
    expect(new Set(findingRules.map((r) => r.id)).size).toBe(findingRules.length);
    for (const rule of findingRules) for (const action of rule.actions) expect(recommendationKinds).toContain(action);
    for (const kind of recommendationKinds) expect(recommendationInfo[kind].explanation).toMatch(/\.$/);
  });

  it('sludge, grease and scale are cleared by hydro-jetting (CHECKS.md facts of the trade: common practice, no source)', () => {
    for (const kind of ['debris', 'grease', 'scale'] as const) expect(ruleFor(kind, 3)?.actions[0]).toBe('hydro_jetting');
  });

  it('minor offsets are monitored, not repaired (CHECKS.md facts of the trade: common practice, no source)', () => {
    expect(ruleFor('joint_offset', 2)?.actions).toEqual(['monitor']);
    expect(ruleFor('joint_offset', 3)?.actions[0]).toBe('monitor');
    expect(ruleFor('joint_offset', 4)?.actions[0]).toBe('spot_repair');
  });

  it('a sag is re-laid by digging; a liner follows the dip (common practice, no source)', () => {
    expect(ruleFor('sag', 4)?.actions).toEqual(['spot_repair', 'open_trench']);
    expect(ruleFor('sag', 4)?.actions).not.toContain('sectional_liner');
  });

  it('roots at 3 are cut and re-inspected in N years', () => {
    const result = recommendationsFor({ runs: [{ distance: 60, observations: [{ kind: 'roots', at: 20, severity: 3, id: 'r' }] }] });
    expect(result.findings).toEqual([
      expect.objectContaining({ id: 'finding:r', kind: 'root_cutting', alternatives: ['monitor'], reinspectYears: 2 }),
    ]);
    expect(result.line.map((r) => r.kind)).toEqual(['root_cutting', 'monitor']);
  });
});

describe('line recommendations', () => {
  it('few spots: spot repair, with the digs listed by footage', () => {
    const result = recommendationsFor({
      runs: [
        {
          distance: 60,
          observations: [
            { kind: 'open_crack', at: 20, severity: 4 },
            { kind: 'crack', at: 23, severity: 3 },
          ],
        },
      ],
    });
    const spot = result.line.find((r) => r.kind === 'spot_repair');
    expect(spot?.text).toMatch(/^Repair one spot: 20' 0" toward the main/);
    expect(result.line.find((r) => r.kind === 'monitor')?.text).toMatch(/after the repair/);
  });

  it('many spots: a full-length method (lining), with bursting and trench as alternatives', () => {
    const result = recommendationsFor({
      runs: [{ distance: 80, observations: [10, 30, 50].map((at) => ({ kind: 'open_crack', at, severity: 4 })) }],
    });
    const full = result.line[0];
    expect(full?.kind).toBe('full_lining');
    expect(full?.alternatives).toEqual(['pipe_bursting', 'open_trench']);
    expect(full?.text).toMatch(/3 separate spots need digging/);
  });

  it('access only through a toilet: add a cleanout', () => {
    const result = recommendationsFor({ accessPoints: [{ id: 'ap-1', kind: 'toilet_removed' }], runs: [{ distance: 60 }] });
    expect(result.line.map((r) => r.kind)).toContain('add_cleanout');
  });

  it('a clear line: monitor and re-inspect in about five years (common practice, no source)', () => {
    const result = recommendationsFor({ runs: [{ distance: 60 }] });
    expect(result.line).toEqual([expect.objectContaining({ kind: 'monitor', reinspectYears: 5 })]);
  });
});

describe('excavation grouping', () => {
  it('a long defect is dug along its whole length: 15 ft at 6 ft per dig is three digs (common practice, no source)', () => {
    const inspection = buildInspection({ runs: [{ distance: 60, observations: [{ kind: 'worn_wall', at: 10, to: 25, severity: 3 }] }] });
    const finding = collectFindings(inspection)[0]!;
    expect(spotPointsOf(finding, feet(6))).toEqual([feet(10), feet(16) + 1, feet(22) + 2, feet(25)]);
    const digs = groupIntoExcavations(
      'run-1',
      spotPointsOf(finding, feet(6)).map((at) => ({ at, finding })),
      feet(6),
    );
    expect(digs).toHaveLength(3);
  });
});
