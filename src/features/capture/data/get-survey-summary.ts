import { queryOptions, useQuery } from '@tanstack/react-query';
import { SurveySummarySchema } from '@shared/schemas/home';
import { api } from '@/lib/api';

/** Query keys of the capture feature's server reads (one factory, never retyped). */
export const captureKeys = {
  all: ['capture'] as const,
  survey: (organisationId: string, surveyId: string) => [...captureKeys.all, 'survey', organisationId, surveyId] as const,
};

export function getSurveySummary(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}`, SurveySummarySchema, { signal });
}

export const surveySummaryQueryOptions = (organisationId: string, surveyId: string) =>
  queryOptions({
    queryKey: captureKeys.survey(organisationId, surveyId),
    queryFn: ({ signal }) => getSurveySummary(organisationId, surveyId, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
  });

/** The server's summary of a survey (persisted by the query persister for offline reading). */
export function useSurveySummary(organisationId: string, surveyId: string) {
  return useQuery(surveySummaryQueryOptions(organisationId, surveyId));
}
