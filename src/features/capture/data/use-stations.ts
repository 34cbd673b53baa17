import { useLiveQuery } from 'dexie-react-hooks';
import type { Station } from '@shared/schemas/capture';
import { db, normaliseStation } from '@/db';

export type StationWithField = Station & { latestFieldT: number | null };

/** Live stations of a survey on one level (tombstones left out), each with |B| of its newest reading. Undefined while loading. */
export function getStations(surveyId: string, levelId: string): Promise<StationWithField[]> {
  return db.stations
    .where('[surveyId+levelId]')
    .equals([surveyId, levelId])
    // Filter after toArray: a Dexie .filter() walks a cursor (one IndexedDB round trip per row), while a
    // plain index range is one getAll — for 5,000 stations about 1.5 s against tens of ms in Chromium.
    .toArray()
    .then((rows) => rows.filter((s) => !s.deleted).map(normaliseStation));
}

export function useStations(surveyId: string, levelId: string | null | undefined): StationWithField[] | undefined {
  return useLiveQuery(() => (levelId ? getStations(surveyId, levelId) : Promise.resolve([])), [surveyId, levelId]);
}
