import { queryOptions, useQuery } from '@tanstack/react-query';
import { SiteDetailSchema } from '@shared/schemas/site';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function getSite(organisationId: string, siteId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}`, SiteDetailSchema, { signal });
}

export const siteQueryOptions = (organisationId: string, siteId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.site(organisationId, siteId),
    queryFn: ({ signal }) => getSite(organisationId, siteId, { signal }),
    enabled: organisationId !== '' && siteId !== '',
  });

export function useSite(organisationId: string, siteId: string) {
  return useQuery(siteQueryOptions(organisationId, siteId));
}
