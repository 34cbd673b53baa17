import { queryOptions, useQuery } from '@tanstack/react-query';
import { ZoneSetListSchema } from '@shared/schemas/survey-setup';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function listZoneSets(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/zone-sets`, ZoneSetListSchema, { signal });
}

export const zoneSetsQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.zoneSets(organisationId),
    queryFn: ({ signal }) => listZoneSets(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useZoneSets(organisationId: string) {
  return useQuery(zoneSetsQueryOptions(organisationId));
}
