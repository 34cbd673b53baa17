import { queryOptions, useQuery } from '@tanstack/react-query';
import { SurveyReportSchema } from '@shared/schemas/review';
import { api } from '@/lib/api';
import { reviewKeys, surveyPath } from './review-keys';

export function getSurveyReport(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${surveyPath(organisationId, surveyId)}/report`, SurveyReportSchema, { signal });
}

export const surveyReportQueryOptions = (organisationId: string, surveyId: string) =>
  queryOptions({
    queryKey: reviewKeys.report(organisationId, surveyId),
    queryFn: ({ signal }) => getSurveyReport(organisationId, surveyId, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
    // Other reviewers and syncing devices change this all the time: refetch whenever it is shown.
    staleTime: 0,
  });

export function useSurveyReport(organisationId: string, surveyId: string) {
  return useQuery(surveyReportQueryOptions(organisationId, surveyId));
}

/** Where the readings CSV downloads from (a plain link: the browser saves it). */
export const readingsCsvUrl = (organisationId: string, surveyId: string) => `${surveyPath(organisationId, surveyId)}/exports/readings.csv`;
