import type { Instrument } from '@shared/schemas/instrument';

/** "Overdue" / "Due soon" wherever an instrument appears (issue 6 §7). */
export function CalibrationBadge({ instrument }: { instrument: Pick<Instrument, 'calibrationOverdue' | 'calibrationDueSoon' | 'calibrationDueOn'> }) {
  if (instrument.calibrationOverdue) {
    return (
      <span className="rounded-full bg-danger-soft px-3 py-1 text-sm font-bold text-danger" data-testid="overdue-badge">
        Overdue
      </span>
    );
  }
  if (instrument.calibrationDueSoon) return <span className="rounded-full bg-warning-soft px-3 py-1 text-sm font-bold text-warning">Due soon</span>;
  if (!instrument.calibrationDueOn) return <span className="text-sm text-fg-muted">No due date</span>;
  return <span className="rounded-full bg-ok-soft px-3 py-1 text-sm font-bold text-ok">In date</span>;
}
