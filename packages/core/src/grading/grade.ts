import { feet, formatFootage, type Footage, type UnitSystem } from '../footage/footage.ts';
import { collectFindings, describeFinding, runLabel, type Finding } from '../model/findings.ts';
import { kindInfo, materialNames } from '../model/kinds.ts';
import type { GradeLevel, GradeOverride, Inspection } from '../model/schemas.ts';
import { earlyFailureMaterials } from '../checks/materials.ts';

export interface GradeInfo {
  name: string;
  /** 1 (best) … 5 (worst). */
  rank: 1 | 2 | 3 | 4 | 5;
  /** What the grade means, for the report. */
  meaning: string;
  /** What to do, in a few words. */
  action: string;
}

/** Underfoot's five grades (PRODUCT.md §5), best to worst. */
export const gradeInfo: Record<GradeLevel, GradeInfo> = {
  clear: {
    name: 'Clear',
    rank: 1,
    meaning: 'No defect above severity 2. The line works as it should.',
    action: 'No work needed now.',
  },
  maintain: {
    name: 'Maintain',
    rank: 2,
    meaning: 'Roots or build-up up to a moderate level; the pipe itself is sound.',
    action: 'Clean it, or keep an eye on it.',
  },
  plan_repair: {
    name: 'Plan repair',
    rank: 3,
    meaning: 'Defects that will grow over time.',
    action: 'Budget for a repair.',
  },
  repair_now: {
    name: 'Repair now',
    rank: 4,
    meaning: 'Significant damage to the pipe.',
    action: 'Repair before or soon after closing.',
  },
  failing: {
    name: 'Failing',
    rank: 5,
    meaning: 'The pipe has failed in at least one place: a collapse, a hole with soil showing, or a blocked line.',
    action: 'Repair right away.',
  },
};

export const gradeRank = (level: GradeLevel): number => gradeInfo[level].rank;
export const worseOf = (a: GradeLevel, b: GradeLevel): GradeLevel => (gradeRank(a) >= gradeRank(b) ? a : b);

/** The numbers the rules use. Underfoot's own thresholds (common practice, no source). */
export const gradingThresholds = {
  /** Defects this close together (start to start, same run) count as a cluster: "within a few feet". */
  clusterWindow: feet(5) as Footage,
  /** How many defects make a cluster. */
  clusterSize: 3,
  /** This many moderate structural defects anywhere on the line count as widespread damage. */
  manyModerate: 5,
  /** A moderate structural defect running at least this far is widespread damage. */
  longExtent: feet(10) as Footage,
};

export type GradeRuleId =
  | 'failed_spot'
  | 'cluster_of_serious'
  | 'serious_structural'
  | 'cluster_of_moderate'
  | 'many_moderate'
  | 'long_moderate'
  | 'moderate_structural'
  | 'early_failure_material'
  | 'heavy_service'
  | 'moderate_service'
  | 'minor_only';

export interface GradeDriver {
  ruleId: GradeRuleId;
  level: GradeLevel;
  /** The finding(s) in words. */
  text: string;
  observationIds: string[];
}

export interface GradeRule {
  id: GradeRuleId;
  level: GradeLevel;
  /** The rule as the company reads it (also in the core README). */
  description: string;
  evaluate(context: GradeContext): Array<Omit<GradeDriver, 'ruleId' | 'level'>>;
}

export interface GradeContext {
  inspection: Inspection;
  findings: Finding[];
  units: UnitSystem;
}

const structural = (context: GradeContext, minSeverity: number) =>
  context.findings.filter((f) => f.group === 'structural' && f.observation.severity >= minSeverity);

/** Groups of at least `size` findings whose starts lie within `window` of each other, per run, not overlapping. */
export function findClusters(findings: readonly Finding[], window: Footage, size: number): Finding[][] {
  const byRun = new Map<string, Finding[]>();
  for (const finding of findings) {
    const list = byRun.get(finding.run.id);
    if (list) list.push(finding);
    else byRun.set(finding.run.id, [finding]);
  }
  const clusters: Finding[][] = [];
  for (const list of byRun.values()) {
    if (list.length < size) continue;
    list.sort((a, b) => a.start - b.start);
    let i = 0;
    let j = 0;
    while (i < list.length) {
      if (j < i) j = i;
      const first = list[i] as Finding;
      while (j + 1 < list.length && (list[j + 1] as Finding).start - first.start <= window) j += 1;
      if (j - i + 1 >= size) {
        clusters.push(list.slice(i, j + 1));
        i = j + 1;
      } else {
        i += 1;
      }
    }
  }
  return clusters;
}

