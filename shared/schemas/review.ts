/**
 * Review of a survey (issue 7 §3–§7): the reviewer's table of readings, decisions, submission,
 * sign-off and reopening, the report's data and the CSV import report.
 *
 * GET  /api/orgs/:orgId/surveys/:surveyId/review/readings   → ReviewReadingsSchema (admin, reviewer)
 * POST /api/orgs/:orgId/surveys/:surveyId/decisions          DecisionsInputSchema → DecisionsResultSchema (admin, reviewer)
 * POST /api/orgs/:orgId/surveys/:surveyId/submit             → ReviewStatusSchema (admin, reviewer, assigned surveyor)
 * POST /api/orgs/:orgId/surveys/:surveyId/sign-off           → ReviewStatusSchema (admin, reviewer)
 * POST /api/orgs/:orgId/surveys/:surveyId/reopen             ReopenInputSchema → ReviewStatusSchema (admin, reviewer)
 * GET  /api/orgs/:orgId/surveys/:surveyId/report             → SurveyReportSchema (every member)
 * GET  /api/orgs/:orgId/surveys/:surveyId/exports/readings.csv  text/csv (every member)
 * POST /api/orgs/:orgId/surveys/:surveyId/imports/readings?mode=check|all|valid  text/csv → ImportReportSchema (admin, reviewer)
 *
 * The report hash: SHA-256 (hex) of the UTF-8 bytes of canonicalJson(report.data)
 * (shared/review/canonical-json.ts, RFC 8785). `data` holds everything the report states except the
 * signature itself and the survey's state, so the hash taken at sign-off can be recomputed from the
 * report at any later time.
 */
import { z } from 'zod';
import { UuidSchema } from './common';
import { SurveyStateSchema } from './home';
import { DetectorSchema, FieldUnitSchema, FlagKindSchema, FlagStateSchema, InstrumentKindSchema, ProbeOrientationSchema, SeveritySchema, SpeciesSchema, VerdictSchema } from './vocabulary';

const isoTime = z.iso.datetime({ offset: true });

/** Most readings one bulk decision may cover. */
export const DECISIONS_MAX = 20_000;

export const ReviewDecisionSchema = z.object({
  id: UuidSchema,
  verdict: VerdictSchema,
  note: z.string().nullable(),
  reviewerUserId: UuidSchema,
  reviewerName: z.string(),
  decidedAt: isoTime,
  revision: z.number().int().min(1),
});
export type ReviewDecision = z.infer<typeof ReviewDecisionSchema>;

export const READING_KINDS = ['field_reading', 'sweep'] as const;
export const ReadingKindSchema = z.enum(READING_KINDS);
export type ReadingKind = z.infer<typeof ReadingKindSchema>;

/** One row of the review table: a field reading or a sweep with everything that vouches for it. */
export const ReviewReadingSchema = z.object({
  id: UuidSchema,
  kind: ReadingKindSchema,
  revision: z.number().int().min(1),
  stationId: UuidSchema,
  stationLabel: z.string().nullable(),
  levelId: UuidSchema,
  levelName: z.string(),
  roomId: UuidSchema.nullable(),
  roomName: z.string().nullable(),
  surveyorUserId: UuidSchema,
  surveyorName: z.string(),
  instrumentId: UuidSchema.nullable(),
  /** "model · serial" of the gaussmeter (readings) or analyser (sweeps). */
  instrumentLabel: z.string().nullable(),
  calibrationDueOn: z.iso.date().nullable(),
  /** The instrument's calibration had fallen due before the reading was taken (or no due date is known). */
  calibrationOverdue: z.boolean(),
  measuredAt: isoTime,
  /** |B| in tesla (field readings); null for sweeps. */
  fieldT: z.number().nullable(),
  /** The unit the surveyor typed (field readings). */
  enteredUnit: FieldUnitSchema.nullable(),
  /** Sweeps: span, peak count and the strongest peak. */
  sweep: z
    .object({ startHz: z.number(), stopHz: z.number(), peakCount: z.number().int(), strongestPeakDbm: z.number().nullable() })
    .nullable(),
  /** Safety class of |B| against the survey's zone set: the index of the highest threshold reached (−1 below all) and its name. */
  safetyClass: z.object({ index: z.number().int(), label: z.string() }).nullable(),
  notes: z.string().nullable(),
  /** An open sync conflict exists for the record. */
  conflicted: z.boolean(),
  /** The record names a photo or trace that has not reached the server. */
  attachmentPending: z.boolean(),
  decision: ReviewDecisionSchema.nullable(),
});
export type ReviewReading = z.infer<typeof ReviewReadingSchema>;

