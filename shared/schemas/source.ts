/** Magnets on a site (issue 6 §5); the centre is used later as the dipole centre. */
import { z } from 'zod';
import { UuidSchema } from './common';
import { MagnetShieldingSchema, SourceKindSchema, SourceStateSchema } from './vocabulary';

const finite = z.number().refine(Number.isFinite, 'Must be a finite number.');
const AxisSchema = z
  .object({ x: finite, y: finite, z: finite })
  .refine((a) => a.x !== 0 || a.y !== 0 || a.z !== 0, 'The axis must not be the zero vector.');

const fields = {
  name: z.string().trim().min(1, 'Give the magnet a name.').max(200),
  kind: SourceKindSchema,
  state: SourceStateSchema.default('at_field'),
  shielding: MagnetShieldingSchema.default('unknown'),
  /** Field at the magnet's centre, T. */
  nominalFieldT: z.number().positive('The nominal field must be greater than zero.').max(100, 'Give the field in tesla (at most 100 T).'),
  levelId: UuidSchema.nullable().optional(),
  xM: finite.nullable().optional(),
  yM: finite.nullable().optional(),
  zM: finite.nullable().optional(),
  /** Equivalent far-field dipole moment, A·m². */
  dipoleMomentAM2: z.number().positive().refine(Number.isFinite).nullable().optional(),
  axis: AxisSchema.nullable().optional(),
  notes: z.string().trim().max(5000).nullable().optional(),
};

export const SourceCreateSchema = z.object(fields);
export type SourceCreate = z.infer<typeof SourceCreateSchema>;
export const SourceUpdateSchema = z.object({
  ...fields,
  kind: SourceKindSchema.optional(),
  state: SourceStateSchema.optional(),
  shielding: MagnetShieldingSchema.optional(),
  name: fields.name.optional(),
  nominalFieldT: fields.nominalFieldT.optional(),
});
export type SourceUpdate = z.infer<typeof SourceUpdateSchema>;

export const SourceSchema = z.object({
  id: UuidSchema,
  siteId: UuidSchema,
  levelId: UuidSchema.nullable(),
  name: z.string(),
  kind: SourceKindSchema,
  state: SourceStateSchema,
  shielding: MagnetShieldingSchema,
  nominalFieldT: z.number(),
  xM: z.number().nullable(),
  yM: z.number().nullable(),
  zM: z.number().nullable(),
  dipoleMomentAM2: z.number().nullable(),
  axis: z.object({ x: z.number(), y: z.number(), z: z.number() }).nullable(),
  notes: z.string().nullable(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  updatedAt: z.string(),
});
export type Source = z.infer<typeof SourceSchema>;
export const SourceListSchema = z.object({ sources: z.array(SourceSchema) });
export const SourceParamsSchema = z.object({ orgId: UuidSchema, sourceId: UuidSchema });
