import type { Analysis } from '../analysis/analyse.ts';
import { kindInfo, type ObservationKind } from '../model/kinds.ts';
import type { GradeLevel, Inspection } from '../model/schemas.ts';
import type { Side } from '../permissions/permissions.ts';

/**
 * What a published report says to the person reading it, beyond what core computes:
 * what the grade means for them (second person, by the side of the sale they are on)
 * and a short glossary of the trade words this report uses. Underfoot's own wording.
 */

/** "What this means for you", for buyers (and their agents) and for sellers (and theirs). */
export const gradeGuidance: Record<Side, Record<GradeLevel, string>> = {
  buyer: {
    clear:
      'You can go ahead without sewer work. Keep this report with your house papers, and have the line looked at again in about five years, or sooner if drains slow down.',
    maintain:
      'The pipe itself is sound. It needs a cleaning or a watchful eye, which costs far less than a repair. You may want to ask the seller to have it done before closing.',
    plan_repair:
      'Nothing has to be fixed today, but expect a repair in the next few years. Getting a quote while your inspection period is open gives you a figure to talk about with the seller.',
    repair_now:
      'Plan on a repair before closing or soon after. Ask a licensed contractor for a quote while your inspection period is open; a repair credit or a seller repair is a common way to settle it.',
    failing:
      'The line needs a repair right away. Talk with your agent before your inspection period ends. Until it is fixed, the house may back up, so use as little water as you can.',
  },
  seller: {
    clear: 'Buyers reading this will see a sewer line in good shape. Nothing needs doing before you list.',
    maintain:
      'The pipe is sound but needs a cleaning or a watchful eye. Having it cleaned before buyers look is a small cost that takes a question off the table.',
    plan_repair:
      'The line works, but it has damage that will grow. Buyers will ask about it: a quote from a licensed contractor now helps you decide whether to repair it or price it in.',
    repair_now:
      'The line has damage that a buyer will want fixed. A quote from a licensed contractor now lets you choose between repairing it before you sell and offering a credit.',
    failing:
      'The line has failed in at least one spot and needs a repair right away. Until it is fixed, use as little water as you can, and expect buyers to ask for the repair or a credit.',
  },
};

export interface GlossaryEntry {
  term: string;
  definition: string;
}

type Uses = { kinds: Set<ObservationKind>; inspection: Inspection; analysis: Analysis; words: string };

