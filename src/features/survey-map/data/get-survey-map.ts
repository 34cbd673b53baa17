import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { SurveyMapSchema } from '@shared/schemas/survey-map';
import { api } from '@/lib/api';
import { surveyMapKeys } from './survey-map-keys';

const levelsParam = (extraLevelsT: readonly number[]) => (extraLevelsT.length ? `?levels=${encodeURIComponent(extraLevelsT.join(','))}` : '');

export function getSurveyMap(organisationId: string, surveyId: string, extraLevelsT: readonly number[], { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}/map${levelsParam(extraLevelsT)}`, SurveyMapSchema, { signal });
}

export const surveyMapQueryOptions = (organisationId: string, surveyId: string, extraLevelsT: readonly number[]) =>
  queryOptions({
    queryKey: surveyMapKeys.map(organisationId, surveyId, extraLevelsT),
    queryFn: ({ signal }) => getSurveyMap(organisationId, surveyId, extraLevelsT, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
    placeholderData: keepPreviousData,
    // A survey map can run to megabytes: more than localStorage holds. It is fetched again when online.
    meta: { persist: false },
  });

export function useSurveyMap(organisationId: string, surveyId: string, extraLevelsT: readonly number[]) {
  return useQuery(surveyMapQueryOptions(organisationId, surveyId, extraLevelsT));
}
