import { queryOptions, useQuery } from '@tanstack/react-query';
import { ReviewReadingsSchema } from '@shared/schemas/review';
import { api } from '@/lib/api';
import { reviewKeys, surveyPath } from './review-keys';

export function getReviewReadings(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${surveyPath(organisationId, surveyId)}/review/readings`, ReviewReadingsSchema, { signal });
}

export const reviewReadingsQueryOptions = (organisationId: string, surveyId: string) =>
  queryOptions({
    queryKey: reviewKeys.readings(organisationId, surveyId),
    queryFn: ({ signal }) => getReviewReadings(organisationId, surveyId, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
    // Other reviewers and syncing devices change this all the time: refetch whenever it is shown.
    staleTime: 0,
    // Deciding needs the network anyway, and a large survey's table (100,000 rows is tens of MB) would
    // crowd the offline store out of localStorage: the report is what is kept for offline reading.
    meta: { persist: false },
  });

export function useReviewReadings(organisationId: string, surveyId: string) {
  return useQuery(reviewReadingsQueryOptions(organisationId, surveyId));
}