/** The trade words a report may use, each with the test for whether this report uses it. Definitions are our own. */
const glossary: { term: string; definition: string; used: (u: Uses) => boolean }[] = [
  {
    term: 'Lateral',
    definition:
      'The private sewer pipe that carries everything from the house to the public sewer, usually under the yard. The owner of the house looks after it.',
    used: () => true,
  },
  {
    term: 'Main',
    definition:
      'The public sewer pipe under the street that all the houses on it drain into. The city or the sewer district looks after it.',
    used: () => true,
  },
  {
    term: 'Cleanout',
    definition:
      'A capped pipe that rises to the ground or sits inside the house, so crews can reach the line with a camera or a cleaning tool.',
    used: (u) => u.inspection.accessPoints.some((a) => a.kind.includes('cleanout')) || u.kinds.has('cleanout') || /cleanout/i.test(u.words),
  },
  {
    term: 'Footage',
    definition:
      'How far along the pipe something is, read from the camera cable’s counter at the opening the camera went in. It tells a crew where to dig.',
    used: () => true,
  },
  {
    term: 'Severity',
    definition: 'How bad a single defect is, from 1 (minor, just noted) to 5 (the pipe has failed there or the line is blocked).',
    used: (u) => u.analysis.diagram.lanes.some((l) => l.pins.length > 0),
  },
  {
    term: 'Joint',
    definition: 'Where two lengths of pipe meet. Older clay and cast-iron pipes come in short lengths, so they have many joints.',
    used: (u) => u.kinds.has('joint_offset') || u.kinds.has('joint_gap') || u.kinds.has('roots'),
  },
  {
    term: 'Offset joint',
    definition: 'A joint where the two pipe ends no longer line up, leaving a small ledge that can catch paper and waste.',
    used: (u) => u.kinds.has('joint_offset'),
  },
  {
    term: 'Wye',
    definition: 'A Y-shaped fitting where another drain joins the line at an angle. A tee does the same at a right angle.',
    used: (u) => u.inspection.runs.some((r) => r.observations.some((o) => o.kind === 'branch')),
  },
  {
    term: 'Root intrusion',
    definition:
      'Roots of trees or shrubs that have grown into the pipe through a joint or crack, looking for water. They grow back after cutting.',
    used: (u) => u.kinds.has('roots'),
  },
  {
    term: 'Sag (or belly)',
    definition: 'A low stretch of pipe where water and waste settle instead of running on.',
    used: (u) => u.kinds.has('sag') || u.kinds.has('standing_water') || u.analysis.slope.runs.some((r) => r.sags.length > 0),
  },
  {
    term: 'Scale',
    definition: 'A hard crust of minerals or rust on the inside of the pipe that narrows it over time.',
    used: (u) => u.kinds.has('scale') || u.kinds.has('worn_wall'),
  },
  {
    term: 'Slope (or fall)',
    definition: 'How much the pipe drops over its length, so that water runs downhill to the main. Codes set a minimum.',
    used: (u) => u.analysis.slope.runs.length > 0,
  },
  {
    term: 'Hydro-jetting',
    definition:
      'Cleaning the inside of the pipe with a hose that sprays water at very high pressure. It clears grease, sludge, scale and fine roots.',
    used: (u) => /hydro-jet/i.test(u.words),
  },
  {
    term: 'Root cutting',
    definition: 'Clearing roots from inside the pipe with a spinning cutter on a cable. Roots grow back, so it is repeated.',
    used: (u) => /root cutting|cut the roots/i.test(u.words),
  },
  {
    term: 'Spot repair',
    definition: 'Digging down at one damaged spot and replacing that piece of pipe.',
    used: (u) => /spot repair|damaged spots/i.test(u.words),
  },
  {
    term: 'Cured-in-place lining',
    definition:
      'A trenchless repair: a soft, resin-soaked tube is pulled into the old pipe, pressed against its wall and hardened, making a new pipe inside the old one.',
    used: (u) => /lining|liner/i.test(u.words),
  },
  {
    term: 'Sectional liner',
    definition: 'A short piece of cured-in-place lining that seals one damaged spot from inside, without digging.',
    used: (u) => /sectional liner|line the damaged spots/i.test(u.words),
  },
  {
    term: 'Pipe bursting',
    definition: 'A trenchless replacement: a new pipe is pulled through the old one while a cone-shaped head breaks the old pipe apart.',
    used: (u) => /bursting/i.test(u.words),
  },
  {
    term: 'Trenchless',
    definition: 'Repairs done from one or two small pits instead of digging up the whole yard.',
    used: (u) => /lining|liner|bursting/i.test(u.words),
  },
];

/** The glossary entries this report needs, in reading order. */
export function glossaryFor(inspection: Inspection, analysis: Analysis): GlossaryEntry[] {
  const kinds = new Set<ObservationKind>();
  for (const run of inspection.runs) for (const o of run.observations) kinds.add(o.kind);
  const words = [
    ...analysis.recommendations.findings.map((r) => `${r.name} ${r.text}`),
    ...analysis.recommendations.line.map((r) => `${r.name} ${r.text}`),
    ...analysis.costs.options.map((o) => `${o.name} ${o.description}`),
  ].join(' ');
  const uses: Uses = { kinds, inspection, analysis, words };
  return glossary.filter((entry) => entry.used(uses)).map(({ term, definition }) => ({ term, definition }));
}

/** A kind's short explanation, for the finding cards ("What this is"). */
export const explainKind = (kind: ObservationKind): string => kindInfo[kind].explanation;

/**
 * A check's source as readers see it: published codes and formulas are named; the project's
 * own provenance notes (its reference table, "common practice", "from memory") are for the
 * company and the tests, not for a buyer.
 */
export function sourceForReaders(source: string): string | null {
  return /CHECKS\.md|common practice|from memory/i.test(source) ? null : source;
}

/**
 * The revision a report address asks for (`?revision=2`), or null for the latest: the web app's
 * routes and the server's first view read the address the same way.
 */
export function revisionFromQuery(value: string | null | undefined): number | null {
  const revision = Number(value);
  return Number.isInteger(revision) && revision > 0 ? revision : null;
}
