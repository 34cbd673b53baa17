/** What the browser says about this site's storage: the answers the survey page shows in words. */
export type PersistAnswer = 'granted' | 'denied' | 'unsupported';

export async function requestPersistentStorage(): Promise<PersistAnswer> {
  if (typeof navigator === 'undefined' || !navigator.storage?.persist) return 'unsupported';
  try {
    if (await navigator.storage.persisted?.()) return 'granted';
    return (await navigator.storage.persist()) ? 'granted' : 'denied';
  } catch {
    return 'unsupported';
  }
}

export async function isStoragePersisted(): Promise<PersistAnswer> {
  if (typeof navigator === 'undefined' || !navigator.storage?.persisted) return 'unsupported';
  try {
    return (await navigator.storage.persisted()) ? 'granted' : 'denied';
  } catch {
    return 'unsupported';
  }
}

export interface StorageEstimate {
  usageBytes: number;
  quotaBytes: number | null;
}

export async function getStorageEstimate(): Promise<StorageEstimate | null> {
  if (typeof navigator === 'undefined' || !navigator.storage?.estimate) return null;
  try {
    const e = await navigator.storage.estimate();
    return { usageBytes: e.usage ?? 0, quotaBytes: e.quota ?? null };
  } catch {
    return null;
  }
}

/** "3.4 MB" — decimal units, as browsers and phones show storage (common practice). */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let value = bytes / 1000;
  let i = 0;
  while (value >= 1000 && i < units.length - 1) {
    value /= 1000;
    i++;
  }
  return `${value.toFixed(value < 10 ? 1 : 0)} ${units[i]}`;
}
