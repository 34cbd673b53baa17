import { desc, eq } from 'drizzle-orm';
import type { AuditEntry } from '../../../shared/schemas/audit';
import type { Db } from '../../db/client';
import { auditLog, users } from '../../db/schema';

export function createAuditRepository(db: Db) {
  return {
    /** Newest first, this organisation's rows only. */
    async recent(organisationId: string, limit: number): Promise<AuditEntry[]> {
      const rows = await db
        .select({
          id: auditLog.id,
          at: auditLog.at,
          actorUserId: auditLog.actorUserId,
          actorName: users.name,
          action: auditLog.action,
          entity: auditLog.entity,
          entityId: auditLog.entityId,
          before: auditLog.before,
          after: auditLog.after,
          requestId: auditLog.requestId,
        })
        .from(auditLog)
        .leftJoin(users, eq(users.id, auditLog.actorUserId))
        .where(eq(auditLog.organisationId, organisationId))
        .orderBy(desc(auditLog.at), desc(auditLog.id))
        .limit(limit);
      return rows.map((row) => ({ ...row, id: String(row.id), at: row.at.toISOString() }));
    },
  };
}
export type AuditRepository = ReturnType<typeof createAuditRepository>;
