import { queryOptions, useQuery } from '@tanstack/react-query';
import { ReviewReadingsSchema, type ReviewReading } from '@shared/schemas/review';
import { api } from '@/lib/api';
import { reviewKeys, surveyPath } from './review-keys';

export async function getReviewReadings(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  const answer = await api.get(`${surveyPath(organisationId, surveyId)}/review/readings`, ReviewReadingsSchema, { signal });
  return { ...answer, readings: compactReadings(answer.readings) };
}

/**
 * The readings again, each as a plain object of one fixed shape, sharing one copy of every value that
 * repeats across rows (names, ids of stations, levels, rooms, people and instruments, the safety class).
 *
 * The parsed answer's rows are objects whose properties were added one by one, which the JavaScript
 * engine keeps as hash tables (about 800 bytes a row, measured with a heap snapshot of a 100,000-row
 * survey: 85 MB of the page's 110 MB), each with its own copy of every string. An object literal with
 * every field in one order is a compact record instead, and the shared strings are stored once: far
 * less for the garbage collector to walk on each pass while the table scrolls. No value changes.
 */
export function compactReadings(rows: readonly ReviewReading[]): ReviewReading[] {
  const strings = new Map<string, string>();
  const classes = new Map<string, NonNullable<ReviewReading['safetyClass']>>();
  const share = <T extends string | null>(value: T): T => {
    if (value === null) return value;
    const known = strings.get(value);
    if (known !== undefined) return known as T;
    strings.set(value, value);
    return value;
  };
  const shareClass = (c: ReviewReading['safetyClass']) => {
    if (!c) return null;
    const key = `${c.index}\u0000${c.label}`;
    let known = classes.get(key);
    if (!known) classes.set(key, (known = { index: c.index, label: share(c.label) }));
    return known;
  };
  return rows.map(
    (r): ReviewReading => ({
      id: r.id,
      kind: share(r.kind),
      revision: r.revision,
      stationId: share(r.stationId),
      stationLabel: share(r.stationLabel),
      levelId: share(r.levelId),
      levelName: share(r.levelName),
      roomId: share(r.roomId),
      roomName: share(r.roomName),
      surveyorUserId: share(r.surveyorUserId),
      surveyorName: share(r.surveyorName),
      instrumentId: share(r.instrumentId),
      instrumentLabel: share(r.instrumentLabel),
      calibrationDueOn: share(r.calibrationDueOn),
      calibrationOverdue: r.calibrationOverdue,
      measuredAt: r.measuredAt,
      fieldT: r.fieldT,
      enteredUnit: share(r.enteredUnit),
      sweep: r.sweep && { startHz: r.sweep.startHz, stopHz: r.sweep.stopHz, peakCount: r.sweep.peakCount, strongestPeakDbm: r.sweep.strongestPeakDbm },
      safetyClass: shareClass(r.safetyClass),
      notes: r.notes,
      conflicted: r.conflicted,
      attachmentPending: r.attachmentPending,
      decision: r.decision && {
        id: r.decision.id,
        verdict: r.decision.verdict,
        note: r.decision.note,
        reviewerUserId: share(r.decision.reviewerUserId),
        reviewerName: share(r.decision.reviewerName),
        decidedAt: r.decision.decidedAt,
        revision: r.decision.revision,
      },
    }),
  );
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
