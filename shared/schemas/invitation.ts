import { z } from 'zod';
import { RoleSchema, UuidSchema } from './common';

/** A pending invitation as admins see it (POST /api/orgs/:orgId/invitations answers one). */
export const InvitationSchema = z.object({
  id: UuidSchema,
  email: z.string(),
  role: RoleSchema,
  expiresAt: z.string(),
  createdAt: z.string(),
  invitedByName: z.string().nullable(),
});
export type Invitation = z.infer<typeof InvitationSchema>;

export const InvitationListSchema = z.object({ invitations: z.array(InvitationSchema) });
export type InvitationList = z.infer<typeof InvitationListSchema>;
