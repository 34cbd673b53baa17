import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { SurveySettingsSchema, type SurveyCreateSchema, type SurveyUpdateSchema } from '@shared/schemas/survey-setup';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type SurveyCreateInput = z.input<typeof SurveyCreateSchema>;
export type SurveyUpdateInput = z.input<typeof SurveyUpdateSchema>;

export function createSurvey(organisationId: string, siteId: string, body: SurveyCreateInput) {
  return apiRequest(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/surveys`, { method: 'POST', body, schema: SurveySettingsSchema });
}

export function updateSurvey(organisationId: string, surveyId: string, body: SurveyUpdateInput) {
  return apiRequest(`${orgPath(organisationId)}/surveys/${encodeURIComponent(surveyId)}`, { method: 'PATCH', body, schema: SurveySettingsSchema });
}

export function useSaveSurvey(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ surveyId, body }: { surveyId?: string; body: SurveyCreateInput }) =>
      surveyId ? updateSurvey(organisationId, surveyId, body) : createSurvey(organisationId, siteId, body),
    onSuccess: (survey) => {
      queryClient.setQueryData(siteSetupKeys.survey(organisationId, survey.id), survey);
      return queryClient.invalidateQueries({ queryKey: siteSetupKeys.siteSurveys(organisationId, siteId) });
    },
  });
}
