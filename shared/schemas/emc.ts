/** EMC (issue 8 §2–§3): predicted lines per room, and the flags raised where they fall in watch bands. */
import { z } from 'zod';
import { UuidSchema } from './common';
import { FlagKindSchema, FlagStateSchema, RoomSensitivitySchema, SeveritySchema, SpeciesSchema } from './vocabulary';

export const FieldIntervalSchema = z.object({ lowT: z.number(), highT: z.number(), maxReadT: z.number(), readings: z.number().int() });

export const EmissionAtVictimSchema = z.object({
  fieldT: z.number(),
  emittedPowerW: z.number(),
  victimDistanceM: z.number(),
  fluxDensityWPerM2: z.number(),
  spectralFluxDensityDbWPerM2Hz: z.number(),
  thresholdDbWPerM2Hz: z.number().nullable(),
  marginDb: z.number().nullable(),
  /** The reference analyser at the victim (shared/emc/room-lines.ts REFERENCE_ANALYSER). */
  receivedInRbwDbm: z.number(),
  analyserNoiseFloorDbm: z.number(),
  noiseMarginDb: z.number(),
});

export const EmcFlagDetailsSchema = z.object({
  roomName: z.string(),
  bandName: z.string(),
  bandLowerHz: z.number(),
  bandUpperHz: z.number(),
  lineLowHz: z.number(),
  lineHighHz: z.number(),
  fieldLowT: z.number(),
  fieldHighT: z.number(),
  fieldMaxReadT: z.number(),
  readings: z.number().int(),
  /** Some of the readings behind it are not accepted yet (an open survey). */
  provisional: z.boolean(),
  emitters: z.array(z.string()),
  /** The fundamental electron line's power at the victim, when the room has an emitter. */
  emission: EmissionAtVictimSchema.nullable(),
});
export type EmcFlagDetails = z.infer<typeof EmcFlagDetailsSchema>;

export const EmcFlagSchema = z.object({
  id: UuidSchema,
  surveyId: UuidSchema,
  kind: FlagKindSchema,
  state: FlagStateSchema,
  severity: SeveritySchema,
  roomId: UuidSchema.nullable(),
  watchBandId: UuidSchema.nullable(),
  species: SpeciesSchema.nullable(),
  harmonic: z.number().int().nullable(),
  /** "electron line n = 1". */
  label: z.string(),
  overlapLowerHz: z.number().nullable(),
  overlapUpperHz: z.number().nullable(),
  details: EmcFlagDetailsSchema,
  acknowledgedAt: z.string().nullable(),
  acknowledgedByUserId: UuidSchema.nullable(),
  acknowledgementNote: z.string().nullable(),
  resolvedAt: z.string().nullable(),
  resolvedByUserId: UuidSchema.nullable(),
  resolution: z.string().nullable(),
  revision: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type EmcFlag = z.infer<typeof EmcFlagSchema>;
export const EmcFlagListSchema = z.object({ flags: z.array(EmcFlagSchema) });

export const EmcRoomSchema = z.object({
  roomId: UuidSchema,
  levelId: UuidSchema,
  name: z.string(),
  use: z.string().nullable(),
  sensitivity: RoomSensitivitySchema,
  field: FieldIntervalSchema.nullable(),
  provisional: z.boolean(),
  lines: z.array(z.object({ species: SpeciesSchema, harmonic: z.number().int(), lowHz: z.number(), highHz: z.number(), label: z.string() })),
  hits: z.array(
    z.object({ species: SpeciesSchema, harmonic: z.number().int(), watchBandId: UuidSchema, bandName: z.string(), severity: SeveritySchema, overlapLowHz: z.number(), overlapHighHz: z.number() }),
  ),
  emitters: z.array(z.string()),
});
export type EmcRoom = z.infer<typeof EmcRoomSchema>;
export const EmcRoomListSchema = z.object({ provisional: z.boolean(), rooms: z.array(EmcRoomSchema) });

export const FlagParamsSchema = z.object({ orgId: UuidSchema, flagId: UuidSchema });
export const FlagsQuerySchema = z.object({
  victimDistanceM: z.coerce.number().positive('The distance must be greater than zero.').max(100_000, 'Give the distance in metres (at most 100 km).').optional(),
});
export const AcknowledgeFlagSchema = z.object({ note: z.string().trim().min(1, 'Say what is being done about it.').max(5000) });
export const ResolveFlagSchema = z.object({ resolution: z.string().trim().min(1, 'Say what was done: lamp replaced, gauge moved, shielding added…').max(5000) });
