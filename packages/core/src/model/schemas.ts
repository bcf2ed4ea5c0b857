import { z } from 'zod';
import { MAX_FOOTAGE, formatFeetInches, parseFootage } from '../footage/footage.ts';
import {
  accessPointKinds,
  bendAngles,
  branchFittings,
  defectKinds,
  kindInfo,
  materials,
  propertyTypes,
  runDirections,
  runEndReasons,
  sizeChangeFittings,
  surfaceKinds,
} from './kinds.ts';
import { suggestSeverity } from './severity-guide.ts';

/** Record ids are strings (the server uses UUIDs). */
export const idSchema = z
  .string({ error: 'An id is required.' })
  .trim()
  .min(1, 'An id is required.')
  .max(64, 'Ids are at most 64 characters.');

/** A stored distance: integer tenths of a millimetre (see footage.ts). */
export const footageSchema = z
  .int({ error: 'A distance is a whole number of tenths of a millimetre.' })
  .min(0, 'A distance cannot be negative.')
  .max(MAX_FOOTAGE, 'That distance is longer than any camera run.');

/** A distance typed by a person (`52' 7"`, `16 m`…), parsed to the stored unit with a readable error. */
export const footageTextSchema = z.string({ error: 'Enter a distance.' }).transform((text, ctx) => {
  const result = parseFootage(text);
  if (!result.ok) {
    ctx.addIssue({ code: 'custom', message: result.error, input: text });
    return z.NEVER;
  }
  return result.value;
});

/** Nominal pipe size in inches (e.g. 3, 4, 6). */
export const diameterSchema = z
  .number({ error: 'Enter the pipe size in inches.' })
  .positive('Pipe size must be more than 0 in.')
  .max(48, 'Pipe size is at most 48 in.')
  .refine((value) => Number.isInteger(value * 4), 'Give the size to the nearest quarter inch (e.g. 4 or 2.5).');

const noteSchema = z.string().trim().max(2000, 'Keep notes under 2,000 characters.').default('');

const severitySchema = z
  .int({ error: 'Choose a severity from 1 to 5.' })
  .min(1, 'Choose a severity from 1 to 5.')
  .max(5, 'Choose a severity from 1 to 5.');

const clockSchema = z
  .int({ error: 'A clock position is a whole hour from 1 to 12.' })
  .min(1, 'A clock position is from 1 to 12.')
  .max(12, 'A clock position is from 1 to 12.');

export const materialSchema = z.enum(materials, { error: 'Choose a pipe material.' });
export const runEndReasonSchema = z.enum(runEndReasons, { error: 'Choose why the run ended.' });

// ---------- property and access ----------

export const propertySchema = z.object({
  yearBuilt: z
    .int({ error: 'Enter the year built as a number, like 1962.' })
    .min(1800, 'Year built must be 1800 or later.')
    .max(2100, 'Year built looks wrong.')
    .nullable()
    .default(null),
  type: z.enum(propertyTypes, { error: 'Choose a property type.' }).default('single_family'),
  notes: noteSchema,
});
export type Property = z.output<typeof propertySchema>;
export type PropertyInput = z.input<typeof propertySchema>;

export const accessPointSchema = z.object({
  id: idSchema,
  kind: z.enum(accessPointKinds, { error: 'Choose the kind of access point.' }),
  locationNote: z.string().trim().max(200, 'Keep the location under 200 characters.').default(''),
  /** Distance along the line from the building wall, if known; otherwise derived from the runs. */
  offsetFromBuilding: footageSchema.nullable().default(null),
});
export type AccessPoint = z.output<typeof accessPointSchema>;
export type AccessPointInput = z.input<typeof accessPointSchema>;

// ---------- sections, readings, surfaces ----------

export const pipeSectionSchema = z
  .object({
    id: idSchema,
    from: footageSchema,
    to: footageSchema,
    material: materialSchema,
    diameterIn: diameterSchema,
  })
  .refine((section) => section.to > section.from, {
    error: 'A pipe section must end further along than it starts.',
    path: ['to'],
  });
export type PipeSection = z.output<typeof pipeSectionSchema>;
export type PipeSectionInput = z.input<typeof pipeSectionSchema>;

export const depthReadingSchema = z.object({
  at: footageSchema,
  /** Depth from the ground surface to the pipe, same unit as footage. */
  depth: footageSchema,
  /**
   * Height of the ground at this reading relative to any fixed mark, same unit
   * (signed). Without it the ground is taken as level between readings.
   */
  surfaceElevation: z
    .int({ error: 'Ground height is a whole number of tenths of a millimetre.' })
    .min(-MAX_FOOTAGE)
    .max(MAX_FOOTAGE)
    .nullable()
    .default(null),
});
export type DepthReading = z.output<typeof depthReadingSchema>;
export type DepthReadingInput = z.input<typeof depthReadingSchema>;

