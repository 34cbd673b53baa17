/** Plan images and their calibration (issue 6 §2–3). Coordinates: see shared/plans/calibration.ts. */
import { z } from 'zod';
import { UuidSchema } from './common';

/** Largest plan upload accepted, bytes (20 MiB). */
export const PLAN_UPLOAD_MAX_BYTES = 20 * 1024 * 1024;
/** Longest side of the copy sent to devices, px; larger originals are downscaled, the original is kept. */
export const PLAN_DEVICE_MAX_SIDE_PX = 4096;
export const PLAN_MIME_TYPES = ['image/png', 'image/jpeg', 'image/webp', 'image/svg+xml'] as const;
export const PlanMimeSchema = z.enum(PLAN_MIME_TYPES);

export const PlanCalibrationSchema = z.object({
  metresPerPixel: z.number().positive(),
  originXPx: z.number(),
  originYPx: z.number(),
  /** Direction of true north, degrees clockwise from the image's "up", [0, 360). */
  northAngleDeg: z.number(),
});
export type PlanCalibrationValues = z.infer<typeof PlanCalibrationSchema>;

export const PlanSchema = z.object({
  id: UuidSchema,
  levelId: UuidSchema,
  siteId: UuidSchema,
  mime: PlanMimeSchema,
  originalName: z.string().nullable(),
  byteSize: z.number().int().nullable(),
  /** SHA-256 (hex) of the original file. */
  sha256: z.string().nullable(),
  widthPx: z.number().int(),
  heightPx: z.number().int(),
  /** The downscaled copy for devices; null when the original is served to devices as it is. */
  device: z.object({ mime: PlanMimeSchema, widthPx: z.number().int(), heightPx: z.number().int() }).nullable(),
  calibration: PlanCalibrationSchema.nullable(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Plan = z.infer<typeof PlanSchema>;

const finite = z.number().refine(Number.isFinite, 'Must be a finite number.');
export const PixelPointSchema = z.object({ xPx: finite, yPx: finite });

export const CalibrationInputSchema = z.object({
  pointA: PixelPointSchema,
  pointB: PixelPointSchema,
  /** Real distance between A and B, metres. */
  distanceM: z.number().positive('The distance must be greater than zero.').max(100_000),
  /** The pixel that becomes (0 m, 0 m). */
  origin: PixelPointSchema,
  northAngleDeg: z.number().min(-360).max(360).default(0),
});
export type CalibrationInput = z.infer<typeof CalibrationInputSchema>;

export const CalibrationResultSchema = z.object({
  plan: PlanSchema,
  reprojection: z.object({
    policy: z.literal('keep_pixels'),
    stations: z.number().int(),
    rooms: z.number().int(),
    sources: z.number().int(),
    emitters: z.number().int(),
    stationsKeptInClosedSurveys: z.number().int(),
    note: z.string(),
  }),
});
export type CalibrationResult = z.infer<typeof CalibrationResultSchema>;

export const PlanImageQuerySchema = z.object({ variant: z.enum(['device', 'original']).default('device') });
export const PlanParamsSchema = z.object({ orgId: UuidSchema, planId: UuidSchema });
