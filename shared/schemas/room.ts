/** Rooms drawn on a level's plan (issue 6 §4); outlines in plan metres (shared/plans/polygon.ts). */
import { z } from 'zod';
import { isSimplePolygon, polygonAreaM2 } from '../plans/polygon';
import { UuidSchema } from './common';
import { RoomSensitivitySchema } from './vocabulary';

const coordinate = z.number().refine(Number.isFinite, 'Must be a finite number.').refine((v) => Math.abs(v) <= 100_000, 'Must be within 100 km of the origin.');

export const PolygonMSchema = z
  .array(z.tuple([coordinate, coordinate]))
  .min(3, 'A room needs at least three corners.')
  .max(500, 'A room may have at most 500 corners.')
  .refine((p) => p.length < 2 || p[0]![0] !== p[p.length - 1]![0] || p[0]![1] !== p[p.length - 1]![1], 'Do not repeat the first corner at the end.')
  .refine((p) => polygonAreaM2(p) > 1e-6, 'The outline encloses no area.')
  .refine((p) => isSimplePolygon(p), 'The outline crosses itself.');

export const RoomSchema = z.object({
  id: UuidSchema,
  levelId: UuidSchema,
  name: z.string(),
  use: z.string().nullable(),
  sensitivity: RoomSensitivitySchema,
  polygonM: z.array(z.tuple([z.number(), z.number()])),
  areaM2: z.number(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  updatedAt: z.string(),
});
export type Room = z.infer<typeof RoomSchema>;

export const RoomCreateSchema = z.object({
  name: z.string().trim().min(1, 'Give the room a name.').max(200),
  use: z.string().trim().max(200).nullable().optional(),
  sensitivity: RoomSensitivitySchema.default('none'),
  polygonM: PolygonMSchema,
});
export type RoomCreate = z.infer<typeof RoomCreateSchema>;

export const RoomUpdateSchema = z.object({
  name: z.string().trim().min(1, 'Give the room a name.').max(200).optional(),
  use: z.string().trim().max(200).nullable().optional(),
  sensitivity: RoomSensitivitySchema.optional(),
  polygonM: PolygonMSchema.optional(),
});
export type RoomUpdate = z.infer<typeof RoomUpdateSchema>;

export const RoomListSchema = z.object({ rooms: z.array(RoomSchema) });
/** Stations of open surveys on the level are re-assigned to the room containing them after every room write. */
export const RoomWriteResultSchema = z.object({ room: RoomSchema, stationsReassigned: z.number().int() });
export const RoomDeleteResultSchema = z.object({ stationsReassigned: z.number().int() });
export const RoomParamsSchema = z.object({ orgId: UuidSchema, roomId: UuidSchema });
