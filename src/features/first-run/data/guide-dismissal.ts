/**
 * Whether a user has put the first-run guide away, remembered on this device (localStorage, keyed by
 * user and role: someone who is a surveyor in one organisation and a reviewer in another sees each
 * role's guide once). Storage that refuses writes (private mode, quota) still hides the guide for
 * the rest of the visit: the choice is kept in memory as well.
 */
import { useCallback, useSyncExternalStore } from 'react';
import type { Role } from '@shared/schemas/common';

export const GUIDE_STORAGE_PREFIX = 'fringewalk.first-run-guide';
const DISMISSED = 'dismissed';
const CHANGE_EVENT = 'fringewalk:first-run-guide';

export function guideStorageKey(userId: string, role: Role): string {
  return `${GUIDE_STORAGE_PREFIX}.${userId}.${role}`;
}

const inMemory = new Map<string, boolean>();

export function isGuideDismissed(userId: string, role: Role): boolean {
  const key = guideStorageKey(userId, role);
  try {
    const stored = window.localStorage.getItem(key);
    if (stored !== null) return stored === DISMISSED;
  } catch {
    // Storage unreadable: fall back to this visit's memory.
  }
  return inMemory.get(key) ?? false;
}

export function setGuideDismissed(userId: string, role: Role, dismissed: boolean) {
  const key = guideStorageKey(userId, role);
  inMemory.set(key, dismissed);
  try {
    if (dismissed) window.localStorage.setItem(key, DISMISSED);
    else window.localStorage.removeItem(key);
  } catch {
    // Kept in memory only; the guide comes back on the next visit, which is harmless.
  }
  window.dispatchEvent(new Event(CHANGE_EVENT));
}

function subscribe(onChange: () => void) {
  window.addEventListener(CHANGE_EVENT, onChange);
  // Another tab of the same user.
  window.addEventListener('storage', onChange);
  return () => {
    window.removeEventListener(CHANGE_EVENT, onChange);
    window.removeEventListener('storage', onChange);
  };
}

export function useGuideDismissed(userId: string, role: Role): [boolean, (dismissed: boolean) => void] {
  const dismissed = useSyncExternalStore(
    subscribe,
    () => isGuideDismissed(userId, role),
    () => false,
  );
  const set = useCallback((next: boolean) => setGuideDismissed(userId, role, next), [userId, role]);
  return [dismissed, set];
}
