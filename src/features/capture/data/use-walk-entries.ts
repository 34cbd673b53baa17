import type Dexie from 'dexie';
import { useLiveQuery } from 'dexie-react-hooks';
import type { FieldReading, Sweep } from '@shared/schemas/capture';
import { db, normaliseFieldReading, normaliseSweep, type FieldReadingRow } from '@/db';

export type WalkEntry = { kind: 'reading'; reading: FieldReadingRow } | { kind: 'sweep'; sweep: Sweep };

const measuredAt = (e: WalkEntry) => (e.kind === 'reading' ? e.reading.measuredAt : e.sweep.measuredAt);
export const walkEntryId = (e: WalkEntry) => (e.kind === 'reading' ? e.reading.id : e.sweep.id);
const entryId = walkEntryId;

/** The walk list's order: newest measuredAt first, then the newer id (v7 ids follow creation). */
export const newestFirst = (a: WalkEntry, b: WalkEntry) => (measuredAt(a) === measuredAt(b) ? (entryId(a) < entryId(b) ? 1 : -1) : measuredAt(a) < measuredAt(b) ? 1 : -1);

/**
 * A walk's live readings and sweeps, newest first (by measuredAt, then by id: v7 ids follow creation).
 * `limit` reads only the newest N of each from the [walkId+measuredAt] index, for long walks.
 */
export async function getWalkEntries(walkId: string, options: { limit?: number } = {}): Promise<WalkEntry[]> {
  const { limit } = options;
  // A plain index range with a limit is one getAll (newest first); a Dexie .filter() would walk a cursor,
  // one IndexedDB round trip per row. Tombstones are left out afterwards: when they ate into the page,
  // read a longer one.
  const range = async <T extends FieldReading | Sweep>(table: Dexie.Table<T, string>): Promise<T[]> => {
    const newestFirst = () => table.where('[walkId+measuredAt]').between([walkId, ''], [walkId, '\uffff']).reverse();
    if (limit === undefined) return (await newestFirst().toArray()).filter((r) => !r.deleted);
    for (let page = limit + 8; ; page *= 4) {
      const rows = await newestFirst().limit(page).toArray();
      const live = rows.filter((r) => !r.deleted);
      if (live.length >= limit || rows.length < page) return live.slice(0, limit);
    }
  };
  const [readings, sweeps] = await Promise.all([range(db.fieldReadings as unknown as Dexie.Table<FieldReading, string>), range(db.sweeps)]);
  const entries: WalkEntry[] = [
    ...readings.map((r) => ({ kind: 'reading' as const, reading: normaliseFieldReading(r as FieldReadingRow) })),
    ...sweeps.map((s) => ({ kind: 'sweep' as const, sweep: normaliseSweep(s) })),
  ];
  entries.sort(newestFirst);
  return options.limit !== undefined ? entries.slice(0, options.limit) : entries;
}

export function useWalkEntries(walkId: string | null | undefined, options: { limit?: number } = {}): WalkEntry[] | undefined {
  const { limit } = options;
  return useLiveQuery(() => (walkId ? getWalkEntries(walkId, { limit }) : Promise.resolve([])), [walkId, limit]);
}
