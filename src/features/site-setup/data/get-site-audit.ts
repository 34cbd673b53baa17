import { queryOptions, useQuery } from '@tanstack/react-query';
import { AuditListSchema } from '@shared/schemas/audit';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export const SITE_AUDIT_LIMIT = 100;

export function getSiteAudit(organisationId: string, siteId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/audit?limit=${SITE_AUDIT_LIMIT}`, AuditListSchema, { signal });
}

export const siteAuditQueryOptions = (organisationId: string, siteId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.audit(organisationId, siteId),
    queryFn: ({ signal }) => getSiteAudit(organisationId, siteId, { signal }),
  });

export function useSiteAudit(organisationId: string, siteId: string, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...siteAuditQueryOptions(organisationId, siteId), enabled: enabled && organisationId !== '' && siteId !== '' });
}
