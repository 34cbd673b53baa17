import { queryOptions, useQuery } from '@tanstack/react-query';
import { SiteListSchema } from '@shared/schemas/home';
import { api } from '@/lib/api';
import { homeKeys } from './home-keys';

export function getSites(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/sites`, SiteListSchema, { signal });
}

export const sitesQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: homeKeys.sites(organisationId),
    queryFn: ({ signal }) => getSites(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useSites(organisationId: string) {
  return useQuery(sitesQueryOptions(organisationId));
}
