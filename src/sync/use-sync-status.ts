/**
 * The sync as the UI sees it: the scheduler's live state (running, progress, last sync, failures) plus
 * counts read from the device store (waiting, refused, in conflict), and the actions behind the
 * "Sync now" and "Send again" buttons. Mounting it starts the organisation's scheduler when the device
 * holds something to sync (a survey taken offline, or queued changes).
 */
import { useCallback, useEffect, useSyncExternalStore } from 'react';
import { useLiveQuery } from 'dexie-react-hooks';
import { db } from '@/db';
import { getSyncScheduler, retainScheduler } from './controller';
import { progressText } from './progress';
import { resendRejected } from './push';
import { getSyncIssues, type SyncIssues } from './record-sync-state';
import type { SyncStatusSnapshot } from './scheduler';

export interface SyncStatusView extends SyncStatusSnapshot {
  /** "Pushing 120 of 480", "Uploading file 1 of 2 (40%)", "Pulling… 1,000 changes", or null when idle. */
  progressLabel: string | null;
  /** The stored last successful sync, when this session has not synced yet. */
  lastSuccessAt: string | null;
  issues: SyncIssues;
  /** Queued changes (mutations) waiting to be pushed. */
  pendingMutations: number;
  syncNow: () => void;
  resend: (recordIds?: string[]) => Promise<void>;
}

const NO_ISSUES: SyncIssues = { rejected: [], conflicts: [] };

export function useSyncStatus(orgId: string): SyncStatusView {
  const scheduler = getSyncScheduler(orgId);
  const snapshot = useSyncExternalStore(scheduler.subscribe, scheduler.get, scheduler.get);
  const local = useLiveQuery(async () => {
    const [state, issues, pendingMutations, surveys] = await Promise.all([
      db.syncState.get(orgId),
      getSyncIssues(db, orgId),
      db.outbox.where('status').equals('pending').count(),
      db.surveys.where('id').notEqual('').filter((s) => s.organisationId === orgId).count(),
    ]);
    return { state, issues, pendingMutations, hasWork: surveys > 0 || pendingMutations > 0 || issues.rejected.length > 0 };
  }, [orgId]);
  const hasWork = local?.hasWork ?? false;

  useEffect(() => {
    if (!hasWork) return;
    return retainScheduler(orgId);
  }, [orgId, hasWork]);

  const syncNow = useCallback(() => void scheduler.syncNow(), [scheduler]);
  const resend = useCallback(
    async (recordIds?: string[]) => {
      await resendRejected(db, recordIds);
      void scheduler.syncNow();
    },
    [scheduler],
  );

  return {
    ...snapshot,
    progressLabel: snapshot.progress ? progressText(snapshot.progress) : snapshot.running ? 'Starting sync…' : null,
    lastSuccessAt: snapshot.lastSyncAt ?? local?.state?.lastSyncAt ?? null,
    issues: local?.issues ?? NO_ISSUES,
    pendingMutations: local?.pendingMutations ?? 0,
    syncNow,
    resend,
  };
}
