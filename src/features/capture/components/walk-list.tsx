import { memo, useState } from 'react';
import { Button } from '@/components/button';
import { SyncStatusBadge } from '@/components/sync-status-badge';
import { formatFluxDensity, formatFrequency } from '@shared/units';
import type { WalkEntry } from '../data';
import { EmptyState } from '@/components/empty-state';

export interface WalkListProps {
  entries: readonly WalkEntry[] | undefined;
  stationLabel: (stationId: string) => string;
  remeasureStationIds: ReadonlySet<string>;
  onEdit: (entry: WalkEntry) => void;
  onDelete: (entry: WalkEntry) => Promise<void>;
  /** True when only the newest entries are shown. */
  limited?: boolean;
  onShowAll?: () => void;
}

const timeFormat = new Intl.DateTimeFormat(undefined, { hour: '2-digit', minute: '2-digit', second: '2-digit' });
const record = (e: WalkEntry) => (e.kind === 'reading' ? e.reading : e.sweep);

interface RowProps {
  entry: WalkEntry;
  label: string;
  remeasure: boolean;
  onEdit: (entry: WalkEntry) => void;
  onDelete: (entry: WalkEntry) => Promise<void>;
}

/** One entry; re-renders only when its own record (id, revision) or label changes, not when the list grows. */
const WalkEntryRow = memo(
  function WalkEntryRow({ entry, label, remeasure, onEdit, onDelete }: RowProps) {
    const [confirming, setConfirming] = useState(false);
    const [busy, setBusy] = useState(false);
    const r = record(entry);
    const title =
      entry.kind === 'reading'
        ? `|B| ${formatFluxDensity(entry.reading.fieldT, { unit: entry.reading.unit })}${entry.reading.magnitudeT === null ? ' (3 components)' : ''}`
        : `Sweep ${formatFrequency(entry.sweep.startHz)} – ${formatFrequency(entry.sweep.stopHz)}, ${entry.sweep.peaks.length} ${entry.sweep.peaks.length === 1 ? 'peak' : 'peaks'}`;
    return (
      <li className="rounded-lg border-2 border-border bg-surface p-3" data-testid="walk-entry" data-entry-id={r.id}>
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <p className="font-bold">{title}</p>
          <p className="text-sm text-fg-muted">
            {label} · {timeFormat.format(new Date(r.measuredAt))}
          </p>
        </div>
        {remeasure && <p className="text-sm font-bold text-brand">↻ Re-measure requested at this station</p>}
        <SyncStatusBadge entity={entry.kind === 'reading' ? 'field_readings' : 'sweeps'} id={r.id} />
        {confirming ? (
          <div className="mt-2 flex flex-wrap items-center gap-2 rounded-lg bg-danger-soft p-2" role="alertdialog" aria-label="Confirm delete">
            <p className="w-full font-bold text-danger">Delete this {entry.kind === 'reading' ? 'reading' : 'sweep'}? It is kept as deleted and the deletion syncs.</p>
            <Button
              className="bg-danger text-bg"
              busy={busy}
              busyLabel="Deleting…"
              onClick={async () => {
                setBusy(true);
                try {
                  await onDelete(entry);
                } finally {
                  setBusy(false);
                  setConfirming(false);
                }
              }}
            >
              Yes, delete
            </Button>
            <Button variant="secondary" onClick={() => setConfirming(false)}>
              Keep it
            </Button>
          </div>
        ) : (
          <div className="mt-2 flex gap-2">
            <Button variant="secondary" onClick={() => onEdit(entry)}>
              Edit
            </Button>
            <Button variant="quiet" onClick={() => setConfirming(true)}>
              Delete
            </Button>
          </div>
        )}
      </li>
    );
  },
  (a, b) => {
    const ra = record(a.entry);
    const rb = record(b.entry);
    return ra.id === rb.id && ra.revision === rb.revision && a.label === b.label && a.remeasure === b.remeasure && a.onEdit === b.onEdit && a.onDelete === b.onDelete;
  },
);

/** This walk's readings and sweeps, newest first, each with edit and delete (a tombstone, after a confirmation). */
export const WalkList = memo(function WalkList({ entries, stationLabel, remeasureStationIds, onEdit, onDelete, limited = false, onShowAll }: WalkListProps) {
  if (entries === undefined) return <p role="status">Loading this walk…</p>;
  if (entries.length === 0) {
    return <EmptyState title="Nothing logged in this walk yet">Tap the plan to mark a station (or choose one), then save a field reading or a sweep there.</EmptyState>;
  }
  const readings = entries.filter((e) => e.kind === 'reading').length;
  const sweeps = entries.length - readings;
  return (
    <section aria-label="This walk" className="flex flex-col gap-2">
      <p className="text-sm text-fg-muted" data-testid="walk-count">
        {limited
          ? `The newest ${entries.length} entries of this walk`
          : `${readings} ${readings === 1 ? 'reading' : 'readings'}, ${sweeps} ${sweeps === 1 ? 'sweep' : 'sweeps'} in this walk`}
      </p>
      <ol className="flex flex-col gap-2" data-testid="walk-list">
        {entries.map((entry) => {
          const stationId = entry.kind === 'reading' ? entry.reading.stationId : entry.sweep.stationId;
          return <WalkEntryRow key={record(entry).id} entry={entry} label={stationLabel(stationId)} remeasure={remeasureStationIds.has(stationId)} onEdit={onEdit} onDelete={onDelete} />;
        })}
      </ol>
      {limited && onShowAll && (
        <Button variant="secondary" onClick={onShowAll}>
          Show the whole walk
        </Button>
      )}
    </section>
  );
});
