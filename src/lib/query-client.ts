/**
 * The TanStack Query client and its persistence. Server data is kept in localStorage so a surveyor
 * who opened the app once with a network can still read sites and surveys in a vault with none.
 *
 * Queries pause (instead of failing) while the online-status store says offline; mutations run
 * regardless so a form submitted offline fails at once with a clear "needs a network" message.
 */
import { MutationCache, onlineManager, QueryCache, QueryClient, type Query } from '@tanstack/react-query';
import { createAsyncStoragePersister } from '@tanstack/query-async-storage-persister';
import type { PersistQueryClientOptions } from '@tanstack/react-query-persist-client';
import { useSyncExternalStore } from 'react';
import { isApiRequestError } from './api';
import { onlineStatus } from './online-status';
import { showToast } from './toast';

declare module '@tanstack/react-query' {
  interface Register {
    queryMeta: {
      /** false keeps a query out of localStorage (e.g. e-mails carrying reset tokens). */
      persist?: boolean;
    };
    mutationMeta: {
      /** true: a failure is shown as a toast (forms show their own errors inline instead). */
      toastErrors?: boolean;
    };
  }
}

export const QUERY_CACHE_STORAGE_KEY = 'fringewalk.query-cache';
/**
 * Saved server data older than this is dropped on start-up. It is also the queries' gcTime, and a
 * browser timer longer than 2^31 - 1 ms (about 24.8 days) fires at once: 30 days here would
 * garbage-collect every restored query the moment it was restored.
 */
export const PERSIST_MAX_AGE_MS = 20 * 24 * 60 * 60 * 1000;
const MAX_TIMER_MS = 2 ** 31 - 1;
if (PERSIST_MAX_AGE_MS > MAX_TIMER_MS) throw new Error('PERSIST_MAX_AGE_MS must fit in a browser timer');
/** The persister writes at most once per this interval (its default; tests wait for the key). */
export const PERSIST_THROTTLE_MS = 1_000;
/** Bump when a persisted payload's shape changes, so old caches are discarded instead of misread. */
export const PERSIST_BUSTER = 'fringewalk-1';
const STALE_TIME_MS = 30_000;

// ---- persistence status: shown in the UI, never swallowed -------------------------------------

export interface PersistStatus {
  lastSavedAt: number | null;
  error: string | null;
}
let persistStatus: PersistStatus = { lastSavedAt: null, error: null };
const persistListeners = new Set<() => void>();
function setPersistStatus(next: PersistStatus) {
  persistStatus = next;
  for (const listener of persistListeners) listener();
}
export function usePersistStatus(): PersistStatus {
  return useSyncExternalStore(
    (listener) => {
      persistListeners.add(listener);
      return () => persistListeners.delete(listener);
    },
    () => persistStatus,
    () => persistStatus,
  );
}

/** localStorage, with every save and failure recorded for the UI. */
const recordingStorage = {
  getItem: (key: string) => window.localStorage.getItem(key),
  setItem: (key: string, value: string) => {
    window.localStorage.setItem(key, value);
    setPersistStatus({ lastSavedAt: Date.now(), error: null });
  },
  removeItem: (key: string) => window.localStorage.removeItem(key),
};

export const queryPersister = createAsyncStoragePersister({
  storage: recordingStorage,
  key: QUERY_CACHE_STORAGE_KEY,
  throttleTime: PERSIST_THROTTLE_MS,
  retry: ({ error }) => {
    const quota = error instanceof DOMException && error.name === 'QuotaExceededError';
    setPersistStatus({
      ...persistStatus,
      error: quota
        ? 'This device’s storage is full: recent data is not saved for offline use.'
        : 'Could not save data on this device for offline use.',
    });
    return undefined;
  },
});

export const persistOptions: Omit<PersistQueryClientOptions, 'queryClient'> = {
  persister: queryPersister,
  maxAge: PERSIST_MAX_AGE_MS,
  buster: PERSIST_BUSTER,
  dehydrateOptions: {
    shouldDehydrateQuery: (query) => query.state.status === 'success' && query.meta?.persist !== false,
  },
};

// ---- the client ---------------------------------------------------------------------------

export interface QueryClientHooks {
  /** Any query answered 401: the session ended on the server. */
  onUnauthenticated?: (query: Query<unknown, unknown, unknown>) => void;
}

function shouldRetry(failureCount: number, error: unknown): boolean {
  // 4xx answers will not change by asking again; network errors and 5xx may.
  if (isApiRequestError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

export function createQueryClient(hooks: QueryClientHooks = {}): QueryClient {
  return new QueryClient({
    queryCache: new QueryCache({
      onError: (error, query) => {
        if (isApiRequestError(error) && error.status === 401) hooks.onUnauthenticated?.(query);
      },
    }),
    mutationCache: new MutationCache({
      onError: (error, _variables, _context, mutation) => {
        if (mutation.meta?.toastErrors) showToast({ tone: 'danger', message: error.message });
      },
    }),
    defaultOptions: {
      queries: {
        // Must be at least maxAge, or restored entries are garbage-collected before use.
        gcTime: PERSIST_MAX_AGE_MS,
        staleTime: STALE_TIME_MS,
        retry: shouldRetry,
        networkMode: 'online',
      },
      mutations: { networkMode: 'always', retry: false },
    },
  });
}

/** Let TanStack Query's idea of "online" follow ours (health probe included). Call once. */
export function connectOnlineManager() {
  onlineManager.setEventListener((setOnline) => {
    setOnline(onlineStatus.get().online);
    return onlineStatus.subscribe(() => setOnline(onlineStatus.get().online));
  });
}

/** Forget everything saved for this user on this device (sign-out). */
export async function clearSavedData(queryClient: QueryClient) {
  queryClient.clear();
  await queryPersister.removeClient();
  setPersistStatus({ lastSavedAt: null, error: null });
}
