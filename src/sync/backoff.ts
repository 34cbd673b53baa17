/**
 * Retry timing after a failed sync run: exponential backoff with "equal jitter" — the delay after the
 * n-th failure in a row is drawn uniformly from [d/2, d], d = min(maxMs, baseMs · 2^(n−1)) (Marc Brooker,
 * "Exponential Backoff And Jitter", AWS Architecture Blog, 2015). Jitter keeps a crowd of devices that lost
 * the network together from returning to the server together; the lower half-bound keeps one device from
 * hammering it.
 */
export const SYNC_INTERVAL_MS = 60_000;
export const SYNC_BACKOFF_BASE_MS = 2_000;
export const SYNC_BACKOFF_MAX_MS = 5 * 60_000;

export interface BackoffOptions {
  baseMs?: number;
  maxMs?: number;
  /** A number in [0, 1); Math.random by default (tests pass their own). */
  random?: () => number;
}

/** The uncapped-by-jitter ceiling for the n-th consecutive failure (n ≥ 1). */
export function backoffCeilingMs(failures: number, options: BackoffOptions = {}): number {
  const { baseMs = SYNC_BACKOFF_BASE_MS, maxMs = SYNC_BACKOFF_MAX_MS } = options;
  if (failures < 1) return 0;
  // 2^(n−1) overflows to Infinity long before n gets silly; min() keeps it at the cap.
  return Math.min(maxMs, baseMs * 2 ** (failures - 1));
}

export function backoffDelayMs(failures: number, options: BackoffOptions = {}): number {
  const ceiling = backoffCeilingMs(failures, options);
  const random = options.random ?? Math.random;
  return Math.round(ceiling / 2 + random() * (ceiling / 2));
}
