import { useLiveQuery } from 'dexie-react-hooks';
import { db, toCaptureError } from '@/db';

/**
 * Half-filled forms, kept in the store so they survive a reload or a crashed tab. The caller debounces
 * saveDraft and flushes it when the page hides; clearDraft after a successful save.
 */
export function useDraft<T>(key: string): T | undefined {
  return useLiveQuery(async () => (await db.drafts.get(key))?.value as T | undefined, [key]);
}

/** Like useDraft, but tells "still loading" (undefined) from "no draft" (null). */
export function useDraftEntry<T>(key: string): { value: T; updatedAt: string } | null | undefined {
  return useLiveQuery(async () => {
    const row = await db.drafts.get(key);
    return row ? { value: row.value as T, updatedAt: row.updatedAt } : null;
  }, [key]);
}

export async function getDraft<T>(key: string): Promise<T | undefined> {
  return (await db.drafts.get(key))?.value as T | undefined;
}

export async function saveDraft(key: string, value: unknown): Promise<void> {
  try {
    await db.drafts.put({ key, value, updatedAt: new Date().toISOString() });
  } catch (error) {
    throw toCaptureError(error);
  }
}

export async function clearDraft(key: string): Promise<void> {
  try {
    await db.drafts.delete(key);
  } catch (error) {
    throw toCaptureError(error);
  }
}
