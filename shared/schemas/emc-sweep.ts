/**
 * Sweeps explained (issue 8 §4): the list of a survey's sweeps with how many of their peak markers the
 * predicted lines explain, and one sweep with its lines, watch bands, peaks (markers and trace peaks,
 * each matched or not) and its trace thinned for display. Frequencies in Hz, levels in dBm, fields in T.
 */
import { z } from 'zod';
import { UuidSchema } from './common';
import { DetectorSchema, SeveritySchema, SpeciesSchema } from './vocabulary';

export const SweepParamsSchema = z.object({ orgId: UuidSchema, surveyId: UuidSchema, sweepId: UuidSchema });

export const SweepPlaceSchema = z.object({
  station: z.object({ id: UuidSchema, label: z.string().nullable() }),
  room: z.object({ id: UuidSchema, name: z.string() }).nullable(),
});

export const PeakCountsSchema = z.object({ explained: z.number().int(), unexplained: z.number().int() });

export const SweepSummarySchema = SweepPlaceSchema.extend({
  id: UuidSchema,
  measuredAt: z.string(),
  startHz: z.number(),
  stopHz: z.number(),
  rbwHz: z.number(),
  detector: DetectorSchema,
  /** Peak markers matched against the predicted lines (trace peaks are counted on the sweep itself). */
  markerCounts: PeakCountsSchema,
  hasTrace: z.boolean(),
});
export type SweepSummary = z.infer<typeof SweepSummarySchema>;
export const SweepListSchema = z.object({ sweeps: z.array(SweepSummarySchema) });

export const FIELD_BASES = ['room', 'station'] as const;
export const FieldIntervalSchema = z.object({
  /** Widened by each reading's expanded gaussmeter uncertainty. */
  lowT: z.number(),
  highT: z.number(),
  /** Readings behind it and where they were taken: the sweep's station, or its room when the station has none. */
  basis: z.enum(FIELD_BASES),
  readings: z.number().int(),
  /** True while the survey is open: readings not yet reviewed count too (rejected ones never). */
  includesUnreviewed: z.boolean(),
  note: z.string(),
});
export type FieldInterval = z.infer<typeof FieldIntervalSchema>;

export const PredictedLineSchema = z.object({
  species: SpeciesSchema,
  harmonic: z.number().int(),
  lowHz: z.number(),
  highHz: z.number(),
});
export type PredictedLineWire = z.infer<typeof PredictedLineSchema>;

export const LineMatchSchema = PredictedLineSchema.extend({ distanceHz: z.number() });

export const ExplainedPeakSchema = z.object({
  frequencyHz: z.number(),
  levelDbm: z.number(),
  source: z.enum(['marker', 'trace']),
  toleranceHz: z.number(),
  status: z.enum(['explained', 'unexplained']),
  explainedBy: LineMatchSchema.nullable(),
  alsoWithin: z.array(LineMatchSchema),
  label: z.string(),
});
export type ExplainedPeakWire = z.infer<typeof ExplainedPeakSchema>;

export const SweepWatchBandSchema = z.object({
  id: UuidSchema,
  name: z.string(),
  lowerHz: z.number(),
  upperHz: z.number(),
  severity: SeveritySchema,
  siteId: UuidSchema.nullable(),
});
export type SweepWatchBand = z.infer<typeof SweepWatchBandSchema>;

export const TRACE_STATUSES = ['shown', 'none', 'pending', 'unavailable', 'unreadable'] as const;
export const SweepTraceSchema = z.object({
  status: z.enum(TRACE_STATUSES),
  /** Why there is no trace to show, for people. */
  reason: z.string().nullable(),
  /** Thinned for display (≤ 2,000 points, lowest and highest of each bucket kept). */
  points: z.object({ frequencyHz: z.array(z.number()), levelDbm: z.array(z.number()) }).nullable(),
  totalPoints: z.number().int().nullable(),
  noiseFloorDbm: z.number().nullable(),
  thresholdDbm: z.number().nullable(),
});
export type SweepTrace = z.infer<typeof SweepTraceSchema>;

export const SweepExplainedSchema = z.object({
  sweep: SweepPlaceSchema.extend({
    id: UuidSchema,
    surveyId: UuidSchema,
    measuredAt: z.string(),
    startHz: z.number(),
    stopHz: z.number(),
    rbwHz: z.number(),
    vbwHz: z.number().nullable(),
    referenceLevelDbm: z.number(),
    attenuationDb: z.number().nullable(),
    detector: DetectorSchema,
    notes: z.string().nullable(),
    analyser: z.object({ id: UuidSchema, model: z.string(), serial: z.string() }).nullable(),
  }),
  /** Null when no reading gives a field (no line can be predicted; every peak is unexplained). */
  fieldInterval: FieldIntervalSchema.nullable(),
  /** The analyser's relative frequency accuracy used, and where it came from. */
  frequencyAccuracy: z.object({ relative: z.number(), source: z.string() }),
  /** Lines of the survey's species and harmonics; `inSpan` says whether they touch the sweep's span. */
  lines: z.array(PredictedLineSchema.extend({ inSpan: z.boolean() })),
  watchBands: z.array(SweepWatchBandSchema),
  peaks: z.array(ExplainedPeakSchema),
  trace: SweepTraceSchema,
  peakRule: z.string(),
});
export type SweepExplained = z.infer<typeof SweepExplainedSchema>;
