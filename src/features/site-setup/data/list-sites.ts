import { queryOptions, useQuery } from '@tanstack/react-query';
import { SiteListSchema } from '@shared/schemas/home';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function listSites(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/sites`, SiteListSchema, { signal });
}

export const sitesQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.sites(organisationId),
    queryFn: ({ signal }) => listSites(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useSiteList(organisationId: string) {
  return useQuery(sitesQueryOptions(organisationId));
}
