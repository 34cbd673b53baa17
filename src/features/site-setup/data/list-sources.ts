import { queryOptions, useQuery } from '@tanstack/react-query';
import { SourceListSchema } from '@shared/schemas/source';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function listSources(organisationId: string, siteId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/sources`, SourceListSchema, { signal });
}

export const sourcesQueryOptions = (organisationId: string, siteId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.sources(organisationId, siteId),
    queryFn: ({ signal }) => listSources(organisationId, siteId, { signal }),
    enabled: organisationId !== '' && siteId !== '',
  });

export function useSources(organisationId: string, siteId: string) {
  return useQuery(sourcesQueryOptions(organisationId, siteId));
}
