import { queryOptions, useQuery } from '@tanstack/react-query';
import { EmitterListSchema } from '@shared/schemas/emitter';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function listEmitters(organisationId: string, siteId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/emitters`, EmitterListSchema, { signal });
}

export const emittersQueryOptions = (organisationId: string, siteId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.emitters(organisationId, siteId),
    queryFn: ({ signal }) => listEmitters(organisationId, siteId, { signal }),
    enabled: organisationId !== '' && siteId !== '',
  });

export function useEmitters(organisationId: string, siteId: string) {
  return useQuery(emittersQueryOptions(organisationId, siteId));
}