function describeCluster(cluster: Finding[], what: string, units: UnitSystem): string {
  const first = cluster[0] as Finding;
  const last = cluster[cluster.length - 1] as Finding;
  const names = [...new Set(cluster.map((f) => kindInfo[f.observation.kind].name.toLowerCase()))].join(', ');
  return `${cluster.length} ${what} within ${formatFootage(gradingThresholds.clusterWindow, units)} (${names}), from ${formatFootage(first.start, units)} to ${formatFootage(last.start, units)} ${runLabel(first.run, first.accessPoint)}`;
}

const single = (units: UnitSystem, suffix: string) => (f: Finding) => ({
  text: `${describeFinding(f, units)}${suffix}`,
  observationIds: [f.observation.id],
});

/** The grading rules, worst grade first. The grade is the worst level any rule reaches. */
export const gradeRules: readonly GradeRule[] = [
  {
    id: 'failed_spot',
    level: 'failing',
    description: 'Any defect at severity 5: the pipe has failed there (collapse, hole with soil showing) or the line is blocked.',
    evaluate: (c) => c.findings.filter((f) => f.observation.severity === 5).map(single(c.units, '.')),
  },
  {
    id: 'cluster_of_serious',
    level: 'failing',
    description: `Three or more structural defects at severity 4 whose starts lie within 5 ft of each other on one run.`,
    evaluate: (c) =>
      findClusters(structural(c, 4), gradingThresholds.clusterWindow, gradingThresholds.clusterSize).map((cluster) => ({
        text: `${describeCluster(cluster, 'serious defects', c.units)}: together, the pipe is failing there.`,
        observationIds: cluster.map((f) => f.observation.id),
      })),
  },
  {
    id: 'serious_structural',
    level: 'repair_now',
    description: 'Any structural defect at severity 4.',
    evaluate: (c) => c.findings.filter((f) => f.group === 'structural' && f.observation.severity === 4).map(single(c.units, '.')),
  },
  {
    id: 'cluster_of_moderate',
    level: 'repair_now',
    description:
      'Three or more structural defects at severity 3 or more whose starts lie within 5 ft of each other on one run: close together they weaken the pipe more than one alone.',
    evaluate: (c) =>
      findClusters(structural(c, 3), gradingThresholds.clusterWindow, gradingThresholds.clusterSize).map((cluster) => ({
        text: `${describeCluster(cluster, 'defects', c.units)}: close together, they weaken the pipe more than one alone.`,
        observationIds: cluster.map((f) => f.observation.id),
      })),
  },
  {
    id: 'many_moderate',
    level: 'repair_now',
    description: 'Five or more structural defects at severity 3 or more anywhere on the line: widespread damage.',
    evaluate: (c) => {
      const list = structural(c, 3);
      if (list.length < gradingThresholds.manyModerate) return [];
      return [
        {
          text: `${list.length} structural defects at severity 3 or more along the line: the damage is widespread.`,
          observationIds: list.map((f) => f.observation.id),
        },
      ];
    },
  },
  {
    id: 'long_moderate',
    level: 'repair_now',
    description: 'A structural defect at severity 3 or more running 10 ft or longer.',
    evaluate: (c) =>
      structural(c, 3)
        .filter((f) => f.end - f.start >= gradingThresholds.longExtent)
        .map((f) => ({
          text: `${describeFinding(f, c.units)}: damage along ${formatFootage(f.end - f.start, c.units)} of pipe.`,
          observationIds: [f.observation.id],
        })),
  },
  {
    id: 'moderate_structural',
    level: 'plan_repair',
    description: 'Any structural defect at severity 3.',
    evaluate: (c) => c.findings.filter((f) => f.group === 'structural' && f.observation.severity === 3).map(single(c.units, '.')),
  },
  {
    id: 'early_failure_material',
    level: 'plan_repair',
    description: 'Pipe of a material known for early failure (bituminous fiber), whatever its condition looks like today.',
    evaluate: (c) =>
      c.inspection.runs.flatMap((run) => {
        const accessPoint = c.inspection.accessPoints.find((a) => a.id === run.accessPointId) ?? null;
        return run.sections
          .filter((s) => earlyFailureMaterials.includes(s.material))
          .map((s) => ({
            text: `${materialNames[s.material]} pipe from ${formatFootage(s.from, c.units)} to ${formatFootage(s.to, c.units)} ${runLabel(run, accessPoint)}: a material known to fail early.`,
            observationIds: [],
          }));
      }),
  },
  {
    id: 'heavy_service',
    level: 'plan_repair',
    description:
      'Roots, build-up, standing water or seepage at severity 4: cleaning alone will not keep it away; budget for what causes it.',
    evaluate: (c) => c.findings.filter((f) => f.group === 'service' && f.observation.severity === 4).map(single(c.units, '.')),
  },
  {
    id: 'moderate_service',
    level: 'maintain',
    description: 'Roots, build-up, standing water or seepage at severity 3, with the pipe structurally sound.',
    evaluate: (c) => c.findings.filter((f) => f.group === 'service' && f.observation.severity === 3).map(single(c.units, '.')),
  },
  {
    id: 'minor_only',
    level: 'clear',
    description: 'Defects at severity 1 or 2 are noted and do not lower the grade.',
    evaluate: (c) => c.findings.filter((f) => f.observation.severity <= 2).map(single(c.units, ' (noted).')),
  },
];

