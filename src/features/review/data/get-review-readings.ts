import { queryOptions, useQuery } from '@tanstack/react-query';
import { ReviewReadingsSchema, type ReviewReading } from '@shared/schemas/review';
import { api } from '@/lib/api';
import { reviewKeys, surveyPath } from './review-keys';

export async function getReviewReadings(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  const answer = await api.get(`${surveyPath(organisationId, surveyId)}/review/readings`, ReviewReadingsSchema, { signal });
  shareRepeatedValues(answer.readings);
  return answer;
}

const SHARED_FIELDS = ['kind', 'stationId', 'stationLabel', 'levelId', 'levelName', 'roomId', 'roomName', 'surveyorUserId', 'surveyorName', 'instrumentId', 'instrumentLabel', 'calibrationDueOn', 'enteredUnit'] as const;

/**
 * Makes the readings share one copy of each value that repeats across rows (names, ids of stations,
 * levels, rooms, people and instruments, the safety class), in place. A parsed answer holds its own copy
 * of every string in every row: for 100,000 readings that is tens of megabytes more for the garbage
 * collector to walk on every pass while the table scrolls. The values themselves do not change.
 */
export function shareRepeatedValues(rows: ReviewReading[]): void {
  const strings = new Map<string, string>();
  const classes = new Map<string, NonNullable<ReviewReading['safetyClass']>>();
  const share = (value: string) => {
    const known = strings.get(value);
    if (known !== undefined) return known;
    strings.set(value, value);
    return value;
  };
  for (const row of rows) {
    const target = row as unknown as Record<string, unknown>;
    for (const field of SHARED_FIELDS) {
      const value = target[field];
      if (typeof value === 'string') target[field] = share(value);
    }
    if (row.safetyClass) {
      const key = `${row.safetyClass.index}\u0000${row.safetyClass.label}`;
      const known = classes.get(key);
      if (known) row.safetyClass = known;
      else classes.set(key, row.safetyClass);
    }
  }
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
