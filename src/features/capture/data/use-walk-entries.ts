import type Dexie from 'dexie';
import { useLiveQuery } from 'dexie-react-hooks';
import type { FieldReading, Sweep } from '@shared/schemas/capture';
import { db, normaliseFieldReading, normaliseSweep, type FieldReadingRow } from '@/db';

export type WalkEntry = { kind: 'reading'; reading: FieldReadingRow } | { kind: 'sweep'; sweep: Sweep };

const measuredAt = (e: WalkEntry) => (e.kind === 'reading' ? e.reading.measuredAt : e.sweep.measuredAt);
const entryId = (e: WalkEntry) => (e.kind === 'reading' ? e.reading.id : e.sweep.id);

/**
 * A walk's live readings and sweeps, newest first (by measuredAt, then by id: v7 ids follow creation).
 * `limit` reads only the newest N of each from the [walkId+measuredAt] index, for long walks.
 */
export async function getWalkEntries(walkId: string, options: { limit?: number } = {}): Promise<WalkEntry[]> {
  const range = <T extends FieldReading | Sweep>(table: Dexie.Table<T, string>) => {
    let c = table.where('[walkId+measuredAt]').between([walkId, ''], [walkId, '\uffff']).reverse().filter((r) => !r.deleted);
    if (options.limit !== undefined) c = c.limit(options.limit);
    return c.toArray();
  };
  const [readings, sweeps] = await Promise.all([range(db.fieldReadings as unknown as Dexie.Table<FieldReading, string>), range(db.sweeps)]);
  const entries: WalkEntry[] = [
    ...readings.map((r) => ({ kind: 'reading' as const, reading: normaliseFieldReading(r as FieldReadingRow) })),
    ...sweeps.map((s) => ({ kind: 'sweep' as const, sweep: normaliseSweep(s) })),
  ];
  entries.sort((a, b) => (measuredAt(a) === measuredAt(b) ? (entryId(a) < entryId(b) ? 1 : -1) : measuredAt(a) < measuredAt(b) ? 1 : -1));
  return options.limit !== undefined ? entries.slice(0, options.limit) : entries;
}

export function useWalkEntries(walkId: string | null | undefined, options: { limit?: number } = {}): WalkEntry[] | undefined {
  const { limit } = options;
  return useLiveQuery(() => (walkId ? getWalkEntries(walkId, { limit }) : Promise.resolve([])), [walkId, limit]);
}