export const surfaceSegmentSchema = z
  .object({
    from: footageSchema,
    to: footageSchema,
    surface: z.enum(surfaceKinds, { error: 'Choose what is above the pipe.' }),
  })
  .refine((segment) => segment.to > segment.from, { error: 'A stretch must end after it starts.', path: ['to'] });
export type SurfaceSegment = z.output<typeof surfaceSegmentSchema>;

// ---------- observations ----------

const observationBase = {
  id: idSchema,
  at: footageSchema,
  note: noteSchema,
  /** Seconds into the run's video. */
  videoTime: z.number().min(0, 'Video time cannot be negative.').max(86_400).nullable().default(null),
  stillIds: z.array(idSchema).max(50, 'At most 50 stills per observation.').default([]),
};

export const defectObservationSchema = z
  .object({
    ...observationBase,
    kind: z.enum(defectKinds),
    severity: severitySchema,
    /** End of a continuous defect (its extent runs from `at` to `to`). */
    to: footageSchema.nullable().default(null),
    clock: clockSchema.nullable().default(null),
    /** A measured share in percent, when the severity guide gives a measure for this kind. */
    measurePercent: z.number().min(0).max(100).nullable().default(null),
    /** Why the severity differs from the guide's suggestion for the measure. */
    severityReason: z.string().trim().max(500).default(''),
  })
  .superRefine((obs, ctx) => {
    if (obs.to !== null && obs.to < obs.at) {
      ctx.addIssue({ code: 'custom', message: 'The end of the defect must be at or after its start.', path: ['to'] });
    }
    if (obs.measurePercent !== null) {
      const suggested = suggestSeverity(obs.kind, obs.measurePercent);
      if (suggested === null) {
        ctx.addIssue({
          code: 'custom',
          message: `${kindInfo[obs.kind].name} has no measure in the severity guide; leave the measure empty.`,
          path: ['measurePercent'],
        });
      } else if (suggested !== obs.severity && obs.severityReason.length < 5) {
        ctx.addIssue({
          code: 'custom',
          message: `The guide suggests severity ${suggested} for ${obs.measurePercent}%. Say why you chose ${obs.severity}.`,
          path: ['severityReason'],
        });
      }
    }
  });

export const bendObservationSchema = z.object({
  ...observationBase,
  kind: z.literal('bend'),
  angle: z.enum(bendAngles, { error: 'Choose the bend angle.' }),
});

export const branchObservationSchema = z.object({
  ...observationBase,
  kind: z.literal('branch'),
  fitting: z.enum(branchFittings).default('unknown'),
  clock: clockSchema.nullable().default(null),
});

export const materialChangeObservationSchema = z.object({
  ...observationBase,
  kind: z.literal('material_change'),
  /** Material on the access-point side (lower footage). */
  fromMaterial: materialSchema,
  /** Material beyond it (higher footage). */
  toMaterial: materialSchema,
});

export const sizeChangeObservationSchema = z.object({
  ...observationBase,
  kind: z.literal('size_change'),
  /** Size on the access-point side (lower footage), in inches. */
  fromSize: diameterSchema,
  /** Size beyond it (higher footage), in inches. */
  toSize: diameterSchema,
  fitting: z.enum(sizeChangeFittings).default('unknown'),
});

export const cleanoutObservationSchema = z.object({ ...observationBase, kind: z.literal('cleanout') });
export const mainConnectionObservationSchema = z.object({ ...observationBase, kind: z.literal('main_connection') });
export const runEndObservationSchema = z.object({
  ...observationBase,
  kind: z.literal('run_end'),
  reason: runEndReasonSchema,
});

export const observationSchema = z.discriminatedUnion(
  'kind',
  [
    defectObservationSchema,
    bendObservationSchema,
    branchObservationSchema,
    materialChangeObservationSchema,
    sizeChangeObservationSchema,
    cleanoutObservationSchema,
    mainConnectionObservationSchema,
    runEndObservationSchema,
  ],
  { error: 'Choose what was observed.' },
);
export type Observation = z.output<typeof observationSchema>;
export type ObservationInput = z.input<typeof observationSchema>;
export type DefectObservation = z.output<typeof defectObservationSchema>;
export type FeatureObservation = Exclude<Observation, DefectObservation>;

export const isDefect = (obs: Observation): obs is DefectObservation => 'severity' in obs;

// ---------- run ----------

