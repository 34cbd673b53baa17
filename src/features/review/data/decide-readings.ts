import { useMutation, useQueryClient } from '@tanstack/react-query';
import { DecisionsResultSchema, type DecisionsInput } from '@shared/schemas/review';
import { api } from '@/lib/api';
import { reviewKeys, surveyPath } from './review-keys';

export function decideReadings(organisationId: string, surveyId: string, input: DecisionsInput) {
  return api.post(`${surveyPath(organisationId, surveyId)}/decisions`, input, DecisionsResultSchema);
}

export function useDecideReadings(organisationId: string, surveyId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: DecisionsInput) => decideReadings(organisationId, surveyId, input),
    onSettled: () => client.invalidateQueries({ queryKey: reviewKeys.survey(organisationId, surveyId) }),
  });
}
