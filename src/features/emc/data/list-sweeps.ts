import { queryOptions, useQuery } from '@tanstack/react-query';
import { SweepListSchema } from '@shared/schemas/emc-sweep';
import { api } from '@/lib/api';
import { sweepKeys } from './get-sweep-explained';

export function listSweeps(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}/sweeps`, SweepListSchema, { signal });
}

export const sweepsQueryOptions = (organisationId: string, surveyId: string) =>
  queryOptions({
    queryKey: [...sweepKeys.survey(organisationId, surveyId), 'list'] as const,
    queryFn: ({ signal }) => listSweeps(organisationId, surveyId, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
  });

/** The survey's analyser sweeps with where they were taken and how many markers the lines explain. */
export function useSweeps(organisationId: string, surveyId: string) {
  return useQuery(sweepsQueryOptions(organisationId, surveyId));
}
