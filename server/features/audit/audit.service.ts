import type { AuditEntry } from '../../../shared/schemas/audit';
import type { AuditRepository } from './audit.repository';

export function createAuditService(repo: AuditRepository) {
  return {
    recent: (organisationId: string, limit: number): Promise<AuditEntry[]> => repo.recent(organisationId, limit),
  };
}
export type AuditService = ReturnType<typeof createAuditService>;
