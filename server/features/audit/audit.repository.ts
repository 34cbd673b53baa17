import type { AuditEntry } from '../../../shared/schemas/audit';
import { listAuditEntries } from '../../db/audit';
import type { Db } from '../../db/client';

export function createAuditRepository(db: Db) {
  return {
    /** Newest first, this organisation's rows only. */
    async recent(organisationId: string, limit: number): Promise<AuditEntry[]> {
      return listAuditEntries(db, organisationId, limit);
    },
  };
}
export type AuditRepository = ReturnType<typeof createAuditRepository>;
