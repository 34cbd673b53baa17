/** Gaussmeters, analysers and antennas with their calibration (issue 6 §7). */
import { z } from 'zod';
import { UuidSchema } from './common';
import { InstrumentKindSchema } from './vocabulary';

/** Admins are mailed this many days before a calibration falls due. */
export const CALIBRATION_REMINDER_DAYS = 14;
/** Largest antenna-factor CSV accepted, bytes. */
export const ANTENNA_FACTOR_MAX_BYTES = 1024 * 1024;

export const CalendarDateSchema = z.iso.date({ message: 'Use a date like 2027-03-31.' });

const fields = {
  kind: InstrumentKindSchema,
  model: z.string().trim().min(1, 'Give the make and model.').max(200),
  serial: z.string().trim().min(1, 'Give the serial number.').max(100),
  probe: z.string().trim().max(200).nullable().optional(),
  calibratedOn: CalendarDateSchema.nullable().optional(),
  calibrationDueOn: CalendarDateSchema.nullable().optional(),
  calibrationCertificate: z.string().trim().max(500).nullable().optional(),
  /** Relative standard uncertainty (0.01 = 1 %); required for gaussmeters. */
  relativeUncertainty: z.number().min(0).lt(1, 'Give it as a fraction: 0.02 for 2 %.').nullable().optional(),
  notes: z.string().trim().max(5000).nullable().optional(),
};

const datesInOrder = (v: { calibratedOn?: string | null; calibrationDueOn?: string | null }) =>
  !v.calibratedOn || !v.calibrationDueOn || v.calibratedOn <= v.calibrationDueOn;
const DATE_ORDER = { message: 'The due date must not be before the calibration date.', path: ['calibrationDueOn'] };

export const InstrumentCreateSchema = z
  .object(fields)
  .refine(datesInOrder, DATE_ORDER)
  .refine((v) => v.kind !== 'gaussmeter' || typeof v.relativeUncertainty === 'number', {
    message: 'A gaussmeter needs its relative uncertainty (e.g. 0.02 for 2 %).',
    path: ['relativeUncertainty'],
  })
  .refine((v) => v.kind !== 'antenna' || v.relativeUncertainty == null, {
    message: 'An antenna carries an antenna-factor table instead of an uncertainty.',
    path: ['relativeUncertainty'],
  });
export type InstrumentCreate = z.infer<typeof InstrumentCreateSchema>;

export const InstrumentUpdateSchema = z
  .object({ ...fields, archived: z.boolean() })
  .omit({ kind: true })
  .partial()
  .refine(datesInOrder, DATE_ORDER);
export type InstrumentUpdate = z.infer<typeof InstrumentUpdateSchema>;

export const InstrumentSchema = z.object({
  id: UuidSchema,
  kind: InstrumentKindSchema,
  model: z.string(),
  serial: z.string(),
  probe: z.string().nullable(),
  calibratedOn: z.string().nullable(),
  calibrationDueOn: z.string().nullable(),
  calibrationCertificate: z.string().nullable(),
  relativeUncertainty: z.number().nullable(),
  notes: z.string().nullable(),
  archived: z.boolean(),
  /** The due date is before today (UTC), computed when read. */
  calibrationOverdue: z.boolean(),
  /** Due today or within CALIBRATION_REMINDER_DAYS days. */
  calibrationDueSoon: z.boolean(),
  antennaFactors: z.object({ points: z.number().int(), minFrequencyMHz: z.number(), maxFrequencyMHz: z.number() }).nullable(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  updatedAt: z.string(),
});
export type Instrument = z.infer<typeof InstrumentSchema>;
export const InstrumentListSchema = z.object({ instruments: z.array(InstrumentSchema) });

export const AntennaFactorPointSchema = z.object({ frequencyMHz: z.number(), antennaFactorDbPerM: z.number() });
export const AntennaFactorTableSchema = z.object({ points: z.array(AntennaFactorPointSchema), uploadedAt: z.string() });
export type AntennaFactorTable = z.infer<typeof AntennaFactorTableSchema>;

export const InstrumentParamsSchema = z.object({ orgId: UuidSchema, instrumentId: UuidSchema });