export interface GradeResult {
  /** The grade shown: the override if there is one, otherwise the computed grade. */
  level: GradeLevel;
  name: string;
  meaning: string;
  action: string;
  computedLevel: GradeLevel;
  override: GradeOverride | null;
  /** The findings that decided the computed grade, in words. */
  drivers: GradeDriver[];
  /** Findings behind lower levels, also in words (worst first). */
  otherFindings: GradeDriver[];
}

export interface GradeOptions {
  units?: UnitSystem;
  /** Pass findings already collected to save work. */
  findings?: Finding[];
}

/** The condition grade of an inspection, with the findings that drove it. */
export function gradeInspection(inspection: Inspection, options: GradeOptions = {}): GradeResult {
  const context: GradeContext = {
    inspection,
    findings: options.findings ?? collectFindings(inspection),
    units: options.units ?? 'imperial',
  };
  const hits: GradeDriver[] = [];
  for (const rule of gradeRules) {
    for (const hit of rule.evaluate(context)) {
      hits.push({ ruleId: rule.id, level: rule.level, text: hit.text, observationIds: hit.observationIds });
    }
  }
  let computed: GradeLevel = 'clear';
  for (const hit of hits) computed = worseOf(computed, hit.level);

  let drivers = hits.filter((h) => h.level === computed);
  if (drivers.length === 0) {
    drivers = [{ ruleId: 'minor_only', level: 'clear', text: 'No defect above severity 2 was found.', observationIds: [] }];
  }
  const otherFindings = hits.filter((h) => h.level !== computed).sort((a, b) => gradeRank(b.level) - gradeRank(a.level));
  return withOverride({ computedLevel: computed, drivers, otherFindings }, inspection.gradeOverride);
}

/** Apply (or clear) an inspector's override. The computed grade and its drivers stay visible. */
export function withOverride(
  computed: Pick<GradeResult, 'computedLevel' | 'drivers' | 'otherFindings'>,
  override: GradeOverride | null,
): GradeResult {
  const level = override ? override.level : computed.computedLevel;
  const info = gradeInfo[level];
  return {
    level,
    name: info.name,
    meaning: info.meaning,
    action: info.action,
    computedLevel: computed.computedLevel,
    override,
    drivers: computed.drivers,
    otherFindings: computed.otherFindings,
  };
}
