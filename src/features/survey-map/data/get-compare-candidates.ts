import { queryOptions, useQuery } from '@tanstack/react-query';
import { SurveyListSchema } from '@shared/schemas/home';
import { api } from '@/lib/api';
import { surveyMapKeys } from './survey-map-keys';

/** The organisation's surveys, from which the signed-off ones of the same site are offered for comparison. */
export function getCompareCandidates(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/surveys`, SurveyListSchema, { signal });
}

export const compareCandidatesQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: surveyMapKeys.candidates(organisationId),
    queryFn: ({ signal }) => getCompareCandidates(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useCompareCandidates(organisationId: string) {
  return useQuery(compareCandidatesQueryOptions(organisationId));
}
