import type { ReactNode } from 'react';

export type AlertTone = 'info' | 'danger' | 'warning' | 'ok' | 'offline';

const tones: Record<AlertTone, string> = {
  info: 'bg-accent-soft text-accent-soft-fg border-accent',
  danger: 'bg-danger-soft text-danger border-danger',
  warning: 'bg-warning-soft text-warning border-warning',
  ok: 'bg-ok-soft text-ok border-ok',
  offline: 'bg-offline-soft text-offline border-offline',
};

export interface AlertProps {
  tone?: AlertTone;
  title?: string;
  children?: ReactNode;
  /** 'alert' interrupts screen readers (errors); 'status' waits politely (notices). */
  role?: 'alert' | 'status';
  className?: string;
}

export function Alert({ tone = 'info', title, children, role, className = '' }: AlertProps) {
  return (
    <div role={role ?? (tone === 'danger' ? 'alert' : 'status')} className={`rounded-lg border-l-8 px-4 py-3 ${tones[tone]} ${className}`}>
      {title && <p className="font-bold">{title}</p>}
      {children && <div className="text-fg">{children}</div>}
    </div>
  );
}
