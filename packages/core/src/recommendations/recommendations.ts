import { formatFootage, type UnitSystem } from '../footage/footage.ts';
import type { Finding } from '../model/findings.ts';
import { kindInfo, outdoorAccessKinds, type DefectKind } from '../model/kinds.ts';
import type { GradeLevel, Inspection } from '../model/schemas.ts';
import { planThresholds, type RepairPlan } from './repair-plan.ts';

export const recommendationKinds = [
  'hydro_jetting',
  'root_cutting',
  'spot_repair',
  'sectional_liner',
  'full_lining',
  'pipe_bursting',
  'open_trench',
  'add_cleanout',
  'monitor',
] as const;
export type RecommendationKind = (typeof recommendationKinds)[number];

/**
 * What each method is, in plain words. Trenchless method descriptions follow the
 * US EPA fact sheet 832-F-99-032, Trenchless Sewer Rehabilitation (1999).
 */
export const recommendationInfo: Record<RecommendationKind, { name: string; explanation: string }> = {
  hydro_jetting: {
    name: 'Hydro-jetting',
    explanation: 'Cleaning the inside of the pipe with a high-pressure water jet.',
  },
  root_cutting: {
    name: 'Root cutting',
    explanation: 'A spinning cutter on a cable clears roots from inside the pipe. Roots grow back, so it is repeated.',
  },
  spot_repair: {
    name: 'Spot repair by excavation',
    explanation: 'Digging down to the damaged spot and replacing that piece of pipe.',
  },
  sectional_liner: {
    name: 'Sectional liner',
    explanation: 'A short resin-soaked sleeve pressed against the damaged spot from inside and hardened there, with no digging.',
  },
  full_lining: {
    name: 'Cured-in-place lining',
    explanation:
      'A resin-soaked liner pulled through the whole run and hardened in place, making a new pipe inside the old one (US EPA 832-F-99-032).',
  },
  pipe_bursting: {
    name: 'Pipe bursting',
    explanation:
      'A new pipe is pulled through the old one while a bursting head breaks the old pipe apart, working from two small pits (US EPA 832-F-99-032).',
  },
  open_trench: {
    name: 'Open-trench replacement',
    explanation: 'Digging a trench along the line and laying new pipe at the right slope.',
  },
  add_cleanout: {
    name: 'Add a cleanout',
    explanation: 'Installing an outdoor cleanout so the line can be reached without going into the house.',
  },
  monitor: {
    name: 'Monitor',
    explanation: 'Looking again with a camera after some time to see whether it has changed.',
  },
};

export type Urgency = 'now' | 'soon' | 'plan' | 'routine';

export const urgencyNames: Record<Urgency, string> = {
  now: 'Right away',
  soon: 'Before or soon after closing',
  plan: 'Within a year or two',
  routine: 'At the next routine check',
};

export interface FindingRule {
  id: string;
  kinds: readonly DefectKind[] | 'all';
  minSeverity: number;
  maxSeverity: number;
  /** First is the main action; the rest are alternatives or follow-ups. */
  actions: readonly RecommendationKind[];
  urgency: Urgency;
  reinspectYears: number | null;
  why: string;
}

const buildUp = ['grease', 'debris', 'scale'] as const;

/**
 * Per-finding rules, read top to bottom; the first rule that matches a finding's
 * kind and severity applies. Underfoot's own rules (common practice, no source),
 * except where marked.
 */
