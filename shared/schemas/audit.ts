import { z } from 'zod';
import { UuidSchema } from './common';

/** One row of the audit log as an admin reads it. */
export const AuditEntrySchema = z.object({
  id: z.string(),
  at: z.string(),
  actorUserId: UuidSchema.nullable(),
  actorName: z.string().nullable(),
  action: z.string(),
  entity: z.string(),
  entityId: z.string().nullable(),
  before: z.unknown(),
  after: z.unknown(),
  requestId: z.string().nullable(),
});
export type AuditEntry = z.infer<typeof AuditEntrySchema>;

export const AuditListSchema = z.object({ entries: z.array(AuditEntrySchema) });
export type AuditList = z.infer<typeof AuditListSchema>;

/** GET /api/orgs/:orgId/audit?limit=… (newest first). */
export const AuditQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(100),
});
