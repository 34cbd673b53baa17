import { forwardRef, useId, type SelectHTMLAttributes } from 'react';

export interface SelectFieldProps extends SelectHTMLAttributes<HTMLSelectElement> {
  label: string;
  options: ReadonlyArray<{ value: string; label: string }>;
  error?: string;
  hint?: string;
}

/** A labelled <select>, styled and wired like components/field.tsx. */
export const SelectField = forwardRef<HTMLSelectElement, SelectFieldProps>(function SelectField(
  { label, options, error, hint, id, className = '', ...rest },
  ref,
) {
  const autoId = useId();
  const selectId = id ?? autoId;
  const describedBy = [hint ? `${selectId}-hint` : null, error ? `${selectId}-error` : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={selectId} className="font-bold">
        {label}
      </label>
      {hint && (
        <p id={`${selectId}-hint`} className="text-sm text-fg-muted">
          {hint}
        </p>
      )}
      <select
        ref={ref}
        id={selectId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`min-h-touch w-full min-w-0 rounded-lg border-2 bg-surface px-3 text-lg text-fg ${error ? 'border-danger' : 'border-field-border'}`}
        {...rest}
      >
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
      {error && (
        <p id={`${selectId}-error`} className="text-sm font-bold text-danger">
          {error}
        </p>
      )}
    </div>
  );
});
