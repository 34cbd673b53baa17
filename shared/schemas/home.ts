import { z } from 'zod';
import { UuidSchema } from './common';

export const SURVEY_STATES = ['open', 'submitted', 'signed_off'] as const;
export const SurveyStateSchema = z.enum(SURVEY_STATES);

export const SiteSummarySchema = z.object({
  id: UuidSchema,
  name: z.string(),
  address: z.string().nullable(),
  levelCount: z.number().int(),
  sourceCount: z.number().int(),
  archived: z.boolean(),
});
export type SiteSummary = z.infer<typeof SiteSummarySchema>;

export const SurveySummarySchema = z.object({
  id: UuidSchema,
  siteId: UuidSchema,
  siteName: z.string(),
  name: z.string(),
  state: SurveyStateSchema,
  startsOn: z.string().nullable(),
  stationCount: z.number().int(),
  readingCount: z.number().int(),
  assignedToMe: z.boolean(),
});
export type SurveySummary = z.infer<typeof SurveySummarySchema>;

export const SiteListSchema = z.object({ sites: z.array(SiteSummarySchema) });
export const SurveyListSchema = z.object({ surveys: z.array(SurveySummarySchema) });
export const SiteParamsSchema = z.object({ orgId: UuidSchema, siteId: UuidSchema });
export const SurveyParamsSchema = z.object({ orgId: UuidSchema, surveyId: UuidSchema });
export const UserParamsSchema = z.object({ orgId: UuidSchema, userId: UuidSchema });