export const runSchema = z
  .object({
    id: idSchema,
    accessPointId: idSchema,
    direction: z.enum(runDirections, { error: 'Choose the direction of the run.' }),
    distanceReached: footageSchema,
    endReason: runEndReasonSchema,
    endNote: noteSchema,
    videoFileId: idSchema.nullable().default(null),
    /** Seconds into the video file where this run starts. */
    videoOffset: z.number().min(0).max(86_400).default(0),
    sections: z.array(pipeSectionSchema).max(200).default([]),
    observations: z.array(observationSchema).max(5000).default([]),
    depthReadings: z.array(depthReadingSchema).max(500).default([]),
    surfaces: z.array(surfaceSegmentSchema).max(200).default([]),
  })
  .superRefine((run, ctx) => {
    const sorted = run.sections.map((s, index) => ({ s, index })).sort((a, b) => a.s.from - b.s.from);
    for (let i = 1; i < sorted.length; i += 1) {
      const previous = sorted[i - 1];
      const current = sorted[i];
      if (previous && current && current.s.from < previous.s.to) {
        ctx.addIssue({
          code: 'custom',
          message: `Pipe sections overlap at ${formatFeetInches(current.s.from)}.`,
          path: ['sections', current.index, 'from'],
        });
      }
    }
    run.sections.forEach((section, index) => {
      if (section.to > run.distanceReached) {
        ctx.addIssue({
          code: 'custom',
          message: `This section ends at ${formatFeetInches(section.to)}, past the distance reached (${formatFeetInches(run.distanceReached)}).`,
          path: ['sections', index, 'to'],
        });
      }
    });
    run.observations.forEach((obs, index) => {
      const end = 'to' in obs && obs.to !== null ? obs.to : obs.at;
      if (end > run.distanceReached) {
        ctx.addIssue({
          code: 'custom',
          message: `This observation is at ${formatFeetInches(end)}, past the distance reached (${formatFeetInches(run.distanceReached)}).`,
          path: ['observations', index, 'at'],
        });
      }
    });
    const readingAt = new Set<number>();
    run.depthReadings.forEach((reading, index) => {
      if (readingAt.has(reading.at)) {
        ctx.addIssue({
          code: 'custom',
          message: `Two depth readings at ${formatFeetInches(reading.at)}.`,
          path: ['depthReadings', index, 'at'],
        });
      }
      readingAt.add(reading.at);
    });
  });
export type Run = z.output<typeof runSchema>;
export type RunInput = z.input<typeof runSchema>;

// ---------- grade override ----------

export const gradeLevels = ['clear', 'maintain', 'plan_repair', 'repair_now', 'failing'] as const;
export type GradeLevel = (typeof gradeLevels)[number];

export const gradeOverrideSchema = z.object({
  level: z.enum(gradeLevels, { error: 'Choose a grade.' }),
  reason: z
    .string({ error: 'Say why you changed the grade.' })
    .trim()
    .min(10, 'Say why you changed the grade (at least 10 characters).')
    .max(1000, 'Keep the reason under 1,000 characters.'),
});
export type GradeOverride = z.output<typeof gradeOverrideSchema>;

// ---------- the assembled inspection ----------

export const inspectionSchema = z
  .object({
    id: idSchema,
    property: propertySchema,
    accessPoints: z.array(accessPointSchema).max(20).default([]),
    runs: z.array(runSchema).max(40).default([]),
    /** Conditions looked for and not seen, shown to buyers. */
    checkedNotFound: z.array(z.enum(defectKinds)).max(defectKinds.length).default([]),
    gradeOverride: gradeOverrideSchema.nullable().default(null),
  })
  .superRefine((inspection, ctx) => {
    const accessIds = new Set(inspection.accessPoints.map((a) => a.id));
    inspection.runs.forEach((run, index) => {
      if (!accessIds.has(run.accessPointId)) {
        ctx.addIssue({
          code: 'custom',
          message: 'This run starts from an access point that is not in the inspection.',
          path: ['runs', index, 'accessPointId'],
        });
      }
    });
    const seen = new Set<string>();
    inspection.runs.forEach((run, runIndex) => {
      run.observations.forEach((obs, obsIndex) => {
        if (seen.has(obs.id)) {
          ctx.addIssue({
            code: 'custom',
            message: 'Two observations share one id.',
            path: ['runs', runIndex, 'observations', obsIndex, 'id'],
          });
        }
        seen.add(obs.id);
      });
    });
    if (new Set(inspection.checkedNotFound).size !== inspection.checkedNotFound.length) {
      ctx.addIssue({ code: 'custom', message: 'A condition is listed twice.', path: ['checkedNotFound'] });
    }
  });
export type Inspection = z.output<typeof inspectionSchema>;
export type InspectionInput = z.input<typeof inspectionSchema>;
