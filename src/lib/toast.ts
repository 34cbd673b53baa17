/** A tiny toast store: request errors and notices that are not tied to one form field. */
import { useSyncExternalStore } from 'react';

export type ToastTone = 'info' | 'danger' | 'ok';
export interface Toast {
  id: number;
  tone: ToastTone;
  message: string;
}

/** Long enough to read with gloves on and eyes on a probe. */
export const TOAST_DURATION_MS = 8_000;

let toasts: Toast[] = [];
let nextId = 1;
const listeners = new Set<() => void>();
function emit() {
  for (const listener of listeners) listener();
}

export function dismissToast(id: number) {
  toasts = toasts.filter((toast) => toast.id !== id);
  emit();
}

export function showToast({ tone, message }: Omit<Toast, 'id'>): number {
  const id = nextId++;
  // The same message twice in a row (a retried request) shows once.
  toasts = [...toasts.filter((toast) => toast.message !== message), { id, tone, message }].slice(-3);
  emit();
  setTimeout(() => dismissToast(id), TOAST_DURATION_MS);
  return id;
}

export function useToasts(): Toast[] {
  return useSyncExternalStore(
    (listener) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    () => toasts,
    () => toasts,
  );
}
