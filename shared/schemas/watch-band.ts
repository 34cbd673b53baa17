/** Watch bands (issue 8 §1): the frequency ranges an organisation protects from predicted cyclotron lines. */
import { z } from 'zod';
import { UuidSchema } from './common';
import { SeveritySchema } from './vocabulary';

const hz = z.number().refine(Number.isFinite, 'Must be a finite number.').min(0, 'A frequency cannot be negative.').max(1e13, 'Give the frequency in hertz (at most 10 THz).');
const edgesInOrder = (v: { lowerHz?: number; upperHz?: number }) => v.lowerHz === undefined || v.upperHz === undefined || v.lowerHz < v.upperHz;
const EDGE_ORDER = { message: 'The upper edge must be above the lower edge.', path: ['upperHz'] };

const fields = {
  name: z.string().trim().min(1, 'Give the band a name.').max(200),
  lowerHz: hz,
  upperHz: hz,
  reason: z.string().trim().min(1, 'Say why the band is protected.').max(1000),
  source: z.string().trim().min(1, 'Name where the edges come from (or say they are recalled).').max(1000),
  severity: SeveritySchema.default('medium'),
  /** Harmful-interference threshold at the receiver, dB(W/(m²·Hz)). */
  thresholdDbWPerM2Hz: z.number().refine(Number.isFinite, 'Must be a finite number.').min(-400).max(100).nullable().optional(),
  /** Set for a band of one site (a scanner's receive band); null for the whole organisation. */
  siteId: UuidSchema.nullable().optional(),
  notes: z.string().trim().max(5000).nullable().optional(),
};

export const WatchBandCreateSchema = z.object(fields).refine(edgesInOrder, EDGE_ORDER);
export type WatchBandCreate = z.infer<typeof WatchBandCreateSchema>;

export const WatchBandUpdateSchema = z
  .object({
    name: fields.name.optional(),
    lowerHz: hz.optional(),
    upperHz: hz.optional(),
    reason: fields.reason.optional(),
    source: fields.source.optional(),
    severity: SeveritySchema.optional(),
    thresholdDbWPerM2Hz: fields.thresholdDbWPerM2Hz,
    notes: fields.notes,
  })
  .refine(edgesInOrder, EDGE_ORDER);
export type WatchBandUpdate = z.infer<typeof WatchBandUpdateSchema>;

export const WatchBandSchema = z.object({
  id: UuidSchema,
  siteId: UuidSchema.nullable(),
  siteName: z.string().nullable(),
  name: z.string(),
  lowerHz: z.number(),
  upperHz: z.number(),
  reason: z.string(),
  source: z.string(),
  severity: SeveritySchema,
  thresholdDbWPerM2Hz: z.number().nullable(),
  starter: z.boolean(),
  notes: z.string().nullable(),
  revision: z.number().int(),
  updatedAt: z.string(),
});
export type WatchBand = z.infer<typeof WatchBandSchema>;
export const WatchBandListSchema = z.object({ watchBands: z.array(WatchBandSchema) });

export const WatchBandParamsSchema = z.object({ orgId: UuidSchema, watchBandId: UuidSchema });

/** What "add the starter set" did: the bands it added, and how many were there already. */
export const StarterSetResultSchema = z.object({ added: z.array(WatchBandSchema), alreadyPresent: z.number().int() });

/** A scanner's receive band offered for a site, from each MRI magnet's nominal field. */
export const MriBandSuggestionSchema = z.object({
  sourceId: UuidSchema,
  sourceName: z.string(),
  nominalFieldT: z.number(),
  band: z.object({ name: z.string(), lowerHz: z.number(), upperHz: z.number(), reason: z.string(), source: z.string(), severity: SeveritySchema }),
  /** The id of a live site band with the same name, when it has been added already. */
  existingId: UuidSchema.nullable(),
});
export const MriBandSuggestionListSchema = z.object({ suggestions: z.array(MriBandSuggestionSchema) });

export const WATCH_BAND_IMPORT_MODES = ['check', 'all', 'valid_rows'] as const;
export const WatchBandImportSchema = z.object({
  csv: z.string().min(1, 'The file is empty.').max(900_000, 'The file is larger than 900 kB: split it into smaller files.'),
  /** check: report only; all: import only if every row is good; valid_rows: import the good rows, skip the bad. */
  mode: z.enum(WATCH_BAND_IMPORT_MODES).default('check'),
});
export type WatchBandImport = z.infer<typeof WatchBandImportSchema>;

export const WatchBandImportResultSchema = z.object({
  mode: z.enum(WATCH_BAND_IMPORT_MODES),
  rows: z.number().int(),
  valid: z.number().int(),
  errors: z.array(z.object({ line: z.number().int(), messages: z.array(z.string()) })),
  /** Rows that made a new band, and rows that changed the organisation's band of the same name. */
  created: z.number().int(),
  updated: z.number().int(),
});
export type WatchBandImportResult = z.infer<typeof WatchBandImportResultSchema>;
