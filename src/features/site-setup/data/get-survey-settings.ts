import { queryOptions, useQuery } from '@tanstack/react-query';
import { SurveySettingsSchema } from '@shared/schemas/survey-setup';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function getSurveySettings(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/surveys/${encodeURIComponent(surveyId)}/settings`, SurveySettingsSchema, { signal });
}

export const surveySettingsQueryOptions = (organisationId: string, surveyId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.survey(organisationId, surveyId),
    queryFn: ({ signal }) => getSurveySettings(organisationId, surveyId, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
  });

export function useSurveySettings(organisationId: string, surveyId: string) {
  return useQuery(surveySettingsQueryOptions(organisationId, surveyId));
}
