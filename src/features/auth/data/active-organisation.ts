/**
 * Which of the user's organisations the app is showing. Remembered per device in localStorage;
 * a remembered organisation the user no longer belongs to falls back to the first membership.
 */
import { useCallback, useSyncExternalStore } from 'react';
import type { Membership, Session } from '@shared/schemas/auth';

export const ACTIVE_ORGANISATION_STORAGE_KEY = 'fringewalk.active-organisation';

const listeners = new Set<() => void>();

function read(): string | null {
  try {
    return window.localStorage.getItem(ACTIVE_ORGANISATION_STORAGE_KEY);
  } catch {
    return null;
  }
}

export function setActiveOrganisationId(organisationId: string) {
  try {
    window.localStorage.setItem(ACTIVE_ORGANISATION_STORAGE_KEY, organisationId);
  } catch {
    // Storage blocked: the choice holds for this visit only.
  }
  for (const listener of listeners) listener();
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  const onStorage = (event: StorageEvent) => {
    if (event.key === ACTIVE_ORGANISATION_STORAGE_KEY) listener();
  };
  window.addEventListener('storage', onStorage);
  return () => {
    listeners.delete(listener);
    window.removeEventListener('storage', onStorage);
  };
}

export function pickMembership(memberships: Membership[], rememberedId: string | null): Membership | undefined {
  return memberships.find((m) => m.organisationId === rememberedId) ?? memberships[0];
}

/** The active membership of this session (undefined when the user belongs to no organisation). */
export function useActiveMembership(session: Session | undefined) {
  const rememberedId = useSyncExternalStore(subscribe, read, () => null);
  const membership = session ? pickMembership(session.memberships, rememberedId) : undefined;
  const choose = useCallback((organisationId: string) => setActiveOrganisationId(organisationId), []);
  return { membership, choose };
}
