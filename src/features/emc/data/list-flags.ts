import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { EmcFlagListSchema } from '@shared/schemas/emc';
import { api } from '@/lib/api';
import { emcKeys, surveyEmcPath } from './emc-keys';

export function listFlags(organisationId: string, surveyId: string, victimDistanceM: number, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${surveyEmcPath(organisationId, surveyId)}/flags?victimDistanceM=${encodeURIComponent(victimDistanceM)}`, EmcFlagListSchema, { signal });
}

export const flagsQueryOptions = (organisationId: string, surveyId: string, victimDistanceM: number) =>
  queryOptions({
    queryKey: emcKeys.flags(organisationId, surveyId, victimDistanceM),
    queryFn: ({ signal }) => listFlags(organisationId, surveyId, victimDistanceM, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
    // The flag job recomputes in the background: look again now and then while the page is open.
    refetchInterval: 30_000,
    placeholderData: keepPreviousData,
  });

export function useFlags(organisationId: string, surveyId: string, victimDistanceM: number) {
  return useQuery(flagsQueryOptions(organisationId, surveyId, victimDistanceM));
}