export const SIGN_OFF_BLOCKERS = ['not_submitted', 'undecided', 'remeasure', 'open_conflicts', 'no_readings', 'signed_off'] as const;
export const SignOffBlockerSchema = z.object({ code: z.enum(SIGN_OFF_BLOCKERS), message: z.string(), count: z.number().int().min(0) });
export type SignOffBlocker = z.infer<typeof SignOffBlockerSchema>;

const personRef = z.object({ userId: UuidSchema, name: z.string() }).nullable();

/** Where a survey stands in review, and why it cannot be signed off yet. */
export const ReviewStatusSchema = z.object({
  surveyId: UuidSchema,
  name: z.string(),
  siteName: z.string(),
  state: SurveyStateSchema,
  revision: z.number().int().min(1),
  submittedAt: isoTime.nullable(),
  submittedBy: personRef,
  signedOffAt: isoTime.nullable(),
  signedOffBy: personRef,
  reportSha256: z.string().nullable(),
  /** Empty when a reviewer may sign off now. */
  signOffBlockers: z.array(SignOffBlockerSchema),
  openConflicts: z.number().int().min(0),
  /** Who was e-mailed by the call that answered (submit, sign-off). */
  mailed: z.array(z.string()).optional(),
});
export type ReviewStatus = z.infer<typeof ReviewStatusSchema>;

export const ReviewReadingsSchema = z.object({
  status: ReviewStatusSchema,
  zoneSet: z.object({ name: z.string(), edition: z.string(), thresholds: z.array(z.object({ name: z.string(), fieldT: z.number() })) }).nullable(),
  readings: z.array(ReviewReadingSchema),
});
export type ReviewReadings = z.infer<typeof ReviewReadingsSchema>;

export const DecisionsInputSchema = z
  .object({
    /** Field reading and/or sweep ids of this survey. */
    readingIds: z.array(UuidSchema).min(1, 'Pick at least one reading.').max(DECISIONS_MAX),
    verdict: VerdictSchema,
    /** Required for remeasure (what to do) and rejected (why). */
    note: z.string().trim().max(2000).optional(),
  })
  .superRefine((input, ctx) => {
    if (input.verdict !== 'accepted' && !input.note) {
      ctx.addIssue({
        code: 'custom',
        path: ['note'],
        message: input.verdict === 'remeasure' ? 'Say what to re-measure (the surveyor sees this at the station).' : 'Give the reason for rejecting.',
      });
    }
  });
export type DecisionsInput = z.infer<typeof DecisionsInputSchema>;

export const DecisionsResultSchema = z.object({
  decided: z.number().int(),
  /** Readings whose live decision already said exactly this (left alone). */
  unchanged: z.number().int(),
  decisions: z.array(z.object({ id: UuidSchema, readingId: UuidSchema, verdict: VerdictSchema, revision: z.number().int() })),
  /** Surveyors e-mailed about re-measure requests. */
  mailed: z.array(z.string()),
});

export const ReopenInputSchema = z.object({ reason: z.string().trim().min(1, 'Say why the survey is reopened (it is kept in the audit log).').max(2000) });

// ------------------------------------------------------------------------------------------ report

const reportDecision = z
  .object({ id: UuidSchema, verdict: VerdictSchema, note: z.string().nullable(), reviewerUserId: UuidSchema, decidedAt: isoTime })
  .nullable();

export const CALIBRATION_STATES = ['in_date', 'overdue', 'unknown'] as const;

