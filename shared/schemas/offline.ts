/**
 * The offline bundle: everything a surveyor needs to work on one survey with no network, as one JSON
 * answer of GET /api/orgs/:orgId/surveys/:surveyId/offline. The device parses it with this schema and
 * stores each part in its Dexie tables (src/db). Plan images are not inside: each plan carries the URL
 * of its device-sized image, fetched separately and kept as a blob.
 *
 * Shapes are camelCase, SI values, the same columns as server/db/schema. Captured records (stations,
 * readings, sweeps) use the wire schemas of shared/schemas/capture.ts, so a record pulled here and one
 * made on the device look the same.
 */
import { z } from 'zod';
import { FieldReadingSchema, StationSchema, SweepSchema } from './capture';
import { UuidSchema } from './common';
import { SurveyStateSchema } from './home';
import {
  ElectronEnergyKindSchema,
  EmitterKindSchema,
  InstrumentKindSchema,
  MagnetShieldingSchema,
  RoomSensitivitySchema,
  SeveritySchema,
  SourceKindSchema,
  SourceStateSchema,
  SpeciesSchema,
  VerdictSchema,
} from './vocabulary';

const dateOnly = z.iso.date();
const isoTime = z.iso.datetime({ offset: true });
const revisioned = { id: UuidSchema, organisationId: UuidSchema, revision: z.number().int().min(1) };

export const OfflineSurveyRecordSchema = z.object({
  ...revisioned,
  siteId: UuidSchema,
  name: z.string(),
  state: SurveyStateSchema,
  zoneSetId: UuidSchema.nullable(),
  startsOn: dateOnly.nullable(),
  endsOn: dateOnly.nullable(),
  species: z.array(SpeciesSchema).min(1),
  maxHarmonic: z.number().int().min(1),
  repeatRadiusM: z.number().positive(),
  notes: z.string().nullable(),
});
export type OfflineSurveyRecord = z.infer<typeof OfflineSurveyRecordSchema>;

export const OfflineSiteSchema = z.object({
  ...revisioned,
  name: z.string(),
  address: z.string().nullable(),
  notes: z.string().nullable(),
  archived: z.boolean(),
});
export type OfflineSite = z.infer<typeof OfflineSiteSchema>;

export const OfflineLevelSchema = z.object({
  ...revisioned,
  siteId: UuidSchema,
  name: z.string(),
  ordinal: z.number().int(),
  elevationM: z.number(),
});
export type OfflineLevel = z.infer<typeof OfflineLevelSchema>;

export const OfflinePlanSchema = z.object({
  ...revisioned,
  levelId: UuidSchema,
  mime: z.string(),
  widthPx: z.number().int().positive(),
  heightPx: z.number().int().positive(),
  metresPerPixel: z.number().positive().nullable(),
  originXPx: z.number().nullable(),
  originYPx: z.number().nullable(),
  northAngleDeg: z.number().nullable(),
  sha256: z.string().nullable(),
  /** Where the device fetches the image it keeps (the downscaled copy when there is one). */
  imageUrl: z.string().min(1),
});
export type OfflinePlan = z.infer<typeof OfflinePlanSchema>;

export const OfflineRoomSchema = z.object({
  ...revisioned,
  levelId: UuidSchema,
  name: z.string(),
  use: z.string().nullable(),
  sensitivity: RoomSensitivitySchema,
  /** Outline in plan metres, [[x, y], …]. */
  polygon: z.array(z.tuple([z.number(), z.number()])).min(3),
});
export type OfflineRoom = z.infer<typeof OfflineRoomSchema>;

export const OfflineSourceSchema = z.object({
  ...revisioned,
  siteId: UuidSchema,
  levelId: UuidSchema.nullable(),
  name: z.string(),
  kind: SourceKindSchema,
  state: SourceStateSchema,
  shielding: MagnetShieldingSchema,
  nominalFieldT: z.number().positive(),
  xM: z.number().nullable(),
  yM: z.number().nullable(),
  zM: z.number().nullable(),
  dipoleMomentAM2: z.number().nullable(),
  axisX: z.number().nullable(),
  axisY: z.number().nullable(),
  axisZ: z.number().nullable(),
  notes: z.string().nullable(),
});
export type OfflineSource = z.infer<typeof OfflineSourceSchema>;

