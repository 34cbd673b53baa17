/**
 * One sync run at a time on a device, across tabs. Web Locks (navigator.locks) when the browser has
 * them: the lock dies with its tab. Otherwise a lease in the device store: a row naming its holder and
 * an expiry, renewed while the run lasts, so a tab that crashed mid-run blocks the others only until the
 * lease runs out. Both are "try, don't queue": a second run is told the sync is busy and gives up, since
 * the run in progress will push and pull its changes anyway.
 */
import { v7 as uuidv7 } from 'uuid';
import type { FringewalkDb } from '@/db';

export const SYNC_LOCK_NAME = 'fringewalk-sync';
/** A lease not renewed for this long is taken to belong to a dead tab. */
export const SYNC_LEASE_MS = 30_000;
const LEASE_KEY = 'syncLease';

export type LockMode = 'auto' | 'web-locks' | 'lease';

interface Lease {
  owner: string;
  expiresAt: number;
}

export interface LockOptions {
  mode?: LockMode;
  leaseMs?: number;
  now?: () => number;
}

type WebLocks = { request(name: string, options: { ifAvailable: boolean }, cb: (lock: unknown) => Promise<unknown>): Promise<unknown> };

function webLocks(): WebLocks | undefined {
  const nav = typeof navigator === 'undefined' ? undefined : (navigator as unknown as { locks?: WebLocks });
  return nav?.locks && typeof nav.locks.request === 'function' ? nav.locks : undefined;
}

async function tryLease(db: FringewalkDb, owner: string, leaseMs: number, now: () => number): Promise<boolean> {
  return db.transaction('rw', db.meta, async () => {
    const row = await db.meta.get(LEASE_KEY);
    const lease = row?.value as Lease | undefined;
    if (lease && lease.owner !== owner && lease.expiresAt > now()) return false;
    await db.meta.put({ key: LEASE_KEY, value: { owner, expiresAt: now() + leaseMs } satisfies Lease });
    return true;
  });
}

async function releaseLease(db: FringewalkDb, owner: string): Promise<void> {
  await db.transaction('rw', db.meta, async () => {
    const lease = (await db.meta.get(LEASE_KEY))?.value as Lease | undefined;
    if (lease?.owner === owner) await db.meta.delete(LEASE_KEY);
  });
}

/** Runs `work` holding the device's sync lock; resolves { acquired: false } at once when another run holds it. */
export async function withSyncLock<T>(db: FringewalkDb, work: () => Promise<T>, options: LockOptions = {}): Promise<{ acquired: true; value: T } | { acquired: false }> {
  const { mode = 'auto', leaseMs = SYNC_LEASE_MS, now = () => Date.now() } = options;
  const locks = mode === 'lease' ? undefined : webLocks();
  if (mode === 'web-locks' && !locks) throw new Error('This browser has no Web Locks.');
  if (locks) {
    let out: { acquired: true; value: T } | { acquired: false } = { acquired: false };
    await locks.request(`${SYNC_LOCK_NAME}:${db.name}`, { ifAvailable: true }, async (lock) => {
      if (!lock) return;
      out = { acquired: true, value: await work() };
    });
    return out;
  }

  const owner = uuidv7();
  if (!(await tryLease(db, owner, leaseMs, now))) return { acquired: false };
  const renew = setInterval(() => void tryLease(db, owner, leaseMs, now).catch(() => {}), Math.max(1_000, leaseMs / 3));
  try {
    return { acquired: true, value: await work() };
  } finally {
    clearInterval(renew);
    await releaseLease(db, owner).catch(() => {});
  }
}
