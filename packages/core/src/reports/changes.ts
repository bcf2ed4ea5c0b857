import { formatFootage, type UnitSystem } from '../footage/footage.ts';
import { gradeInfo, gradeRank } from '../grading/grade.ts';
import { collectFindings, type Finding } from '../model/findings.ts';
import { kindInfo, runDirectionNames } from '../model/kinds.ts';
import type { GradeLevel, Inspection } from '../model/schemas.ts';

/**
 * What changed between two revisions of a report (an amendment, or a re-inspection
 * after a repair), in words a buyer reads. Findings are matched by kind, run
 * direction and footage within MATCH_WINDOW, since a new visit gives new ids.
 */

/** Two sightings this close (one pipe joint, about 3 ft — common practice, no source) are the same defect. */
export const MATCH_WINDOW_UNITS = 9_144; // 3 ft in tenths of a millimetre (0.3048 m per ft, NIST SP 811)

export interface RevisionChange {
  kind: 'resolved' | 'new' | 'better' | 'worse';
  text: string;
}

export interface RevisionComparison {
  gradeBefore: GradeLevel;
  gradeAfter: GradeLevel;
  gradeText: string;
  changes: RevisionChange[];
}

const describe = (f: Finding, units: UnitSystem) =>
  `${kindInfo[f.observation.kind].name.toLowerCase()} at ${formatFootage(f.start, units)} ${runDirectionNames[f.run.direction].toLowerCase()}`;

function sameDefect(a: Finding, b: Finding): boolean {
  return (
    a.observation.kind === b.observation.kind && a.run.direction === b.run.direction && Math.abs(a.start - b.start) <= MATCH_WINDOW_UNITS
  );
}

export function compareRevisions(
  before: { inspection: Inspection; grade: GradeLevel },
  after: { inspection: Inspection; grade: GradeLevel },
  units: UnitSystem = 'imperial',
): RevisionComparison {
  const old = collectFindings(before.inspection);
  const now = collectFindings(after.inspection);
  const matched = new Set<Finding>();
  const changes: RevisionChange[] = [];
  for (const f of now) {
    const previous = old.find((o) => !matched.has(o) && sameDefect(o, f));
    if (!previous) {
      changes.push({ kind: 'new', text: `New: ${describe(f, units)}.` });
      continue;
    }
    matched.add(previous);
    const was = previous.observation.severity;
    const is = f.observation.severity;
    if (is < was) changes.push({ kind: 'better', text: `Less severe: ${describe(f, units)} (was ${was} of 5, now ${is} of 5).` });
    if (is > was) changes.push({ kind: 'worse', text: `More severe: ${describe(f, units)} (was ${was} of 5, now ${is} of 5).` });
  }
  for (const o of old) if (!matched.has(o)) changes.push({ kind: 'resolved', text: `No longer seen: ${describe(o, units)}.` });

  const from = gradeInfo[before.grade].name;
  const to = gradeInfo[after.grade].name;
  const gradeText =
    before.grade === after.grade
      ? `The grade stays ${to}.`
      : gradeRank(after.grade) < gradeRank(before.grade)
        ? `The grade improved from ${from} to ${to}.`
        : `The grade went from ${from} to ${to}.`;
  return { gradeBefore: before.grade, gradeAfter: after.grade, gradeText, changes };
}
