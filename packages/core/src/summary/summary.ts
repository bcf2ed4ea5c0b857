import { footageInWords, type UnitSystem } from '../footage/footage.ts';
import type { Finding } from '../model/findings.ts';
import { accessPointPhrases, kindInfo, materialNames, type DefectKind } from '../model/kinds.ts';
import type { GradeLevel, Inspection } from '../model/schemas.ts';
import type { GradeResult } from '../grading/grade.ts';
import type { RepairPlan } from '../recommendations/repair-plan.ts';
import type { CostOptionsResult } from '../costing/cost-options.ts';
import { formatCents } from '../costing/exact.ts';
import { earlyFailureMaterials } from '../checks/materials.ts';

/**
 * A few plain sentences for the buyer or seller, second person, short words.
 * Tests hold every generated summary to Flesch reading ease ≥ 60 and
 * Flesch–Kincaid grade ≤ 8 (Flesch 1948; Kincaid et al. 1975), measured with the
 * `flesch`, `flesch-kincaid` and `syllable` packages.
 */
export interface Summary {
  sentences: string[];
  text: string;
}

export interface SummaryInput {
  inspection: Inspection;
  grade: GradeResult;
  findings: readonly Finding[];
  plan: RepairPlan;
  costs?: CostOptionsResult | null;
  units?: UnitSystem;
}

const opening: Record<GradeLevel, string> = {
  clear: 'Your sewer line looks good.',
  maintain: 'Your sewer line is in sound shape, but it needs some care.',
  plan_repair: 'Your sewer line works, but it has damage that will get worse over time.',
  repair_now: 'Your sewer line has damage that should be fixed soon.',
  failing: 'Your sewer line has failed in at least one spot.',
};

