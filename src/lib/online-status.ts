/**
 * Whether the app can reach its server right now. navigator.onLine alone lies in shielded rooms
 * (the device sees a Wi-Fi access point that has no uplink), so a failed /api/health probe or a
 * failed API request also counts as offline, until a probe or request succeeds again.
 *
 * A small external store: React reads it through useOnlineStatus (useSyncExternalStore), and
 * TanStack Query's onlineManager is fed from it so queries pause instead of failing when offline.
 */
import { useSyncExternalStore } from 'react';

/** How often to re-probe /api/health while the server seems unreachable. */
export const OFFLINE_PROBE_INTERVAL_MS = 15_000;
/** How often to confirm reachability while things look fine. */
export const ONLINE_PROBE_INTERVAL_MS = 60_000;
export const HEALTH_PROBE_TIMEOUT_MS = 5_000;
export const HEALTH_PATH = '/api/health';

export type OnlineReason = 'online' | 'browser-offline' | 'server-unreachable';

export interface OnlineStatus {
  online: boolean;
  reason: OnlineReason;
  /** Epoch ms of the last change, for "offline since …". */
  since: number;
}

type Listener = () => void;

export interface OnlineStatusStore {
  get(): OnlineStatus;
  subscribe(listener: Listener): () => void;
  /** Probe /api/health now; resolves to whether the server answered. */
  probe(): Promise<boolean>;
  markReachable(): void;
  markUnreachable(): void;
  /** Start listening to window events and probing; returns a stop function. */
  start(): () => void;
}

export interface OnlineStatusOptions {
  healthUrl?: string;
  offlineProbeIntervalMs?: number;
  onlineProbeIntervalMs?: number;
  probeTimeoutMs?: number;
  fetchImpl?: typeof fetch;
  now?: () => number;
}

function browserSaysOnline(): boolean {
  return typeof navigator === 'undefined' || navigator.onLine !== false;
}

export function createOnlineStatusStore(options: OnlineStatusOptions = {}): OnlineStatusStore {
  const {
    healthUrl = HEALTH_PATH,
    offlineProbeIntervalMs = OFFLINE_PROBE_INTERVAL_MS,
    onlineProbeIntervalMs = ONLINE_PROBE_INTERVAL_MS,
    probeTimeoutMs = HEALTH_PROBE_TIMEOUT_MS,
    now = () => Date.now(),
  } = options;
  const listeners = new Set<Listener>();
  let serverReachable = true;
  let status: OnlineStatus = compute();
  let timer: ReturnType<typeof setTimeout> | undefined;
  let started = false;

  function compute(): OnlineStatus {
    const reason: OnlineReason = !browserSaysOnline() ? 'browser-offline' : serverReachable ? 'online' : 'server-unreachable';
    return { online: reason === 'online', reason, since: now() };
  }

  function update() {
    const next = compute();
    if (next.reason === status.reason) return;
    status = next;
    for (const listener of listeners) listener();
    if (started) schedule();
  }

  function schedule() {
    clearTimeout(timer);
    if (!browserSaysOnline()) return; // the 'online' event will wake us
    timer = setTimeout(() => void probe(), status.online ? onlineProbeIntervalMs : offlineProbeIntervalMs);
  }

  async function probe(): Promise<boolean> {
    // When the browser knows it is offline a probe can only fail (and log a network error).
    if (!browserSaysOnline()) {
      update();
      return false;
    }
    const fetchImpl = options.fetchImpl ?? fetch;
    const controller = new AbortController();
    const giveUp = setTimeout(() => controller.abort(), probeTimeoutMs);
    let ok = false;
    try {
      const response = await fetchImpl(healthUrl, { cache: 'no-store', credentials: 'same-origin', signal: controller.signal });
      // Any HTTP answer means the server is reachable (503 = its database is down, still online).
      ok = response.status > 0;
    } catch {
      ok = false;
    } finally {
      clearTimeout(giveUp);
    }
    serverReachable = ok;
    update();
    if (started) schedule();
    return ok;
  }

  const onBrowserChange = () => {
    update();
    if (browserSaysOnline()) void probe();
  };

  return {
    get: () => status,
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    probe,
    markReachable() {
      serverReachable = true;
      update();
    },
    markUnreachable() {
      serverReachable = false;
      update();
    },
    start() {
      if (started) return () => {};
      started = true;
      window.addEventListener('online', onBrowserChange);
      window.addEventListener('offline', onBrowserChange);
      update();
      void probe();
      return () => {
        started = false;
        clearTimeout(timer);
        window.removeEventListener('online', onBrowserChange);
        window.removeEventListener('offline', onBrowserChange);
      };
    },
  };
}

/** The app's one store. */
export const onlineStatus = createOnlineStatusStore();

export function markServerReachable() {
  onlineStatus.markReachable();
}
export function markServerUnreachable() {
  onlineStatus.markUnreachable();
}

export function useOnlineStatus(store: OnlineStatusStore = onlineStatus): OnlineStatus {
  return useSyncExternalStore(store.subscribe, store.get, store.get);
}
