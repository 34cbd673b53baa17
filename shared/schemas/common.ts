import { z } from 'zod';

/** Roles within one organisation (DESIGN.md §1). Order is not a hierarchy: each role has its own duties. */
export const ROLES = ['admin', 'reviewer', 'emc', 'surveyor', 'viewer'] as const;
export const RoleSchema = z.enum(ROLES);
export type Role = z.infer<typeof RoleSchema>;

export const UuidSchema = z.uuid({ message: 'Must be a UUID.' });

/** One error shape for every failure the API returns. */
export const ApiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiError = z.infer<typeof ApiErrorSchema>;

export const OrgParamsSchema = z.object({ orgId: UuidSchema });