export const findingRules: readonly FindingRule[] = [
  {
    id: 'minor',
    kinds: 'all',
    minSeverity: 1,
    maxSeverity: 2,
    actions: ['monitor'],
    urgency: 'routine',
    reinspectYears: 5,
    why: 'Minor. Note it and look again at the next camera check.',
  },
  {
    id: 'failed_structure',
    kinds: ['crack', 'open_crack', 'missing_piece', 'out_of_round', 'collapse', 'joint_offset', 'joint_gap', 'sag', 'worn_wall'],
    minSeverity: 5,
    maxSeverity: 5,
    actions: ['spot_repair'],
    urgency: 'now',
    reinspectYears: null,
    why: 'The pipe has failed here. Dig it up and replace this piece.',
  },
  {
    id: 'roots_moderate',
    kinds: ['roots'],
    minSeverity: 3,
    maxSeverity: 3,
    actions: ['root_cutting', 'monitor'],
    urgency: 'plan',
    reinspectYears: 2,
    why: 'Cut the roots, then look again in about two years; roots grow back through the joint.',
  },
  {
    id: 'roots_heavy',
    kinds: ['roots'],
    minSeverity: 4,
    maxSeverity: 4,
    actions: ['root_cutting', 'sectional_liner'],
    urgency: 'soon',
    reinspectYears: null,
    why: 'Cut the roots, then seal the joint they come through so they stay out.',
  },
  {
    id: 'roots_blocking',
    kinds: ['roots'],
    minSeverity: 5,
    maxSeverity: 5,
    actions: ['root_cutting', 'sectional_liner'],
    urgency: 'now',
    reinspectYears: null,
    why: 'Roots block the line. Clear them now, then seal the joint.',
  },
  {
    id: 'build_up',
    kinds: buildUp,
    minSeverity: 3,
    maxSeverity: 4,
    actions: ['hydro_jetting'],
    urgency: 'plan',
    reinspectYears: null,
    // CHECKS.md, facts of the trade: sludge, grease and scale are cleared by hydro-jetting (common practice).
    why: 'Clean it out with hydro-jetting.',
  },
  {
    id: 'build_up_blocking',
    kinds: buildUp,
    minSeverity: 5,
    maxSeverity: 5,
    actions: ['hydro_jetting'],
    urgency: 'now',
    reinspectYears: null,
    why: 'Build-up blocks the line. Clear it now with hydro-jetting and look again with the camera.',
  },
  {
    id: 'blockage',
    kinds: ['blockage'],
    minSeverity: 3,
    maxSeverity: 4,
    actions: ['hydro_jetting'],
    urgency: 'soon',
    reinspectYears: null,
    why: 'Clear the object from the line, then look again with the camera.',
  },
  {
    id: 'blocked',
    kinds: ['blockage'],
    minSeverity: 5,
    maxSeverity: 5,
    actions: ['hydro_jetting'],
    urgency: 'now',
    reinspectYears: null,
    why: 'The line is blocked. Clear it now, then look again with the camera to see what caused it.',
  },
  {
    id: 'standing_water',
    kinds: ['standing_water'],
    minSeverity: 3,
    maxSeverity: 4,
    actions: ['monitor'],
    urgency: 'plan',
    reinspectYears: 1,
    why: 'Water is standing in the pipe. Find out why: a low spot or a block further down.',
  },
  {
    id: 'backed_up',
    kinds: ['standing_water'],
    minSeverity: 5,
    maxSeverity: 5,
    actions: ['hydro_jetting'],
    urgency: 'now',
    reinspectYears: null,
    why: 'The pipe is full of water, so the line is backed up. Clear it and find the cause.',
  },
  {
    id: 'seepage',
    kinds: ['seepage'],
    minSeverity: 3,
    maxSeverity: 5,
    actions: ['sectional_liner', 'spot_repair'],
    urgency: 'plan',
    reinspectYears: null,
    why: 'Seal the spot where ground water gets in.',
  },
  {
    id: 'crack_moderate',
    kinds: ['crack', 'open_crack', 'joint_gap'],
    minSeverity: 3,
    maxSeverity: 3,
    actions: ['sectional_liner', 'spot_repair'],
    urgency: 'plan',
    reinspectYears: null,
    why: 'Seal it with a sectional liner, or dig and replace the piece, before it grows.',
  },
  {
    id: 'crack_serious',
    kinds: ['crack', 'open_crack', 'joint_gap'],
    minSeverity: 4,
    maxSeverity: 4,
    actions: ['spot_repair', 'sectional_liner'],
    urgency: 'soon',
    reinspectYears: null,
    why: 'Repair this spot soon: dig and replace the piece, or line it if the pipe still holds its shape.',
  },
  {
    id: 'hole',
    kinds: ['missing_piece'],
    minSeverity: 3,
    maxSeverity: 4,
    actions: ['spot_repair', 'sectional_liner'],
    urgency: 'soon',
    reinspectYears: null,
    why: 'Part of the wall is missing. Dig and replace the piece; a small hole may be lined instead.',
  },
  {
    id: 'out_of_round_moderate',
    kinds: ['out_of_round'],
    minSeverity: 3,
    maxSeverity: 3,
    actions: ['sectional_liner', 'monitor'],
    urgency: 'plan',
    reinspectYears: 1,
    why: 'The pipe is losing its shape. Reinforce it with a liner, or watch it closely.',
  },
  {
    id: 'out_of_round_serious',
    kinds: ['out_of_round', 'collapse'],
    minSeverity: 3,
    maxSeverity: 4,
    actions: ['spot_repair'],
    urgency: 'soon',
    reinspectYears: null,
    why: 'The pipe is caving in. Dig and replace this piece; a liner needs a round pipe to work.',
  },
  {
    id: 'offset_moderate',
    kinds: ['joint_offset'],
    minSeverity: 3,
    maxSeverity: 3,
    actions: ['monitor', 'hydro_jetting'],
    urgency: 'plan',
    reinspectYears: 2,
    // CHECKS.md: minor offsets that do not catch debris or hold water are usually monitored (common practice).
    why: 'Watch it; clean the line if waste catches on the lip.',
  },
  {
    id: 'offset_serious',
    kinds: ['joint_offset'],
    minSeverity: 4,
    maxSeverity: 4,
    actions: ['spot_repair'],
    urgency: 'soon',
    reinspectYears: null,
    why: 'The joint is far out of line. Dig and reset or replace it.',
  },
  {
    id: 'sag_moderate',
    kinds: ['sag'],
    minSeverity: 3,
    maxSeverity: 3,
    actions: ['monitor', 'hydro_jetting'],
    urgency: 'plan',
    reinspectYears: 2,
    why: 'Watch it, and clean the line if waste settles in the low spot. Only re-laying the pipe removes a sag.',
  },
  {
    id: 'sag_serious',
    kinds: ['sag'],
    minSeverity: 4,
    maxSeverity: 4,
    actions: ['spot_repair', 'open_trench'],
    urgency: 'soon',
    reinspectYears: null,
    why: 'Dig up the low spot and re-lay the pipe at a proper slope; a liner follows the dip and cannot fix it.',
  },
  {
    id: 'worn_wall',
    kinds: ['worn_wall'],
    minSeverity: 3,
    maxSeverity: 4,
    actions: ['full_lining', 'spot_repair'],
    urgency: 'plan',
    reinspectYears: null,
    why: 'The wall is wearing thin. Line the run before it wears through.',
  },
  {
    id: 'liner_problem',
    kinds: ['liner_problem'],
    minSeverity: 3,
    maxSeverity: 5,
    actions: ['sectional_liner'],
    urgency: 'plan',
    reinspectYears: null,
    why: 'Have the old liner repaired where it has failed; ask whether it is still under warranty.',
  },
];

