import { useLiveQuery } from 'dexie-react-hooks';
import type { CaptureEntity } from '@shared/schemas/capture';
import { db } from '@/db';

export interface PendingCounts {
  readings: number;
  sweeps: number;
  stations: number;
  walks: number;
  /** Records (not mutations) waiting: three edits of one reading count once. */
  total: number;
  /** Of those, how many the server refused and the surveyor must fix. */
  rejected: number;
}

const EMPTY: PendingCounts = { readings: 0, sweeps: 0, stations: 0, walks: 0, total: 0, rejected: 0 };

/**
 * Records not yet synced, per survey (or across all surveys): counted from the keys of the outbox's
 * [surveyId+entity+recordId] index alone, so thousands of queued payloads are never read.
 */
export async function getPendingCounts(surveyId?: string): Promise<PendingCounts> {
  // [surveyId] sorts before every [surveyId, entity, recordId] and [surveyId, '\uffff'] after them
  // (IndexedDB compares arrays element by element, a shorter prefix first).
  const keys = (await (surveyId
    ? db.outbox.where('[surveyId+entity+recordId]').between([surveyId], [surveyId, '\uffff'])
    : db.outbox.orderBy('[surveyId+entity+recordId]')
  ).uniqueKeys()) as unknown as [string, CaptureEntity, string][];
  const counts = { ...EMPTY };
  for (const [, entity] of keys) {
    if (entity === 'field_readings') counts.readings++;
    else if (entity === 'sweeps') counts.sweeps++;
    else if (entity === 'stations') counts.stations++;
    else if (entity === 'walks') counts.walks++;
  }
  counts.total = keys.length;
  const rejected = await db.outbox.where('status').equals('rejected').toArray();
  counts.rejected = new Set(rejected.filter((m) => !surveyId || m.surveyId === surveyId).map((m) => m.recordId)).size;
  return counts;
}

export function usePendingCounts(surveyId?: string): PendingCounts | undefined {
  return useLiveQuery(() => getPendingCounts(surveyId), [surveyId]);
}

/** "14 readings not yet synced", "1 reading and 2 sweeps not yet synced", or null when nothing waits. */
export function pendingSummary(counts: PendingCounts): string | null {
  const parts: string[] = [];
  const part = (n: number, one: string, many: string) => n > 0 && parts.push(`${n} ${n === 1 ? one : many}`);
  part(counts.readings, 'reading', 'readings');
  part(counts.sweeps, 'sweep', 'sweeps');
  part(counts.stations, 'station', 'stations');
  if (parts.length === 0) {
    if (counts.total === 0) return null;
    parts.push(`${counts.total} ${counts.total === 1 ? 'change' : 'changes'}`);
  }
  const text = parts.length > 1 ? `${parts.slice(0, -1).join(', ')} and ${parts.at(-1)}` : parts[0];
  return `${text} not yet synced`;
}
