/** Planning a survey (issue 6 §8): its settings, its team, and the zone sets to choose from. */
import { z } from 'zod';
import type { Role } from './common';
import { RoleSchema, UuidSchema } from './common';
import { SurveyStateSchema } from './home';
import { CalendarDateSchema } from './instrument';
import { SpeciesSchema } from './vocabulary';

/** Who may walk a survey and who may review it (membership roles). */
export const ASSIGNABLE_SURVEYOR_ROLES: readonly Role[] = ['surveyor', 'emc'];
export const ASSIGNABLE_REVIEWER_ROLES: readonly Role[] = ['reviewer', 'admin'];

const fields = {
  name: z.string().trim().min(1, 'Give the survey a name.').max(200),
  zoneSetId: UuidSchema.nullable().optional(),
  /**
   * The levels of the site this survey walks; the offline bundle carries only these. Left out when a
   * survey is created, it is every level the site has at that moment.
   */
  levelIds: z.array(UuidSchema).min(1, 'Pick at least one level to survey.').max(200).optional(),
  species: z.array(SpeciesSchema).min(1, 'Pick at least one species.').max(7).default(['electron', 'proton']),
  maxHarmonic: z.number().int().min(1).max(50).default(3),
  /** Readings closer than this are grouped as repeats, m. */
  repeatRadiusM: z.number().positive('The radius must be greater than zero.').max(100).default(0.3),
  startsOn: CalendarDateSchema.nullable().optional(),
  endsOn: CalendarDateSchema.nullable().optional(),
  notes: z.string().trim().max(5000).nullable().optional(),
};
const datesInOrder = (v: { startsOn?: string | null; endsOn?: string | null }) => !v.startsOn || !v.endsOn || v.startsOn <= v.endsOn;
const DATE_ORDER = { message: 'The end date must not be before the start date.', path: ['endsOn'] };

export const SurveyCreateSchema = z.object(fields).refine(datesInOrder, DATE_ORDER);
export type SurveyCreate = z.infer<typeof SurveyCreateSchema>;

export const SurveyUpdateSchema = z
  .object({
    name: fields.name.optional(),
    zoneSetId: fields.zoneSetId,
    levelIds: fields.levelIds,
    species: z.array(SpeciesSchema).min(1, 'Pick at least one species.').max(7).optional(),
    maxHarmonic: z.number().int().min(1).max(50).optional(),
    repeatRadiusM: z.number().positive().max(100).optional(),
    startsOn: fields.startsOn,
    endsOn: fields.endsOn,
    notes: fields.notes,
  })
  .refine(datesInOrder, DATE_ORDER);
export type SurveyUpdate = z.infer<typeof SurveyUpdateSchema>;

export const TeamMemberSchema = z.object({ userId: UuidSchema, name: z.string(), email: z.string(), role: RoleSchema });
export type TeamMember = z.infer<typeof TeamMemberSchema>;

export const SurveySettingsSchema = z.object({
  id: UuidSchema,
  siteId: UuidSchema,
  name: z.string(),
  state: SurveyStateSchema,
  zoneSetId: UuidSchema.nullable(),
  levelIds: z.array(UuidSchema),
  species: z.array(SpeciesSchema),
  maxHarmonic: z.number().int(),
  repeatRadiusM: z.number(),
  startsOn: z.string().nullable(),
  endsOn: z.string().nullable(),
  notes: z.string().nullable(),
  revision: z.number().int(),
  changeSeq: z.number().int(),
  team: z.object({ surveyors: z.array(TeamMemberSchema), reviewers: z.array(TeamMemberSchema) }),
});
export type SurveySettings = z.infer<typeof SurveySettingsSchema>;

export const SurveyAssignmentsInputSchema = z.object({
  surveyors: z.array(UuidSchema).max(100).default([]),
  reviewers: z.array(UuidSchema).max(100).default([]),
});
export type SurveyAssignmentsInput = z.infer<typeof SurveyAssignmentsInputSchema>;

export const SurveyAssignmentsResultSchema = z.object({
  survey: SurveySettingsSchema,
  /** Surveyors newly added by this call, who were e-mailed a link. */
  mailed: z.array(UuidSchema),
});

export const ZoneSetSchema = z.object({
  id: UuidSchema,
  name: z.string(),
  edition: z.string(),
  isDefault: z.boolean(),
  thresholds: z.array(z.object({ name: z.string(), fieldT: z.number(), caution: z.string() })),
});
export const ZoneSetListSchema = z.object({ zoneSets: z.array(ZoneSetSchema) });
