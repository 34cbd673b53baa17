/** Plasma-bearing devices in rooms (issue 6 §6), with their cyclotron emission from shared/physics. */
import { z } from 'zod';
import { UuidSchema } from './common';
import { ElectronEnergyKindSchema, EmitterKindSchema } from './vocabulary';

const finite = z.number().refine(Number.isFinite, 'Must be a finite number.');
const positive = (what: string) => z.number().positive(`${what} must be greater than zero.`).refine(Number.isFinite, 'Must be a finite number.');

const fields = {
  roomId: UuidSchema,
  name: z.string().trim().min(1, 'Give the emitter a name.').max(200),
  kind: EmitterKindSchema,
  /** Electron density nₑ, m⁻³. */
  electronDensityPerM3: positive('The electron density'),
  /** Mean electron kinetic energy, eV; `energyKind` says whether it is the total or the perpendicular part. */
  electronEnergyEv: positive('The electron energy'),
  energyKind: ElectronEnergyKindSchema,
  /** Plasma volume, m³. */
  volumeM3: positive('The plasma volume'),
  xM: finite.nullable().optional(),
  yM: finite.nullable().optional(),
  zM: finite.nullable().optional(),
  notes: z.string().trim().max(5000).nullable().optional(),
};

export const EmitterCreateSchema = z.object(fields);
export type EmitterCreate = z.infer<typeof EmitterCreateSchema>;
export const EmitterUpdateSchema = z.object(fields).partial();
export type EmitterUpdate = z.infer<typeof EmitterUpdateSchema>;

export const EMISSION_FIELD_BASES = ['query', 'room_readings', 'reference_1T'] as const;

export const EmissionSchema = z.object({
  /** The field the figures are for, T. */
  fieldT: z.number(),
  /** Where that field comes from: ?fieldT=, the highest |B| read in the room, or 1 T as a reference (P ∝ B²). */
  fieldBasis: z.enum(EMISSION_FIELD_BASES),
  perVolumeWPerM3: z.number(),
  totalW: z.number(),
  units: z.object({ fieldT: z.literal('T'), perVolumeWPerM3: z.literal('W/m³'), totalW: z.literal('W') }),
});
export type Emission = z.infer<typeof EmissionSchema>;

export const EmitterSchema = z.object({
  id: UuidSchema,
  siteId: UuidSchema,
  levelId: UuidSchema,
  roomId: UuidSchema,
  roomName: z.string(),
  name: z.string(),
  kind: EmitterKindSchema,
  electronDensityPerM3: z.number(),
  electronEnergyEv: z.number(),
  energyKind: ElectronEnergyKindSchema,
  volumeM3: z.number(),
  xM: z.number().nullable(),
  yM: z.number().nullable(),
  zM: z.number().nullable(),
  notes: z.string().nullable(),
  emission: EmissionSchema.nullable(),
  /** Why emission is null, or a caution about it (optically thin, non-relativistic law). */
  emissionNote: z.string(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  updatedAt: z.string(),
});
export type Emitter = z.infer<typeof EmitterSchema>;
export const EmitterListSchema = z.object({ emitters: z.array(EmitterSchema) });
export const EmitterQuerySchema = z.object({ fieldT: z.coerce.number().positive().max(100).optional() });
export const EmitterParamsSchema = z.object({ orgId: UuidSchema, emitterId: UuidSchema });
