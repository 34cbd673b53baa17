import { queryOptions, useQuery } from '@tanstack/react-query';
import { SurveyListSchema } from '@shared/schemas/home';
import { api } from '@/lib/api';
import { homeKeys } from './home-keys';

export function getSurveys(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/surveys`, SurveyListSchema, { signal });
}

export const surveysQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: homeKeys.surveys(organisationId),
    queryFn: ({ signal }) => getSurveys(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useSurveys(organisationId: string) {
  return useQuery(surveysQueryOptions(organisationId));
}
