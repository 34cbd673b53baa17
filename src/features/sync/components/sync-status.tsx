import { Button } from '@/components/button';
import { useSyncStatus } from '@/sync';

const ENTITY_LABEL: Record<string, string> = { walks: 'Walk', stations: 'Station', field_readings: 'Field reading', sweeps: 'Sweep' };

function when(iso: string): string {
  const d = new Date(iso);
  const sameDay = d.toDateString() === new Date().toDateString();
  return sameDay ? d.toLocaleTimeString([], { hour: '2-digit', minute: '2-digit' }) : d.toLocaleString([], { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' });
}

/**
 * The header's sync control: "Sync now", what the run is doing ("Pushing 120 of 480", "Pulling…"),
 * the last successful sync, and what needs a person — refused changes (with the server's message and
 * "Send again") and conflicts (a reviewer chooses).
 */
export function SyncStatus({ orgId }: { orgId: string }) {
  const sync = useSyncStatus(orgId);
  const { rejected, conflicts } = sync.issues;
  const issues = rejected.length + conflicts.length;
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm" data-testid="sync-status">
      <Button variant="on-header" onClick={sync.syncNow} busy={sync.running} busyLabel="Syncing…" data-testid="sync-now">
        Sync now
      </Button>
      <span role="status" aria-live="polite" className="text-header-muted" data-testid="sync-progress">
        {sync.progressLabel ??
          (sync.busyElsewhere
            ? 'Another tab is syncing'
            : sync.lastError
              ? `Sync failed: ${sync.lastError}${sync.nextRunAt ? ' Retrying shortly.' : ''}`
              : sync.lastSuccessAt
                ? `Last synced ${when(sync.lastSuccessAt)}`
                : 'Not synced yet')}
      </span>
      {sync.lastSuccessAt && (sync.progressLabel || sync.lastError) && (
        <span className="text-header-muted" data-testid="sync-last">
          Last synced {when(sync.lastSuccessAt)}
        </span>
      )}
      {issues > 0 && (
        <details className="relative" data-testid="sync-issues">
          <summary className="inline-flex min-h-touch cursor-pointer items-center rounded-full bg-danger-soft px-3 font-bold text-danger">
            {[rejected.length > 0 && `${rejected.length} refused`, conflicts.length > 0 && `${conflicts.length} in conflict`].filter(Boolean).join(', ')}
          </summary>
          <div className="absolute right-0 z-40 mt-2 w-80 max-w-[90vw] space-y-3 rounded-lg border-2 border-border bg-surface p-3 text-fg shadow-lg">
            {rejected.length > 0 && (
              <section aria-label="Refused by the server" className="space-y-2">
                <h2 className="font-bold">Refused by the server</h2>
                <p className="text-fg-muted">Kept on this device. Correct the record and save it, or send it again once the cause is fixed.</p>
                <ul className="space-y-2">
                  {rejected.map((r) => (
                    <li key={r.mutationId} className="rounded border border-border p-2" data-testid="sync-refused">
                      <p className="font-bold">{ENTITY_LABEL[r.entity] ?? r.entity}</p>
                      <p>{r.error}</p>
                    </li>
                  ))}
                </ul>
                <Button variant="secondary" onClick={() => void sync.resend()}>
                  Send again
                </Button>
              </section>
            )}
            {conflicts.length > 0 && (
              <section aria-label="Conflicts" className="space-y-2">
                <h2 className="font-bold">Conflicts</h2>
                <ul className="space-y-2">
                  {conflicts.map((c) => (
                    <li key={`${c.entity}:${c.recordId}`} className="rounded border border-border p-2" data-testid="sync-conflict">
                      <p className="font-bold">{ENTITY_LABEL[c.entity] ?? c.entity}</p>
                      <p>{c.message}</p>
                    </li>
                  ))}
                </ul>
              </section>
            )}
          </div>
        </details>
      )}
    </div>
  );
}
