/**
 * When the sync runs: as soon as the network returns (the window's `online` event, or the app's
 * reachability store turning online), on a timer while online (SYNC_INTERVAL_MS), and when the surveyor
 * presses "Sync now". A failed run is retried after an exponential backoff with jitter (backoff.ts); a
 * success resets it. Only one run is in flight per scheduler; the engine's lock keeps other tabs out.
 */
import { backoffDelayMs, SYNC_INTERVAL_MS, type BackoffOptions } from './backoff';
import type { SyncEngine, SyncRunResult } from './engine';
import type { SyncProgress } from './progress';

export interface SyncStatusSnapshot {
  running: boolean;
  progress: SyncProgress | null;
  /** ISO time of the last run that finished (this session, or as stored on the device). */
  lastSyncAt: string | null;
  lastError: string | null;
  /** Failed runs in a row (0 after a success). */
  failures: number;
  /** Epoch ms of the next scheduled run, null when none is scheduled (stopped, or offline). */
  nextRunAt: number | null;
  /** The delay chosen for the next run, ms. */
  nextDelayMs: number | null;
  /** The last attempt found another tab syncing. */
  busyElsewhere: boolean;
  lastResult: SyncRunResult | null;
}

export interface SyncSchedulerOptions {
  engine: SyncEngine;
  intervalMs?: number;
  backoff?: BackoffOptions;
  isOnline?: () => boolean;
  /** Called with a callback to run when connectivity returns; returns an unsubscribe. */
  subscribeOnline?: (onOnline: () => void) => () => void;
  now?: () => number;
  /** The device's stored last sync time, shown before the first run of this session. */
  initialLastSyncAt?: string | null;
}

export interface SyncScheduler {
  get(): SyncStatusSnapshot;
  subscribe(listener: () => void): () => void;
  start(): void;
  stop(): void;
  /** Run now (or join the run in progress). Resolves to the result, or null when the run failed. */
  syncNow(): Promise<SyncRunResult | null>;
}

const browserOnline = () => typeof navigator === 'undefined' || navigator.onLine !== false;

function windowOnline(onOnline: () => void): () => void {
  if (typeof window === 'undefined') return () => {};
  window.addEventListener('online', onOnline);
  return () => window.removeEventListener('online', onOnline);
}

export function createSyncScheduler(options: SyncSchedulerOptions): SyncScheduler {
  const { engine, intervalMs = SYNC_INTERVAL_MS, isOnline = browserOnline, subscribeOnline = windowOnline, now = () => Date.now() } = options;
  const listeners = new Set<() => void>();
  let snapshot: SyncStatusSnapshot = {
    running: false, progress: null, lastSyncAt: options.initialLastSyncAt ?? null, lastError: null, failures: 0, nextRunAt: null, nextDelayMs: null, busyElsewhere: false, lastResult: null,
  };
  let timer: ReturnType<typeof setTimeout> | undefined;
  let inFlight: Promise<SyncRunResult | null> | null = null;
  let started = false;
  let unsubscribeOnline: (() => void) | undefined;

  const set = (patch: Partial<SyncStatusSnapshot>) => {
    snapshot = { ...snapshot, ...patch };
    for (const l of listeners) l();
  };

  function schedule(delayMs: number) {
    clearTimeout(timer);
    if (!started) return set({ nextRunAt: null, nextDelayMs: delayMs });
    set({ nextRunAt: now() + delayMs, nextDelayMs: delayMs });
    timer = setTimeout(() => {
      // Offline: wait for the network's return rather than fail and back off.
      if (!isOnline()) return set({ nextRunAt: null });
      void syncNow();
    }, delayMs);
  }

  function syncNow(): Promise<SyncRunResult | null> {
    if (inFlight) return inFlight;
    clearTimeout(timer);
    set({ running: true, progress: null, busyElsewhere: false });
    inFlight = (async () => {
      try {
        const result = await engine.run({ onProgress: (progress) => set({ progress }) });
        if (result.status === 'busy') {
          set({ running: false, progress: null, busyElsewhere: true, lastResult: result });
        } else {
          set({ running: false, progress: null, failures: 0, lastError: null, lastSyncAt: result.finishedAt, lastResult: result });
        }
        schedule(intervalMs);
        return result;
      } catch (error) {
        const failures = snapshot.failures + 1;
        set({ running: false, progress: null, failures, lastError: error instanceof Error ? error.message : String(error) });
        schedule(backoffDelayMs(failures, options.backoff));
        return null;
      } finally {
        inFlight = null;
      }
    })();
    return inFlight;
  }

  return {
    get: () => snapshot,
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    start() {
      if (started) return;
      started = true;
      unsubscribeOnline = subscribeOnline(() => void syncNow());
      if (isOnline()) void syncNow();
    },
    stop() {
      started = false;
      clearTimeout(timer);
      unsubscribeOnline?.();
      set({ nextRunAt: null });
    },
    syncNow,
  };
}
