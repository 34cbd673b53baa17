import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { SurveyAssignmentsResultSchema, type SurveyAssignmentsInputSchema } from '@shared/schemas/survey-setup';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type SurveyTeamInput = z.input<typeof SurveyAssignmentsInputSchema>;

/** Sets the whole team; the server e-mails newly added surveyors and says whom (`mailed`). */
export function setSurveyTeam(organisationId: string, surveyId: string, body: SurveyTeamInput) {
  return apiRequest(`${orgPath(organisationId)}/surveys/${encodeURIComponent(surveyId)}/assignments`, {
    method: 'PUT',
    body,
    schema: SurveyAssignmentsResultSchema,
  });
}

export function useSetSurveyTeam(organisationId: string, surveyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SurveyTeamInput) => setSurveyTeam(organisationId, surveyId, body),
    meta: { toastErrors: true },
    onSuccess: (result) => queryClient.setQueryData(siteSetupKeys.survey(organisationId, surveyId), result.survey),
  });
}
