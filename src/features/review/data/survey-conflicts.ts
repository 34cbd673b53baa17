import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { ConflictListSchema, ResolveConflictResultSchema, type ResolveConflict } from '@shared/schemas/sync';
import { api } from '@/lib/api';
import { reviewKeys } from './review-keys';

/** The survey's open sync conflicts, from the sync feature's own endpoint. */
export function getSurveyConflicts(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  const query = new URLSearchParams({ surveyId, state: 'open' });
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/sync/conflicts?${query}`, ConflictListSchema, { signal });
}

export const surveyConflictsQueryOptions = (organisationId: string, surveyId: string) =>
  queryOptions({
    queryKey: reviewKeys.conflicts(organisationId, surveyId),
    queryFn: ({ signal }) => getSurveyConflicts(organisationId, surveyId, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
    // Other reviewers and syncing devices change this all the time: refetch whenever it is shown.
    staleTime: 0,
  });

export function useSurveyConflicts(organisationId: string, surveyId: string) {
  return useQuery(surveyConflictsQueryOptions(organisationId, surveyId));
}

export function resolveConflict(organisationId: string, conflictId: string, input: ResolveConflict) {
  return api.post(`/api/orgs/${encodeURIComponent(organisationId)}/sync/conflicts/${encodeURIComponent(conflictId)}/resolve`, input, ResolveConflictResultSchema);
}

export function useResolveConflict(organisationId: string, surveyId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ conflictId, ...input }: ResolveConflict & { conflictId: string }) => resolveConflict(organisationId, conflictId, input),
    onSettled: () => client.invalidateQueries({ queryKey: reviewKeys.survey(organisationId, surveyId) }),
  });
}
