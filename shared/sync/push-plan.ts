/**
 * How a device sends its outbox (DESIGN.md §4, Offline-first data flow 2): in queue order, in batches,
 * with up to PUSH_IN_FLIGHT batches on the way at once. The server applies concurrent pushes of one
 * organisation one after the other, in whichever order they reach it, so a batch may only set off
 * while others are on the way when their order cannot matter: it writes none of their records (two
 * changes of one record must arrive in queue order, or the later would read as a conflict with the
 * earlier) and names none of them as its station or walk (a reading must not overtake the station it
 * was taken at). Anything else waits for the batches before it to be answered, as if sent one by one.
 *
 * Two on the way hide one batch's round trip behind the other's work: on a mobile link most of a
 * push is waiting (every batch costs one round trip), and even on loopback the server's parsing and
 * checking of one batch overlaps PostgreSQL's writing of the other. Shared by the device's sync engine
 * (src/sync/push.ts) and the sync benchmark, which pushes the way a device does.
 */
import type { Mutation } from './mutation';

/** Mutations per batch: the protocol's maximum (PUSH_MAX_MUTATIONS), each push costs one round trip. */
export const PUSH_BATCH_SIZE = 500;
/** Batches on the way at once, at most. */
export const PUSH_IN_FLIGHT = 2;

/** Payload fields that name another captured record (the rest name set-up data, which never moves). */
const CAPTURED_REFERENCES = ['stationId', 'walkId'] as const;

/** What a batch writes (record ids) and which captured records its payloads name. */
export interface BatchFootprint {
  writes: Set<string>;
  names: Set<string>;
}

export function batchFootprint(mutations: readonly Pick<Mutation, 'recordId' | 'payload'>[]): BatchFootprint {
  const writes = new Set<string>();
  const names = new Set<string>();
  for (const m of mutations) {
    writes.add(m.recordId);
    for (const key of CAPTURED_REFERENCES) {
      const v = m.payload[key];
      if (typeof v === 'string') names.add(v);
    }
  }
  return { writes, names };
}

/** Whether `next` may set off while the batches of `onTheWay` have not been answered yet. */
export function mayOverlap(next: BatchFootprint, onTheWay: readonly BatchFootprint[]): boolean {
  if (onTheWay.length >= PUSH_IN_FLIGHT) return false;
  for (const earlier of onTheWay) {
    for (const id of next.writes) if (earlier.writes.has(id)) return false;
    for (const id of next.names) if (earlier.writes.has(id)) return false;
  }
  return true;
}

/**
 * Runs `job` for each batch in queue order, up to PUSH_IN_FLIGHT at once where `mayOverlap` allows; a
 * batch that may not overlap waits for those on the way. The first failure stops further batches and
 * is thrown once the batches on the way have settled (their answers are kept, nothing is left half done).
 */
export async function pushInTurn<B>(batches: Iterable<B>, footprintOf: (batch: B) => BatchFootprint, job: (batch: B) => Promise<void>): Promise<void> {
  const onTheWay = new Set<{ footprint: BatchFootprint; settled: Promise<void> }>();
  const failure: { error?: unknown; failed: boolean } = { failed: false };
  for (const batch of batches) {
    const footprint = footprintOf(batch);
    while (!failure.failed && onTheWay.size > 0 && !mayOverlap(footprint, [...onTheWay].map((b) => b.footprint))) {
      await Promise.race([...onTheWay].map((b) => b.settled));
    }
    if (failure.failed) break;
    const entry = { footprint, settled: Promise.resolve() };
    entry.settled = (async () => {
      try {
        await job(batch);
      } catch (error) {
        if (!failure.failed) Object.assign(failure, { failed: true, error });
      } finally {
        onTheWay.delete(entry);
      }
    })();
    onTheWay.add(entry);
  }
  await Promise.all([...onTheWay].map((b) => b.settled));
  if (failure.failed) throw failure.error;
}
