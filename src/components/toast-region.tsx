import { dismissToast, useToasts } from '@/lib/toast';
import { Alert } from './alert';

/** Request errors and notices, bottom of the screen, above everything; each can be dismissed. */
export function ToastRegion() {
  const toasts = useToasts();
  return (
    <div aria-live="polite" className="pointer-events-none fixed inset-x-0 bottom-0 z-50 flex flex-col items-center gap-2 p-4">
      {toasts.map((toast) => (
        <div key={toast.id} className="pointer-events-auto flex w-full max-w-md items-stretch gap-2 rounded-lg bg-surface shadow-lg">
          <Alert tone={toast.tone} className="flex-1">
            {toast.message}
          </Alert>
          <button
            type="button"
            onClick={() => dismissToast(toast.id)}
            className="min-h-touch min-w-touch rounded-lg text-fg-muted hover:bg-surface-sunken"
            aria-label="Dismiss message"
          >
            ✕
          </button>
        </div>
      ))}
    </div>
  );
}
