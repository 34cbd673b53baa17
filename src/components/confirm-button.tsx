import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { Button, type ButtonVariant } from '@/components/button';

export interface ConfirmButtonProps {
  /** The button that opens the question. */
  children: ReactNode;
  title: string;
  /** What will happen, in a sentence or two. */
  body: ReactNode;
  confirmLabel: string;
  onConfirm: () => void;
  busy?: boolean;
  variant?: ButtonVariant;
  className?: string;
}

/** A button that asks first, in a modal <dialog> (focus is trapped and Escape cancels, natively). */
export function ConfirmButton({ children, title, body, confirmLabel, onConfirm, busy, variant = 'secondary', className }: ConfirmButtonProps) {
  const dialogRef = useRef<HTMLDialogElement>(null);
  const [open, setOpen] = useState(false);
  const titleId = useId();
  useEffect(() => {
    const dialog = dialogRef.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);
  return (
    <>
      <Button variant={variant} className={className} onClick={() => setOpen(true)} busy={busy}>
        {children}
      </Button>
      <dialog
        ref={dialogRef}
        onClose={() => setOpen(false)}
        aria-labelledby={titleId}
        className="m-auto max-w-md rounded-xl border border-border bg-surface p-5 text-fg backdrop:bg-black/50"
      >
        <h2 id={titleId} className="text-xl font-bold">
          {title}
        </h2>
        <div className="mt-2">{body}</div>
        <div className="mt-4 flex flex-wrap justify-end gap-3">
          <Button variant="secondary" onClick={() => setOpen(false)}>
            Cancel
          </Button>
          <Button
            onClick={() => {
              setOpen(false);
              onConfirm();
            }}
          >
            {confirmLabel}
          </Button>
        </div>
      </dialog>
    </>
  );
}