export interface Recommendation {
  /** Stable id so the office can edit or hide it: `finding:<observationId>` or `line:<kind>`. */
  id: string;
  scope: 'finding' | 'line';
  kind: RecommendationKind;
  name: string;
  /** Other methods that would also do. */
  alternatives: RecommendationKind[];
  urgency: Urgency;
  text: string;
  reinspectYears: number | null;
  observationIds: string[];
  ruleId: string;
}

export function ruleFor(kind: DefectKind, severity: number): FindingRule | null {
  for (const rule of findingRules) {
    if ((rule.kinds === 'all' || rule.kinds.includes(kind)) && severity >= rule.minSeverity && severity <= rule.maxSeverity) {
      return rule;
    }
  }
  return null;
}

/** Re-inspection interval by grade, in years (common practice, no source); null: after the repair. */
export const reinspectYearsByGrade: Record<GradeLevel, number | null> = {
  clear: 5,
  maintain: 2,
  plan_repair: 1,
  repair_now: null,
  failing: null,
};

const urgencyByGrade: Record<GradeLevel, Urgency> = {
  clear: 'routine',
  maintain: 'plan',
  plan_repair: 'plan',
  repair_now: 'soon',
  failing: 'now',
};

export interface RecommendOptions {
  units?: UnitSystem;
}

