import { liveQuery } from 'dexie';
import { useMemo, useSyncExternalStore } from 'react';
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

/** Pending counts of every survey on the device, and of all of them together. */
export interface PendingSnapshot {
  all: PendingCounts;
  bySurvey: ReadonlyMap<string, PendingCounts>;
}

/** What the counts were built from: the outbox up to lastSeq, its record keys ("surveyId entity recordId") and how many mutations. */
interface KeyCache {
  lastSeq: number;
  mutations: number;
  keys: Map<string, { surveyId: string; entity: CaptureEntity }>;
}
/** Per open database: a deleted and re-made store starts afresh. */
const keyCaches = new WeakMap<object, KeyCache>();

const keyOf = (surveyId: string, entity: string, recordId: string) => `${surveyId} ${entity} ${recordId}`;

function tally(counts: PendingCounts, entity: CaptureEntity) {
  counts.total++;
  if (entity === 'field_readings') counts.readings++;
  else if (entity === 'sweeps') counts.sweeps++;
  else if (entity === 'stations') counts.stations++;
  else if (entity === 'walks') counts.walks++;
}

/**
 * Records not yet synced on this device, per survey and in all, from the keys of the outbox's
 * [surveyId+entity+recordId] index, so thousands of queued payloads are never read. A save only
 * appends (the auto-incremented seq grows), so after the first full pass the counts are brought up to
 * date from the entries past the last seq seen; when anything left the outbox (a push, a resend) the
 * mutation count no longer adds up and the keys are read again.
 */
export async function getPendingSnapshot(): Promise<PendingSnapshot> {
  const { keys, rejected } = await db.transaction('r', db.outbox, async () => {
    const mutations = await db.outbox.count();
    let cache = keyCaches.get(db.backendDB());
    if (cache) {
      const fresh = await db.outbox.where(':id').above(cache.lastSeq).toArray();
      if (cache.mutations + fresh.length === mutations) {
        for (const m of fresh) {
          cache.keys.set(keyOf(m.surveyId, m.entity, m.recordId), { surveyId: m.surveyId, entity: m.entity });
          cache.lastSeq = Math.max(cache.lastSeq, m.seq ?? 0);
        }
        cache.mutations = mutations;
      } else cache = undefined;
    }
    if (!cache) {
      const indexKeys = (await db.outbox.orderBy('[surveyId+entity+recordId]').uniqueKeys()) as unknown as [string, CaptureEntity, string][];
      cache = {
        lastSeq: ((await db.outbox.orderBy(':id').lastKey()) as number | undefined) ?? 0,
        mutations,
        keys: new Map(indexKeys.map(([surveyId, entity, recordId]) => [keyOf(surveyId, entity, recordId), { surveyId, entity }])),
      };
      keyCaches.set(db.backendDB(), cache);
    }
    return { keys: [...cache.keys.values()], rejected: await db.outbox.where('status').equals('rejected').toArray() };
  });
  const all = { ...EMPTY };
  const bySurvey = new Map<string, PendingCounts>();
  const of = (surveyId: string) => {
    let counts = bySurvey.get(surveyId);
    if (!counts) bySurvey.set(surveyId, (counts = { ...EMPTY }));
    return counts;
  };
  for (const { surveyId, entity } of keys) {
    tally(all, entity);
    tally(of(surveyId), entity);
  }
  const refused = new Map<string, string>();
  for (const m of rejected) refused.set(m.recordId, m.surveyId);
  for (const surveyId of refused.values()) {
    all.rejected++;
    of(surveyId).rejected++;
  }
  return { all, bySurvey };
}

const pick = (snapshot: PendingSnapshot, surveyId?: string): PendingCounts => (surveyId === undefined ? snapshot.all : (snapshot.bySurvey.get(surveyId) ?? EMPTY));

/** Records not yet synced, in one survey or (no id) across all surveys on the device. */
export async function getPendingCounts(surveyId?: string): Promise<PendingCounts> {
  return pick(await getPendingSnapshot(), surveyId);
}

// One live query for every component that shows a count (the header's and the capture screen's): a
// save wakes one query, not one per place the figure is shown.
let shared: PendingSnapshot | undefined;
let subscription: { unsubscribe(): void } | null = null;
const listeners = new Set<() => void>();

function subscribeShared(listener: () => void): () => void {
  listeners.add(listener);
  if (!subscription) {
    subscription = liveQuery(getPendingSnapshot).subscribe({
      next: (value) => {
        shared = value;
        for (const l of listeners) l();
      },
      // A failed read leaves the last figure; the next change reads again.
      error: () => undefined,
    });
  }
  return () => {
    listeners.delete(listener);
    if (listeners.size === 0 && subscription) {
      subscription.unsubscribe();
      subscription = null;
      shared = undefined;
    }
  };
}

/** Live pending counts of one survey, or (no id) of the device; undefined until first read. */
export function usePendingCounts(surveyId?: string): PendingCounts | undefined {
  const snapshot = useSyncExternalStore(subscribeShared, () => shared, () => undefined);
  return useMemo(() => (snapshot ? pick(snapshot, surveyId) : undefined), [snapshot, surveyId]);
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