const numberWords = ['no', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten'];
const countWord = (n: number): string => numberWords[n] ?? String(n);

function listJoin(items: readonly string[]): string {
  if (items.length <= 1) return items[0] ?? '';
  if (items.length === 2) return `${items[0]} and ${items[1]}`;
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** "a crack", "two cracks" */
function countedPhrase(kind: DefectKind, count: number): string {
  const info = kindInfo[kind];
  if (count === 1) return info.phrase;
  // mass nouns read the same for any count
  if (info.plural === info.phrase || info.plural.endsWith('build-up') || info.plural === 'root growth') return info.phrase;
  return `${countWord(count)} ${info.plural}`;
}

/** Short names for the "we looked for" list. */
const lookedForNames: Record<DefectKind, string> = {
  crack: 'cracks',
  open_crack: 'open cracks',
  missing_piece: 'holes',
  out_of_round: 'squeezed pipe',
  collapse: 'caved-in pipe',
  joint_offset: 'joints out of line',
  joint_gap: 'joints pulled apart',
  sag: 'low spots',
  worn_wall: 'worn pipe',
  liner_problem: 'liner flaws',
  roots: 'roots',
  grease: 'grease',
  debris: 'debris',
  scale: 'scale',
  standing_water: 'standing water',
  blockage: 'blocks',
  seepage: 'leaks',
};

function coverageSentences(inspection: Inspection, units: UnitSystem): string[] {
  if (inspection.runs.length === 0) return ['No camera runs were recorded.'];
  const total = inspection.runs.reduce((sum, run) => sum + run.distanceReached, 0);
  const first = inspection.accessPoints.find((a) => a.id === inspection.runs[0]?.accessPointId);
  const from = first ? accessPointPhrases[first.kind] : 'the access point';
  const sentences = [`We ran a camera through about ${footageInWords(total, units)} of pipe from ${from}.`];
  const towardMain = inspection.runs.filter((r) => r.direction === 'toward_main');
  if (inspection.runs.some((r) => r.endReason === 'reached_main')) {
    sentences.push('The camera went all the way to the city sewer.');
  } else if (towardMain.length > 0) {
    sentences.push('The camera could not reach the city sewer, so part of the line was not seen.');
  }
  return sentences;
}

function findingSentences(input: SummaryInput, units: UnitSystem): string[] {
  const { grade, findings } = input;
  const byId = new Map(findings.map((f) => [f.observation.id, f]));
  const driverIds = new Set(grade.drivers.flatMap((d) => d.observationIds));
  const key = findings.filter((f) => driverIds.has(f.observation.id));
  const sentences: string[] = [];
  if (grade.computedLevel === 'clear') {
    const notFound = input.inspection.checkedNotFound.slice(0, 4).map((k) => lookedForNames[k]);
    if (notFound.length > 0) sentences.push(`We looked for ${listJoin(notFound)}, and found none.`);
    const minorKinds = [...new Set(findings.map((f) => f.observation.kind))].slice(0, 2);
    if (minorKinds.length > 0) {
      sentences.push(`We saw a few small things, like ${listJoin(minorKinds.map((k) => lookedForNames[k]))}, that need no work now.`);
    } else if (notFound.length === 0) {
      sentences.push('We saw no breaks, roots or low spots.');
    }
    return sentences;
  }
  if (key.length === 0) return sentences;
  const counts = new Map<DefectKind, number>();
  for (const f of key) counts.set(f.observation.kind, (counts.get(f.observation.kind) ?? 0) + 1);
  const kinds = [...counts.entries()].sort((a, b) => b[1] - a[1]).slice(0, 3);
  const phrases = kinds.map(([kind, count]) => countedPhrase(kind, count));
  const more = counts.size > 3 ? ' and more' : '';
  sentences.push(`We found ${listJoin(phrases)}${more}.`);

  // the worst one, with where it is
  let worst: Finding | undefined;
  for (const id of driverIds) {
    const f = byId.get(id);
    if (f && (!worst || f.observation.severity > worst.observation.severity)) worst = f;
  }
  if (worst) {
    const from = worst.accessPoint ? accessPointPhrases[worst.accessPoint.kind] : 'the access point';
    const label = key.length > 1 ? 'The worst spot is' : 'It is';
    sentences.push(`${label} about ${footageInWords(worst.start, units)} from ${from}.`);
  }
  return sentences;
}

function materialSentence(inspection: Inspection): string | null {
  for (const run of inspection.runs) {
    for (const section of run.sections) {
      if (earlyFailureMaterials.includes(section.material)) {
        return `Part of the line is ${materialNames[section.material].toLowerCase()}, a kind of pipe that tends to fail early.`;
      }
    }
  }
  return null;
}

function actionSentences(input: SummaryInput): string[] {
  const level = input.grade.level;
  const { plan } = input;
  switch (level) {
    case 'clear':
      return ['No work is needed now.', 'Have it checked again in about five years.'];
    case 'maintain': {
      const roots = plan.roots.length > 0;
      const buildUp = plan.cleaning.some((f) => f.observation.kind !== 'roots');
      if (roots && buildUp)
        return [
          'Have the roots cut out and the line cleaned with a strong jet of water.',
          'Then have it checked again in about two years.',
        ];
      if (roots)
        return ['Cutting out the roots should take care of it for now.', 'Roots grow back, so have it checked again in two years.'];
      if (buildUp && plan.cleaning.some((f) => ['grease', 'debris', 'scale', 'blockage'].includes(f.observation.kind))) {
        return ['A cleaning with a strong jet of water should take care of it.', 'Have it checked again in about two years.'];
      }
      return ['Keep an eye on it.', 'Have it checked again in about a year.'];
    }
    case 'plan_repair':
      return ['Plan to fix it in the next year or two.'];
    case 'repair_now':
      return ['Get it fixed before you close, or soon after.'];
    case 'failing':
      return ['Get it fixed right away.', 'Until then, use as little water as you can.'];
  }
}

/** Round figures for a sentence, outward so the range still holds: $1,000s from $1,000 up, else $100s. */
const stepFor = (cents: number) => (cents >= 100_000 ? 100_000 : 10_000);
const roundDown = (cents: number) => Math.floor(cents / stepFor(cents)) * stepFor(cents);
const roundUp = (cents: number) => Math.ceil(cents / stepFor(cents)) * stepFor(cents);

function costSentence(input: SummaryInput): string | null {
  const costs = input.costs;
  if (!costs || costs.proposed === null) return null;
  const option = costs.options.find((o) => o.kind === costs.proposed);
  if (!option || input.grade.level === 'clear') return null;
  const what = option.kind === 'cleaning' ? 'This work' : 'A fix';
  return `${what} may cost about ${formatCents(roundDown(option.lowCents))} to ${formatCents(roundUp(option.highCents))}.`;
}

/** The plain-language summary, generated from the findings and the grade. */
export function summarise(input: SummaryInput): Summary {
  const units = input.units ?? 'imperial';
  const sentences: string[] = [opening[input.grade.level]];
  sentences.push(...coverageSentences(input.inspection, units));
  sentences.push(...findingSentences(input, units));
  const material = materialSentence(input.inspection);
  if (material) sentences.push(material);
  sentences.push(...actionSentences(input));
  const cost = costSentence(input);
  if (cost) sentences.push(cost);
  return { sentences, text: sentences.join(' ') };
}
