import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { MriBandSuggestionListSchema, WatchBandSchema } from '@shared/schemas/watch-band';
import { api } from '@/lib/api';
import { emcKeys } from './emc-keys';

const sitePath = (organisationId: string, siteId: string) => `/api/orgs/${encodeURIComponent(organisationId)}/sites/${encodeURIComponent(siteId)}/mri-bands`;

export function listMriBands(organisationId: string, siteId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(sitePath(organisationId, siteId), MriBandSuggestionListSchema, { signal });
}

export const mriBandsQueryOptions = (organisationId: string, siteId: string) =>
  queryOptions({
    queryKey: emcKeys.mriBands(organisationId, siteId),
    queryFn: ({ signal }) => listMriBands(organisationId, siteId, { signal }),
    enabled: organisationId !== '' && siteId !== '',
  });

export function useMriBands(organisationId: string, siteId: string) {
  return useQuery(mriBandsQueryOptions(organisationId, siteId));
}

export function addMriBand(organisationId: string, siteId: string, sourceId: string) {
  return api.post(`${sitePath(organisationId, siteId)}/${encodeURIComponent(sourceId)}`, {}, WatchBandSchema);
}

export function useAddMriBand(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (sourceId: string) => addMriBand(organisationId, siteId, sourceId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: emcKeys.org(organisationId) }),
  });
}
