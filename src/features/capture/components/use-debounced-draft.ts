import { useCallback, useEffect, useRef } from 'react';
import { showToast } from '@/lib/toast';
import { saveDraft } from '../data';

/** How long typing pauses before the half-filled form is written to the device. */
export const DRAFT_DEBOUNCE_MS = 400;

/**
 * Debounced draft saving for a form: `schedule(value)` writes after a pause in typing; a pending write
 * is flushed at once when the page hides (pagehide, or the tab going to the background), so a reload or
 * a crash loses at most the last keystrokes. A storage failure is shown, not swallowed.
 */
export function useDebouncedDraft(key: string) {
  const pending = useRef<{ value: unknown } | null>(null);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);

  const flush = useCallback(() => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = null;
    const next = pending.current;
    pending.current = null;
    if (next) saveDraft(key, next.value).catch((error: unknown) => showToast({ tone: 'danger', message: error instanceof Error ? error.message : 'The draft could not be saved.' }));
  }, [key]);

  const schedule = useCallback(
    (value: unknown) => {
      pending.current = { value };
      if (timer.current) clearTimeout(timer.current);
      timer.current = setTimeout(flush, DRAFT_DEBOUNCE_MS);
    },
    [flush],
  );

  useEffect(() => {
    const onHide = () => flush();
    const onVisibility = () => {
      if (document.visibilityState === 'hidden') flush();
    };
    window.addEventListener('pagehide', onHide);
    document.addEventListener('visibilitychange', onVisibility);
    return () => {
      window.removeEventListener('pagehide', onHide);
      document.removeEventListener('visibilitychange', onVisibility);
      flush();
    };
  }, [flush]);

  return { schedule, flush };
}
