import type { SEVERITIES } from '@shared/schemas/vocabulary';

type Severity = (typeof SEVERITIES)[number];

export const SEVERITY_LABELS: Record<Severity, string> = { low: 'Low', medium: 'Medium', high: 'High', critical: 'Critical' };

/** Severity as a word on a tinted chip: the word carries the meaning, the tint only helps. */
export const SEVERITY_CHIP: Record<Severity, string> = {
  low: 'bg-surface-sunken text-fg',
  medium: 'bg-accent-soft text-accent-soft-fg',
  high: 'bg-warning-soft text-warning',
  critical: 'bg-danger-soft text-danger',
};

/** A source that says it was recalled has not been checked against the published table yet. */
export const isRecalled = (source: string) => /recalled/i.test(source);
