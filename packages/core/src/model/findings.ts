import { formatFootage, type Footage, type UnitSystem } from '../footage/footage.ts';
import { accessPointNames, kindInfo, runDirectionNames, type KindGroup } from './kinds.ts';
import { isDefect, type AccessPoint, type DefectObservation, type Inspection, type Run } from './schemas.ts';

/** A defect observation with the run it was seen on: what the computations work with. */
export interface Finding {
  observation: DefectObservation;
  run: Run;
  accessPoint: AccessPoint | null;
  group: Exclude<KindGroup, 'feature'>;
  /** Start and end footage of the defect (equal for a spot defect). */
  start: Footage;
  end: Footage;
}

export function collectFindings(inspection: Inspection): Finding[] {
  const accessById = new Map(inspection.accessPoints.map((a) => [a.id, a]));
  const findings: Finding[] = [];
  for (const run of inspection.runs) {
    const accessPoint = accessById.get(run.accessPointId) ?? null;
    for (const observation of run.observations) {
      if (!isDefect(observation)) continue;
      const group = kindInfo[observation.kind].group;
      if (group === 'feature') continue;
      findings.push({
        observation,
        run,
        accessPoint,
        group,
        start: observation.at,
        end: observation.to ?? observation.at,
      });
    }
  }
  return findings;
}

export function accessPointLabel(accessPoint: AccessPoint | null): string {
  if (!accessPoint) return 'an access point';
  const name = accessPointNames[accessPoint.kind].toLowerCase();
  return accessPoint.locationNote ? `the ${name} (${accessPoint.locationNote})` : `the ${name}`;
}

const runLabels = new WeakMap<Run, { accessPoint: AccessPoint | null; label: string }>();

/** "toward the main from the two-way cleanout (front yard)" (cached per run and access point object; parsed data is not mutated) */
export function runLabel(run: Run, accessPoint: AccessPoint | null): string {
  const cached = runLabels.get(run);
  if (cached && cached.accessPoint === accessPoint) return cached.label;
  const label = `${runDirectionNames[run.direction]} from ${accessPointLabel(accessPoint)}`;
  runLabels.set(run, { accessPoint, label });
  return label;
}

/** "Open crack, severity 4, at 23' 4" toward the main from the two-way cleanout" */
export function describeFinding(finding: Finding, units: UnitSystem = 'imperial'): string {
  const { observation } = finding;
  const where =
    finding.end > finding.start
      ? `from ${formatFootage(finding.start, units)} to ${formatFootage(finding.end, units)}`
      : `at ${formatFootage(finding.start, units)}`;
  return `${kindInfo[observation.kind].name}, severity ${observation.severity}, ${where} ${runLabel(finding.run, finding.accessPoint)}`;
}
