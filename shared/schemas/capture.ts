/**
 * Records a surveyor makes on the device and syncs: walks, stations, field readings, sweeps. These are
 * the wire shapes (camelCase, SI values) used by the Dexie store, the outbox and the server's push
 * validation; they mirror server/db/schema/surveys.ts column for column. Ids are client-made UUIDs (v7).
 *
 * Form inputs (text a surveyor types, in the unit they chose) are parsed into these shapes by the
 * capture feature with shared/units; these schemas check the parsed, SI result.
 */
import { z } from 'zod';
import { UuidSchema } from './common';
import { DetectorSchema, FieldUnitSchema, ProbeOrientationSchema } from './vocabulary';

const finite = (label: string) => z.number({ message: `${label} must be a number.` }).refine(Number.isFinite, `${label} must be a finite number.`);
const nonNegative = (label: string) => finite(label).refine((v) => v >= 0, `${label} cannot be negative.`);
const isoTime = z.iso.datetime({ offset: true, message: 'Must be a date and time (ISO 8601).' });

/** Bookkeeping every synced record carries (DESIGN.md §4). The server assigns changeSeq; devices never do. */
export const SyncMetaSchema = z.object({
  id: UuidSchema,
  organisationId: UuidSchema,
  revision: z.number().int().min(1),
  deleted: z.boolean(),
});

export const WalkSchema = SyncMetaSchema.extend({
  surveyId: UuidSchema,
  surveyorUserId: UuidSchema,
  deviceId: z.string().min(1).max(100),
  deviceLabel: z.string().max(100).nullable(),
  startedAt: isoTime,
  endedAt: isoTime.nullable(),
  notes: z.string().max(4000).nullable(),
});
export type Walk = z.infer<typeof WalkSchema>;

export const StationSchema = SyncMetaSchema.extend({
  surveyId: UuidSchema,
  levelId: UuidSchema,
  walkId: UuidSchema.nullable(),
  roomId: UuidSchema.nullable(),
  label: z.string().max(80).nullable(),
  xM: finite('x'),
  yM: finite('y'),
  heightM: nonNegative('Height'),
  createdByUserId: UuidSchema.nullable(),
  notes: z.string().max(4000).nullable(),
});
export type Station = z.infer<typeof StationSchema>;

export const FieldReadingSchema = SyncMetaSchema.extend({
  surveyId: UuidSchema,
  stationId: UuidSchema,
  walkId: UuidSchema.nullable(),
  instrumentId: UuidSchema.nullable(),
  surveyorUserId: UuidSchema,
  /** |B| in tesla from a single-value meter, or null when the three components were read. */
  magnitudeT: nonNegative('|B|').nullable(),
  bxT: finite('Bx').nullable(),
  byT: finite('By').nullable(),
  bzT: finite('Bz').nullable(),
  /** The unit the surveyor typed in; values above are tesla regardless. */
  unit: FieldUnitSchema,
  probeOrientation: ProbeOrientationSchema,
  heightM: nonNegative('Probe height'),
  backgroundT: nonNegative('Background').nullable(),
  zeroed: z.boolean(),
  measuredAt: isoTime,
  notes: z.string().max(4000).nullable(),
  photoObjectKey: z.string().max(300).nullable(),
  photoSha256: z.string().regex(/^[0-9a-f]{64}$/).nullable(),
}).superRefine((r, ctx) => {
  const components = [r.bxT, r.byT, r.bzT];
  const some = components.some((c) => c !== null);
  const all = components.every((c) => c !== null);
  if (r.magnitudeT === null && !all) {
    ctx.addIssue({ code: 'custom', path: some ? ['bxT'] : ['magnitudeT'], message: some ? 'Enter all three components, or the magnitude alone.' : 'Enter |B| or its three components.' });
  }
  if (r.magnitudeT !== null && some) {
    ctx.addIssue({ code: 'custom', path: ['magnitudeT'], message: 'Enter either |B| or the three components, not both.' });
  }
});
export type FieldReading = z.infer<typeof FieldReadingSchema>;

/** |B| of a reading in tesla, whichever way it was entered (the server's generated field_t column). */
export function readingFieldTesla(r: Pick<FieldReading, 'magnitudeT' | 'bxT' | 'byT' | 'bzT'>): number {
  if (r.magnitudeT !== null) return r.magnitudeT;
  return Math.hypot(r.bxT ?? 0, r.byT ?? 0, r.bzT ?? 0);
}

export const PeakMarkerSchema = z.object({
  frequencyHz: finite('Peak frequency').refine((v) => v > 0, 'Peak frequency must be above 0 Hz.'),
  levelDbm: finite('Peak level'),
});
export type PeakMarkerInput = z.infer<typeof PeakMarkerSchema>;

export const SweepSchema = SyncMetaSchema.extend({
  surveyId: UuidSchema,
  stationId: UuidSchema,
  walkId: UuidSchema.nullable(),
  analyserId: UuidSchema.nullable(),
  antennaId: UuidSchema.nullable(),
  surveyorUserId: UuidSchema,
  measuredAt: isoTime,
  startHz: nonNegative('Start frequency'),
  stopHz: finite('Stop frequency'),
  rbwHz: finite('RBW').refine((v) => v > 0, 'RBW must be above 0 Hz.'),
  vbwHz: finite('VBW').refine((v) => v > 0, 'VBW must be above 0 Hz.').nullable(),
  referenceLevelDbm: finite('Reference level'),
  attenuationDb: finite('Attenuation').nullable(),
  detector: DetectorSchema,
  peaks: z.array(PeakMarkerSchema).max(200),
  traceObjectKey: z.string().max(300).nullable(),
  traceSha256: z.string().regex(/^[0-9a-f]{64}$/).nullable(),
  heightM: nonNegative('Height').nullable(),
  notes: z.string().max(4000).nullable(),
}).superRefine((s, ctx) => {
  if (!(s.startHz < s.stopHz)) ctx.addIssue({ code: 'custom', path: ['stopHz'], message: 'Stop frequency must be above the start frequency.' });
  for (const [i, p] of s.peaks.entries()) {
    if (p.frequencyHz < s.startHz || p.frequencyHz > s.stopHz) {
      ctx.addIssue({ code: 'custom', path: ['peaks', i, 'frequencyHz'], message: 'Peak lies outside the sweep span.' });
    }
  }
});
export type Sweep = z.infer<typeof SweepSchema>;

/** The entities a device may push, and the schema each payload must pass. */
export const CAPTURE_ENTITIES = {
  walks: WalkSchema,
  stations: StationSchema,
  field_readings: FieldReadingSchema,
  sweeps: SweepSchema,
} as const;
export type CaptureEntity = keyof typeof CAPTURE_ENTITIES;