export const OfflineEmitterSchema = z.object({
  ...revisioned,
  roomId: UuidSchema,
  name: z.string(),
  kind: EmitterKindSchema,
  electronDensityPerM3: z.number().positive(),
  electronEnergyEv: z.number().positive(),
  energyKind: ElectronEnergyKindSchema,
  volumeM3: z.number().positive(),
  xM: z.number().nullable(),
  yM: z.number().nullable(),
  zM: z.number().nullable(),
  notes: z.string().nullable(),
});
export type OfflineEmitter = z.infer<typeof OfflineEmitterSchema>;

export const OfflineInstrumentSchema = z.object({
  ...revisioned,
  kind: InstrumentKindSchema,
  model: z.string(),
  serial: z.string(),
  probe: z.string().nullable(),
  calibratedOn: dateOnly.nullable(),
  calibrationDueOn: dateOnly.nullable(),
  relativeUncertainty: z.number().nullable(),
  archived: z.boolean(),
  /** On the day the bundle was made; the form re-checks against each reading's own date. */
  calibrationOverdue: z.boolean(),
});
export type OfflineInstrument = z.infer<typeof OfflineInstrumentSchema>;

export const OfflineWatchBandSchema = z.object({
  ...revisioned,
  siteId: UuidSchema.nullable(),
  name: z.string(),
  lowerHz: z.number().nonnegative(),
  upperHz: z.number().positive(),
  reason: z.string(),
  source: z.string(),
  severity: SeveritySchema,
});
export type OfflineWatchBand = z.infer<typeof OfflineWatchBandSchema>;

export const OfflineZoneSetSchema = z.object({
  ...revisioned,
  name: z.string(),
  edition: z.string(),
  thresholds: z.array(z.object({ name: z.string(), fieldT: z.number().positive(), caution: z.string() })).min(1),
});
export type OfflineZoneSet = z.infer<typeof OfflineZoneSetSchema>;

/** A station as the server holds it, with |B| of its newest live reading (null when it has none). */
export const OfflineStationSchema = StationSchema.extend({ latestFieldT: z.number().nonnegative().nullable() });
export type OfflineStation = z.infer<typeof OfflineStationSchema>;

export const OfflineDecisionSchema = z.object({
  ...revisioned,
  surveyId: UuidSchema,
  fieldReadingId: UuidSchema.nullable(),
  sweepId: UuidSchema.nullable(),
  /** The station the judged reading or sweep was taken at, so the device can show it on the plan. */
  stationId: UuidSchema,
  verdict: VerdictSchema,
  note: z.string().nullable(),
  reviewerUserId: UuidSchema,
  decidedAt: isoTime,
});
export type OfflineDecision = z.infer<typeof OfflineDecisionSchema>;

export const OfflineBundleSchema = z.object({
  /** Server clock when the bundle was made. */
  generatedAt: isoTime,
  survey: OfflineSurveyRecordSchema,
  site: OfflineSiteSchema,
  levels: z.array(OfflineLevelSchema),
  plans: z.array(OfflinePlanSchema),
  rooms: z.array(OfflineRoomSchema),
  sources: z.array(OfflineSourceSchema),
  emitters: z.array(OfflineEmitterSchema),
  instruments: z.array(OfflineInstrumentSchema),
  watchBands: z.array(OfflineWatchBandSchema),
  zoneSet: OfflineZoneSetSchema.nullable(),
  stations: z.array(OfflineStationSchema),
  fieldReadings: z.array(FieldReadingSchema),
  sweeps: z.array(SweepSchema),
  decisions: z.array(OfflineDecisionSchema),
});
export type OfflineBundle = z.infer<typeof OfflineBundleSchema>;
