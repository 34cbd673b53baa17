import { queryOptions, useQuery } from '@tanstack/react-query';
import { SurveyCompareSchema } from '@shared/schemas/survey-map';
import { api } from '@/lib/api';
import { surveyMapKeys } from './survey-map-keys';

export function getSurveyCompare(
  organisationId: string,
  surveyId: string,
  withSurveyId: string,
  extraLevelsT: readonly number[],
  bearingsDeg: readonly number[],
  { signal }: { signal?: AbortSignal } = {},
) {
  const params = new URLSearchParams({ with: withSurveyId });
  if (extraLevelsT.length) params.set('levels', extraLevelsT.join(','));
  if (bearingsDeg.length) params.set('bearings', bearingsDeg.join(','));
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}/compare?${params.toString()}`, SurveyCompareSchema, { signal });
}

export const surveyCompareQueryOptions = (organisationId: string, surveyId: string, withSurveyId: string, extraLevelsT: readonly number[], bearingsDeg: readonly number[]) =>
  queryOptions({
    queryKey: surveyMapKeys.compare(organisationId, surveyId, withSurveyId, extraLevelsT, bearingsDeg),
    queryFn: ({ signal }) => getSurveyCompare(organisationId, surveyId, withSurveyId, extraLevelsT, bearingsDeg, { signal }),
    enabled: organisationId !== '' && surveyId !== '' && withSurveyId !== '',
    meta: { persist: false },
  });

export function useSurveyCompare(organisationId: string, surveyId: string, withSurveyId: string, extraLevelsT: readonly number[], bearingsDeg: readonly number[]) {
  return useQuery(surveyCompareQueryOptions(organisationId, surveyId, withSurveyId, extraLevelsT, bearingsDeg));
}
