/**
 * The app's sync, one engine and scheduler per organisation over the app's device store. The scheduler
 * runs while something on screen uses it (useSyncStatus), and also wakes when the app's reachability
 * store (src/lib/online-status) sees the server again.
 */
import { db } from '@/db';
import { onlineStatus } from '@/lib/online-status';
import { createSyncEngine } from './engine';
import { createSyncScheduler, type SyncScheduler } from './scheduler';

interface Entry {
  scheduler: SyncScheduler;
  users: number;
}

const entries = new Map<string, Entry>();

function subscribeOnline(onOnline: () => void): () => void {
  let wasOnline = onlineStatus.get().online;
  const stopStore = onlineStatus.subscribe(() => {
    const online = onlineStatus.get().online;
    if (online && !wasOnline) onOnline();
    wasOnline = online;
  });
  const onWindow = () => onOnline();
  window.addEventListener('online', onWindow);
  return () => {
    stopStore();
    window.removeEventListener('online', onWindow);
  };
}

export function getSyncScheduler(orgId: string): SyncScheduler {
  let entry = entries.get(orgId);
  if (!entry) {
    const engine = createSyncEngine({ db, orgId });
    entry = { scheduler: createSyncScheduler({ engine, subscribeOnline, isOnline: () => navigator.onLine !== false }), users: 0 };
    entries.set(orgId, entry);
  }
  return entry.scheduler;
}

/** Start the scheduler for a screen that shows it; the returned function releases it. */
export function retainScheduler(orgId: string): () => void {
  const entry = entries.get(orgId) ?? (getSyncScheduler(orgId), entries.get(orgId)!);
  entry.users++;
  if (entry.users === 1) entry.scheduler.start();
  return () => {
    entry.users--;
    if (entry.users === 0) entry.scheduler.stop();
  };
}
