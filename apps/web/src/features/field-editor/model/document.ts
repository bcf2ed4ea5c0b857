import {
  accessPointNames,
  formatFeetInches,
  inspectionSchema,
  runDirectionNames,
  type AccessPoint,
  type Inspection,
  type Observation,
  type PipeSection,
  type Run,
} from '@underfoot/core';

/** Small, immutable edits of the inspection document; each returns a new document. */

export const newId = (): string => crypto.randomUUID();

export function addAccessPoint(doc: Inspection, kind: AccessPoint['kind'] = 'cleanout_two_way'): [Inspection, string] {
  const id = newId();
  return [{ ...doc, accessPoints: [...doc.accessPoints, { id, kind, locationNote: '', offsetFromBuilding: null }] }, id];
}

export function updateAccessPoint(doc: Inspection, id: string, patch: Partial<AccessPoint>): Inspection {
  return { ...doc, accessPoints: doc.accessPoints.map((a) => (a.id === id ? { ...a, ...patch } : a)) };
}

export function removeAccessPoint(doc: Inspection, id: string): Inspection {
  return { ...doc, accessPoints: doc.accessPoints.filter((a) => a.id !== id) };
}

export function addRun(doc: Inspection, accessPointId: string): [Inspection, string] {
  const id = newId();
  const run: Run = {
    id,
    accessPointId,
    direction: doc.runs.some((r) => r.accessPointId === accessPointId && r.direction === 'toward_main') ? 'toward_building' : 'toward_main',
    distanceReached: 0,
    endReason: 'reached_main',
    endNote: '',
    videoFileId: null,
    videoOffset: 0,
    sections: [],
    observations: [],
    depthReadings: [],
    surfaces: [],
  };
  if (run.direction === 'toward_building') run.endReason = 'reached_building';
  return [{ ...doc, runs: [...doc.runs, run] }, id];
}

export function updateRun(doc: Inspection, runId: string, update: (run: Run) => Run): Inspection {
  return { ...doc, runs: doc.runs.map((r) => (r.id === runId ? update(r) : r)) };
}

export function removeRun(doc: Inspection, runId: string): Inspection {
  return { ...doc, runs: doc.runs.filter((r) => r.id !== runId) };
}

const byFootage = <T extends { at: number }>(a: T, b: T) => a.at - b.at;
const byFrom = (a: PipeSection, b: PipeSection) => a.from - b.from;

export function upsertSection(run: Run, section: PipeSection): Run {
  const others = run.sections.filter((s) => s.id !== section.id);
  return { ...run, sections: [...others, section].sort(byFrom) };
}

export function removeSection(run: Run, sectionId: string): Run {
  return { ...run, sections: run.sections.filter((s) => s.id !== sectionId) };
}

export function upsertObservation(run: Run, observation: Observation): Run {
  const exists = run.observations.some((o) => o.id === observation.id);
  const observations = exists
    ? run.observations.map((o) => (o.id === observation.id ? observation : o))
    : [...run.observations, observation];
  return { ...run, observations: observations.sort(byFootage) };
}

export function removeObservation(run: Run, observationId: string): Run {
  return { ...run, observations: run.observations.filter((o) => o.id !== observationId) };
}

export function attachStill(doc: Inspection, observationId: string, stillId: string): Inspection {
  return {
    ...doc,
    runs: doc.runs.map((run) =>
      run.observations.some((o) => o.id === observationId)
        ? {
            ...run,
            observations: run.observations.map((o) =>
              o.id === observationId && !o.stillIds.includes(stillId) ? { ...o, stillIds: [...o.stillIds, stillId] } : o,
            ),
          }
        : run,
    ),
  };
}

export function detachStill(doc: Inspection, stillId: string): Inspection {
  return {
    ...doc,
    runs: doc.runs.map((run) => ({
      ...run,
      observations: run.observations.map((o) =>
        o.stillIds.includes(stillId) ? { ...o, stillIds: o.stillIds.filter((s) => s !== stillId) } : o,
      ),
    })),
  };
}

/** "Run 2 · Two-way cleanout, toward the main" */
export function runTitle(doc: Inspection, run: Run): string {
  const index = doc.runs.findIndex((r) => r.id === run.id) + 1;
  const access = doc.accessPoints.find((a) => a.id === run.accessPointId);
  return `Run ${index} · ${access ? accessPointNames[access.kind] : 'No access point'}, ${runDirectionNames[run.direction]}`;
}

export const footageText = (units: number | null | undefined) => (units === null || units === undefined ? '' : formatFeetInches(units));

/** Field problems by path ("runs.0.observations.2.at" → message), from the core schema. */
export function documentProblems(doc: Inspection): Map<string, string> {
  const result = inspectionSchema.safeParse(doc);
  const problems = new Map<string, string>();
  if (result.success) return problems;
  for (const issue of result.error.issues) {
    const path = issue.path.join('.');
    if (!problems.has(path)) problems.set(path, issue.message);
  }
  return problems;
}

/** The problems under one prefix ("runs.1."), for the card that owns them. */
export function problemsUnder(problems: Map<string, string>, prefix: string): [string, string][] {
  return [...problems.entries()].filter(([path]) => path === prefix.replace(/\.$/, '') || path.startsWith(prefix));
}

/** Seconds as m:ss (or h:mm:ss) for video times. */
export function formatVideoTime(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return '';
  const whole = Math.floor(seconds);
  const h = Math.floor(whole / 3600);
  const m = Math.floor((whole % 3600) / 60);
  const s = whole % 60;
  const tenths = Math.round((seconds - whole) * 10);
  const base = h > 0 ? `${h}:${String(m).padStart(2, '0')}:${String(s).padStart(2, '0')}` : `${m}:${String(s).padStart(2, '0')}`;
  return tenths > 0 && tenths < 10 ? `${base}.${tenths}` : base;
}

/** "1:23", "1:23.4", "83" or "83.5" → seconds; null for empty; NaN for nonsense. */
export function parseVideoTime(text: string): number | null {
  const trimmed = text.trim();
  if (trimmed === '') return null;
  if (/^\d+(\.\d+)?$/.test(trimmed)) return Number(trimmed);
  const match = /^(?:(\d+):)?(\d{1,2}):(\d{2}(?:\.\d+)?)$/.exec(trimmed);
  if (!match) return Number.NaN;
  const [, h = '0', m = '0', s = '0'] = match;
  return Number(h) * 3600 + Number(m) * 60 + Number(s);
}
