/** Sites and levels as site setup (issue 6 §1) writes and reads them. */
import { z } from 'zod';
import { UuidSchema } from './common';
import { SiteSummarySchema } from './home';
import { PlanSchema } from './plan';

const name = z.string().trim().min(1, 'Give it a name.').max(200, 'Keep the name under 200 characters.');
const optionalText = (max: number) => z.string().trim().max(max, `Keep it under ${max} characters.`).nullable().optional();

export const SiteCreateSchema = z.object({
  name,
  address: optionalText(500),
  notes: optionalText(5000),
});
export type SiteCreate = z.infer<typeof SiteCreateSchema>;

export const SiteUpdateSchema = SiteCreateSchema.partial();
export type SiteUpdate = z.infer<typeof SiteUpdateSchema>;

export const LevelSchema = z.object({
  id: UuidSchema,
  siteId: UuidSchema,
  name: z.string(),
  ordinal: z.number().int(),
  /** Finished-floor height above the site's datum, m. */
  elevationM: z.number(),
  archived: z.boolean(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  /** The level's current plan (the newest upload), or null before one is uploaded. */
  plan: PlanSchema.nullable(),
});
export type Level = z.infer<typeof LevelSchema>;

export const LevelListSchema = z.object({ levels: z.array(LevelSchema) });

export const LevelCreateSchema = z.object({
  name,
  ordinal: z.number().int().min(-100).max(1000).default(0),
  elevationM: z.number().min(-1000).max(10_000).default(0),
});
export type LevelCreate = z.infer<typeof LevelCreateSchema>;

export const LevelUpdateSchema = z.object({
  name: name.optional(),
  ordinal: z.number().int().min(-100).max(1000).optional(),
  elevationM: z.number().min(-1000).max(10_000).optional(),
  archived: z.boolean().optional(),
});
export type LevelUpdate = z.infer<typeof LevelUpdateSchema>;

export const SiteDetailSchema = SiteSummarySchema.extend({
  notes: z.string().nullable(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  updatedAt: z.string(),
  levels: z.array(LevelSchema),
});
export type SiteDetail = z.infer<typeof SiteDetailSchema>;

export const LevelParamsSchema = z.object({ orgId: UuidSchema, levelId: UuidSchema });
