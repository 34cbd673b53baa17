import { pendingSummary, usePendingCounts } from '../data/use-pending-counts';

/** The header's "14 readings not yet synced": what this device holds that the server has not got yet. */
export function PendingSyncStatus() {
  const counts = usePendingCounts();
  const text = counts ? pendingSummary(counts) : null;
  if (!counts || !text) return null;
  return (
    <span role="status" data-testid="pending-sync" className="inline-flex items-center gap-2 rounded-full bg-warning-soft px-3 py-1 text-sm font-bold text-warning">
      <span aria-hidden className="inline-block h-3 w-3 rotate-45 border-2 border-warning" />
      {text}
      {counts.rejected > 0 && ` (${counts.rejected} refused by the server)`}
    </span>
  );
}
