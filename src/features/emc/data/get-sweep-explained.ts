import { queryOptions, useQuery } from '@tanstack/react-query';
import { SweepExplainedSchema } from '@shared/schemas/emc-sweep';
import { api } from '@/lib/api';
import { emcKeys } from './emc-keys';

/** Query keys of sweeps explained, under the EMC feature's survey key (emc-keys.ts), so invalidating a survey's EMC data refreshes them too. */
export const sweepKeys = {
  survey: (organisationId: string, surveyId: string) => [...emcKeys.survey(organisationId, surveyId), 'sweeps'] as const,
  explained: (organisationId: string, surveyId: string, sweepId: string) => [...sweepKeys.survey(organisationId, surveyId), sweepId, 'explained'] as const,
};

const sweepsPath = (organisationId: string, surveyId: string) => `/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}/sweeps`;

/** One sweep with its predicted lines, watch bands, peaks explained and thinned trace (issue 8 §4). */
export function getSweepExplained(organisationId: string, surveyId: string, sweepId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${sweepsPath(organisationId, surveyId)}/${encodeURIComponent(sweepId)}/explained`, SweepExplainedSchema, { signal });
}

export const sweepExplainedQueryOptions = (organisationId: string, surveyId: string, sweepId: string) =>
  queryOptions({
    queryKey: sweepKeys.explained(organisationId, surveyId, sweepId),
    queryFn: ({ signal }) => getSweepExplained(organisationId, surveyId, sweepId, { signal }),
    enabled: organisationId !== '' && surveyId !== '' && sweepId !== '',
  });

export function useSweepExplained(organisationId: string, surveyId: string, sweepId: string) {
  return useQuery(sweepExplainedQueryOptions(organisationId, surveyId, sweepId));
}