/** Recommendations per finding and for the line as a whole. */
export function recommend(
  inspection: Inspection,
  findings: readonly Finding[],
  plan: RepairPlan,
  grade: GradeLevel,
  options: RecommendOptions = {},
): { findings: Recommendation[]; line: Recommendation[] } {
  const units = options.units ?? 'imperial';
  const perFinding: Recommendation[] = [];
  for (const finding of findings) {
    const rule = ruleFor(finding.observation.kind, finding.observation.severity);
    if (!rule) continue;
    const [kind, ...alternatives] = rule.actions as [RecommendationKind, ...RecommendationKind[]];
    perFinding.push({
      id: `finding:${finding.observation.id}`,
      scope: 'finding',
      kind,
      name: recommendationInfo[kind].name,
      alternatives,
      urgency: rule.urgency,
      text: rule.why,
      reinspectYears: rule.reinspectYears,
      observationIds: [finding.observation.id],
      ruleId: rule.id,
    });
  }

  const line: Recommendation[] = [];
  const add = (r: Omit<Recommendation, 'id' | 'scope' | 'name'>) =>
    line.push({ ...r, id: `line:${r.kind}`, scope: 'line', name: recommendationInfo[r.kind].name });

  const fullRuns = plan.runs.filter((r) => r.fullLengthReasons.length > 0);
  const urgency = urgencyByGrade[grade];
  if (fullRuns.length > 0) {
    const methods = [...new Set(fullRuns.map((r) => r.fullLengthMethod))];
    const main = methods.includes('open_trench') ? 'open_trench' : methods.includes('pipe_bursting') ? 'pipe_bursting' : 'full_lining';
    const alternatives: RecommendationKind[] =
      main === 'full_lining' ? ['pipe_bursting', 'open_trench'] : main === 'pipe_bursting' ? ['open_trench'] : ['pipe_bursting'];
    add({
      kind: main,
      alternatives,
      urgency: urgency === 'routine' ? 'plan' : urgency,
      text: `Repair the whole run rather than spot by spot. ${fullRuns.flatMap((r) => r.fullLengthReasons).join(' ')}`,
      reinspectYears: null,
      observationIds: fullRuns.flatMap((r) => r.spots.map((f) => f.observation.id)),
      ruleId: 'full_length',
    });
  }
  const spotRuns = plan.runs.filter((r) => r.fullLengthReasons.length === 0 && r.excavations.length > 0);
  if (spotRuns.length > 0) {
    const digs = spotRuns.flatMap((r) => r.excavations.map((e) => `${formatFootage(e.from, units)} ${r.label}`));
    add({
      kind: 'spot_repair',
      alternatives: ['sectional_liner'],
      urgency: urgency === 'routine' ? 'plan' : urgency,
      text: `Repair ${digs.length === 1 ? 'one spot' : `${digs.length} spots`}: ${digs.join('; ')}. Defects within ${formatFootage(planThresholds.excavationReach, units)} of each other share one dig.`,
      reinspectYears: null,
      observationIds: spotRuns.flatMap((r) => r.spots.map((f) => f.observation.id)),
      ruleId: 'spot_repairs',
    });
  }
  if (plan.roots.length > 0) {
    add({
      kind: 'root_cutting',
      alternatives: ['hydro_jetting'],
      urgency: plan.roots.some((f) => f.observation.severity >= 5) ? 'now' : 'plan',
      text: `Cut the roots (${plan.roots.length === 1 ? 'one spot' : `${plan.roots.length} spots`}). Roots grow back through open joints, so expect to repeat it.`,
      reinspectYears: 2,
      observationIds: plan.roots.map((f) => f.observation.id),
      ruleId: 'roots',
    });
  }
  const buildUpFindings = plan.cleaning.filter((f) => f.observation.kind !== 'roots' && f.observation.kind !== 'seepage');
  if (buildUpFindings.length > 0) {
    const names = [...new Set(buildUpFindings.map((f) => kindInfo[f.observation.kind].name.toLowerCase()))];
    add({
      kind: 'hydro_jetting',
      alternatives: [],
      urgency: buildUpFindings.some((f) => f.observation.severity >= 5) ? 'now' : 'plan',
      text: `Clean the line with hydro-jetting to clear ${names.join(', ')}.`,
      reinspectYears: null,
      observationIds: buildUpFindings.map((f) => f.observation.id),
      ruleId: 'cleaning',
    });
  }
  if (inspection.accessPoints.length > 0 && !inspection.accessPoints.some((a) => outdoorAccessKinds.includes(a.kind))) {
    add({
      kind: 'add_cleanout',
      alternatives: [],
      urgency: 'plan',
      text: 'Add an outdoor cleanout so the line can be cleaned and checked without going into the house.',
      reinspectYears: null,
      observationIds: [],
      ruleId: 'no_outdoor_cleanout',
    });
  }
  const years = reinspectYearsByGrade[grade];
  add({
    kind: 'monitor',
    alternatives: [],
    urgency: 'routine',
    text:
      years === null
        ? 'Look again with a camera after the repair to confirm it.'
        : `Look again with a camera in about ${years} ${years === 1 ? 'year' : 'years'}${grade === 'maintain' ? ', or after cleaning' : ''}.`,
    reinspectYears: years,
    observationIds: [],
    ruleId: 'reinspect',
  });
  return { findings: perFinding, line };
}