/** Everything the report states; its canonical JSON is what the sign-off hash covers. */
export const ReportDataSchema = z.object({
  hashScheme: z.literal('fringewalk-report-v1: SHA-256 of RFC 8785 canonical JSON of data'),
  survey: z.object({
    id: UuidSchema,
    name: z.string(),
    startsOn: z.string().nullable(),
    endsOn: z.string().nullable(),
    notes: z.string().nullable(),
    species: z.array(SpeciesSchema),
    maxHarmonic: z.number().int(),
    repeatRadiusM: z.number(),
  }),
  site: z.object({ id: UuidSchema, name: z.string(), address: z.string().nullable() }),
  zoneSet: z.object({ id: UuidSchema, name: z.string(), edition: z.string(), thresholds: z.array(z.object({ name: z.string(), fieldT: z.number(), caution: z.string() })) }).nullable(),
  levels: z.array(z.object({ id: UuidSchema, name: z.string() })),
  rooms: z.array(z.object({ id: UuidSchema, name: z.string(), levelId: UuidSchema, highestClass: z.object({ index: z.number().int(), label: z.string() }).nullable(), maxFieldT: z.number().nullable() })),
  people: z.array(z.object({ userId: UuidSchema, name: z.string(), email: z.string() })),
  instruments: z.array(
    z.object({
      id: UuidSchema,
      kind: InstrumentKindSchema,
      model: z.string(),
      serial: z.string(),
      probe: z.string().nullable(),
      calibratedOn: z.string().nullable(),
      calibrationDueOn: z.string().nullable(),
      calibrationCertificate: z.string().nullable(),
      relativeUncertainty: z.number().nullable(),
      /** Against the last reading it took in this survey. */
      calibration: z.enum(CALIBRATION_STATES),
      readingCount: z.number().int(),
    }),
  ),
  method: z.object({
    fieldReadingCount: z.number().int(),
    sweepCount: z.number().int(),
    stationCount: z.number().int(),
    probeOrientations: z.array(ProbeOrientationSchema),
    enteredUnits: z.array(FieldUnitSchema),
    firstMeasuredAt: isoTime.nullable(),
    lastMeasuredAt: isoTime.nullable(),
    zeroedCount: z.number().int(),
  }),
  stations: z.array(z.object({ id: UuidSchema, label: z.string().nullable(), levelId: UuidSchema, roomId: UuidSchema.nullable(), xM: z.number(), yM: z.number(), heightM: z.number() })),
  readings: z.array(
    z.object({
      id: UuidSchema,
      revision: z.number().int(),
      stationId: UuidSchema,
      surveyorUserId: UuidSchema,
      instrumentId: UuidSchema.nullable(),
      measuredAt: isoTime,
      fieldT: z.number(),
      magnitudeT: z.number().nullable(),
      bxT: z.number().nullable(),
      byT: z.number().nullable(),
      bzT: z.number().nullable(),
      unit: FieldUnitSchema,
      probeOrientation: ProbeOrientationSchema,
      heightM: z.number(),
      backgroundT: z.number().nullable(),
      zeroed: z.boolean(),
      notes: z.string().nullable(),
      safetyClass: z.object({ index: z.number().int(), label: z.string() }).nullable(),
      decision: reportDecision,
    }),
  ),
  sweeps: z.array(
    z.object({
      id: UuidSchema,
      revision: z.number().int(),
      stationId: UuidSchema,
      surveyorUserId: UuidSchema,
      analyserId: UuidSchema.nullable(),
      antennaId: UuidSchema.nullable(),
      measuredAt: isoTime,
      startHz: z.number(),
      stopHz: z.number(),
      rbwHz: z.number(),
      detector: DetectorSchema,
      peaks: z.array(z.object({ frequencyHz: z.number(), levelDbm: z.number() })),
      notes: z.string().nullable(),
      decision: reportDecision,
    }),
  ),
  flags: z.array(
    z.object({
      id: UuidSchema,
      kind: FlagKindSchema,
      state: FlagStateSchema,
      severity: SeveritySchema,
      roomId: UuidSchema.nullable(),
      stationId: UuidSchema.nullable(),
      species: SpeciesSchema.nullable(),
      harmonic: z.number().int().nullable(),
      details: z.record(z.string(), z.unknown()),
      acknowledgementNote: z.string().nullable(),
      resolution: z.string().nullable(),
    }),
  ),
  submitted: z.object({ at: isoTime, byUserId: UuidSchema }).nullable(),
  /** The cautions printed with every report (DESIGN.md §6). */
  cautions: z.array(z.string()),
});
export type ReportData = z.infer<typeof ReportDataSchema>;

export const SurveyReportSchema = z.object({
  status: ReviewStatusSchema,
  data: ReportDataSchema,
  /** The hash of `data` as it is now; equals status.reportSha256 while nothing has changed since sign-off. */
  dataSha256: z.string().regex(/^[0-9a-f]{64}$/),
});
export type SurveyReport = z.infer<typeof SurveyReportSchema>;

// -------------------------------------------------------------------------------------- CSV import

export const IMPORT_MODES = ['check', 'all', 'valid'] as const;
export const ImportQuerySchema = z.object({
  /** check: report only; all: import only if every row is good; valid: import the good rows, skip the bad. */
  mode: z.enum(IMPORT_MODES).default('check'),
});

export const ImportRowErrorSchema = z.object({ row: z.number().int(), column: z.string().nullable(), message: z.string() });

export const ImportReportSchema = z.object({
  mode: z.enum(IMPORT_MODES),
  rows: z.number().int(),
  goodRows: z.number().int(),
  badRows: z.number().int(),
  /** One entry per problem; `row` counts data rows from 1 (the header is row 0). */
  errors: z.array(ImportRowErrorSchema),
  committed: z.boolean(),
  importedReadings: z.number().int(),
  createdStations: z.number().int(),
});
export type ImportReport = z.infer<typeof ImportReportSchema>;
