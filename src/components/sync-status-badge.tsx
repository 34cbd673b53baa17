import type { CaptureEntity } from '@shared/schemas/capture';
import { RECORD_SYNC_LABELS, useRecordSyncState, type RecordSyncState } from '@/sync';

const TONES: Record<RecordSyncState, string> = {
  local: 'bg-warning-soft text-warning',
  synced: 'bg-surface-sunken text-fg-muted',
  rejected: 'bg-danger-soft text-danger',
  conflict: 'bg-danger-soft text-danger',
};

/** A record's sync state as a small badge (with the server's message for refusals and conflicts). */
export function SyncStatusBadge({ entity, id }: { entity: CaptureEntity; id: string }) {
  const info = useRecordSyncState(entity, id);
  if (!info) return null;
  return (
    <p className="text-sm" data-testid="record-sync-state" data-state={info.state}>
      <span className={`inline-block rounded-full px-2 py-0.5 font-bold ${TONES[info.state]}`}>{RECORD_SYNC_LABELS[info.state]}</span>
      {info.message && (info.state === 'rejected' || info.state === 'conflict') && <span className="ml-2">{info.message}</span>}
    </p>
  );
}
