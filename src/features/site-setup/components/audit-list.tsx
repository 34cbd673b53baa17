import type { AuditEntry } from '@shared/schemas/audit';

function describe(entry: AuditEntry): string {
  return `${entry.action.replace(/_/g, ' ')} ${entry.entity.replace(/_/g, ' ')}`;
}

/** The site's audit log, newest first (admins). */
export function AuditList({ entries }: { entries: AuditEntry[] }) {
  if (entries.length === 0) return <p className="text-fg-muted">No changes recorded yet.</p>;
  return (
    <ol className="flex flex-col divide-y divide-border rounded-xl border border-border bg-surface" aria-label="Audit log">
      {entries.map((entry) => (
        <li key={entry.id} className="flex flex-wrap items-baseline justify-between gap-2 px-4 py-2" data-testid="audit-entry">
          <span className="font-bold">{describe(entry)}</span>
          <span className="text-sm text-fg-muted">
            {entry.actorName ?? 'System'} · {new Date(entry.at).toLocaleString()}
          </span>
        </li>
      ))}
    </ol>
  );
}
