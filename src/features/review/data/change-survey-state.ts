import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ReviewStatusSchema, type ReviewReadings } from '@shared/schemas/review';
import { api } from '@/lib/api';
import { reviewKeys, surveyPath } from './review-keys';

/** The three moves of a survey through review: submit, sign off, reopen (with a reason). */
export type SurveyStateChange = { action: 'submit' } | { action: 'sign-off' } | { action: 'reopen'; reason: string };

export function changeSurveyState(organisationId: string, surveyId: string, change: SurveyStateChange) {
  const body = change.action === 'reopen' ? { reason: change.reason } : {};
  return api.post(`${surveyPath(organisationId, surveyId)}/${change.action}`, body, ReviewStatusSchema);
}

export function useChangeSurveyState(organisationId: string, surveyId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (change: SurveyStateChange) => changeSurveyState(organisationId, surveyId, change),
    // The answer is the survey's new status: show it at once rather than after the readings are fetched
    // again (a large survey's table takes seconds); the refetch below brings the rest.
    onSuccess: (status) => client.setQueryData<ReviewReadings>(reviewKeys.readings(organisationId, surveyId), (old) => (old ? { ...old, status } : old)),
    onSettled: () => client.invalidateQueries({ queryKey: reviewKeys.survey(organisationId, surveyId) }),
  });
}
