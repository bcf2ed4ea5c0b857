import { featureKinds, kindInfo, type Inspection, type ObservationKind } from '@underfoot/core';
import type { FieldError } from '../../http/errors.ts';
import type { MediaKind } from '../media/media.repo.ts';

const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === 'object' && value !== null && !Array.isArray(value);
const isFeatureKind = (kind: unknown): kind is (typeof featureKinds)[number] =>
  typeof kind === 'string' && (featureKinds as readonly string[]).includes(kind);

/**
 * Rules on the raw input that the core schema cannot see: its objects drop unknown
 * keys, so a severity sent on a bend would vanish silently instead of being refused.
 */
export function rawDocumentProblems(raw: unknown, prefix: string): FieldError[] {
  const problems: FieldError[] = [];
  if (!isRecord(raw) || !Array.isArray(raw.runs)) return problems;
  raw.runs.forEach((run, runIndex) => {
    if (!isRecord(run) || !Array.isArray(run.observations)) return;
    run.observations.forEach((obs, obsIndex) => {
      if (!isRecord(obs) || !isFeatureKind(obs.kind)) return;
      for (const field of ['severity', 'measurePercent', 'severityReason'] as const) {
        if (obs[field] !== undefined && obs[field] !== null && obs[field] !== '') {
          problems.push({
            path: `${prefix}runs.${runIndex}.observations.${obsIndex}.${field}`,
            message: `${kindInfo[obs.kind as ObservationKind].name} is a feature of the line, not a defect: it has no severity.`,
          });
        }
      }
    });
  });
  return problems;
}

/** Every file the document points at must be a file of this order, of the right kind. */
export function mediaReferenceProblems(document: Inspection, kinds: Map<string, MediaKind>, prefix: string): FieldError[] {
  const problems: FieldError[] = [];
  document.runs.forEach((run, runIndex) => {
    if (run.videoFileId !== null && kinds.get(run.videoFileId) !== 'video') {
      problems.push({
        path: `${prefix}runs.${runIndex}.videoFileId`,
        message: 'This video is not one of the files uploaded for this job.',
      });
    }
    run.observations.forEach((obs, obsIndex) => {
      obs.stillIds.forEach((stillId, stillIndex) => {
        if (kinds.get(stillId) !== 'still') {
          problems.push({
            path: `${prefix}runs.${runIndex}.observations.${obsIndex}.stillIds.${stillIndex}`,
            message: 'This still is not one of the pictures uploaded for this job.',
          });
        }
      });
    });
  });
  return problems;
}

export function referencedMediaIds(document: Inspection): string[] {
  const ids: string[] = [];
  for (const run of document.runs) {
    if (run.videoFileId) ids.push(run.videoFileId);
    for (const obs of run.observations) ids.push(...obs.stillIds);
  }
  return ids;
}
