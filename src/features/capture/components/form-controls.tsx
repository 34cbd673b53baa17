import { forwardRef, useId, type ReactNode, type SelectHTMLAttributes } from 'react';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';

export interface SelectFieldProps extends SelectHTMLAttributes<HTMLSelectElement> {
  label: string;
  error?: string;
  hint?: ReactNode;
  children: ReactNode;
}

/** A labelled select, 48 px tall, with its error below it (the select twin of components/field). */
export const SelectField = forwardRef<HTMLSelectElement, SelectFieldProps>(function SelectField({ label, error, hint, id, className = '', children, ...rest }, ref) {
  const autoId = useId();
  const selectId = id ?? autoId;
  const errorId = `${selectId}-error`;
  const hintId = `${selectId}-hint`;
  return (
    <div className={`flex min-w-0 flex-col gap-1 ${className}`}>
      <label htmlFor={selectId} className="font-bold">
        {label}
      </label>
      <select
        ref={ref}
        id={selectId}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined}
        className={`min-h-touch w-full min-w-0 rounded-lg border-2 bg-surface px-3 text-lg text-fg ${error ? 'border-danger' : 'border-field-border'}`}
        {...rest}
      >
        {children}
      </select>
      {hint && (
        <div id={hintId} className="text-sm">
          {hint}
        </div>
      )}
      {error && (
        <p id={errorId} className="text-sm font-bold text-danger">
          {error}
        </p>
      )}
    </div>
  );
});

/** A 48 px checkbox row. */
export const CheckboxField = forwardRef<HTMLInputElement, { label: ReactNode; error?: string } & React.InputHTMLAttributes<HTMLInputElement>>(function CheckboxField(
  { label, error, id, className = '', ...rest },
  ref,
) {
  const autoId = useId();
  const inputId = id ?? autoId;
  return (
    <div className={className}>
      <label htmlFor={inputId} className="flex min-h-touch cursor-pointer items-center gap-3 font-bold">
        <input ref={ref} id={inputId} type="checkbox" className="h-6 w-6 shrink-0 accent-[var(--fw-accent)]" aria-invalid={error ? true : undefined} {...rest} />
        <span>{label}</span>
      </label>
      {error && <p className="text-sm font-bold text-danger">{error}</p>}
    </div>
  );
});

/** The foot of a capture form: why the last save failed, if it did, then Save and (when offered) Cancel. */
export function FormActions({ submitError, busy, submitLabel, onCancel }: { submitError: string | null; busy: boolean; submitLabel: string; onCancel?: (() => void) | undefined }) {
  return (
    <>
      {submitError && (
        <Alert tone="danger" title="Not saved">
          {submitError}
        </Alert>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={busy} busyLabel="Saving…" className="flex-1">
          {submitLabel}
        </Button>
        {onCancel && (
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        )}
      </div>
    </>
  );
}
