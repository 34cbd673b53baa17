import { forwardRef, type ButtonHTMLAttributes } from 'react';

export type ButtonVariant = 'primary' | 'secondary' | 'quiet' | 'on-header';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-accent text-accent-fg hover:bg-accent-hover border-transparent',
  secondary: 'bg-surface text-fg border-field-border hover:bg-surface-sunken',
  quiet: 'bg-transparent text-link border-transparent hover:bg-surface-sunken',
  'on-header': 'bg-transparent text-header-fg border-header-muted hover:bg-white/10',
};

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  /** Shows a busy label and blocks double submits. */
  busy?: boolean;
  busyLabel?: string;
}

/** Every button is at least 48 px tall and wide: surveyors press these with gloves on. */
export const Button = forwardRef<HTMLButtonElement, ButtonProps>(function Button(
  { variant = 'primary', busy = false, busyLabel, className = '', children, disabled, type = 'button', ...rest },
  ref,
) {
  return (
    <button
      ref={ref}
      type={type}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={`inline-flex min-h-touch min-w-touch items-center justify-center gap-2 rounded-lg border-2 px-5 text-base font-bold transition-colors disabled:cursor-not-allowed disabled:opacity-60 ${variants[variant]} ${className}`}
      {...rest}
    >
      {busy && busyLabel ? busyLabel : children}
    </button>
  );
});
