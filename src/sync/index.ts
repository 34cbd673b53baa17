/** The device's sync engine (issue 5; DESIGN.md §4). See engine.ts for how a run goes. */
export { createSyncEngine, type SyncEngine, type SyncEngineOptions, type SyncRunResult } from './engine';
export { createSyncScheduler, type SyncScheduler, type SyncSchedulerOptions, type SyncStatusSnapshot } from './scheduler';
export { backoffDelayMs, backoffCeilingMs, SYNC_INTERVAL_MS, SYNC_BACKOFF_BASE_MS, SYNC_BACKOFF_MAX_MS } from './backoff';
export { pushOutbox, resendRejected, PUSH_BATCH_SIZE, type PushSummary } from './push';
export { pullChanges, readCursor, PULL_PAGE_SIZE, type PullSummary } from './pull';
export { uploadAttachments, downloadAttachment, type UploadSummary } from './attachments';
export { withSyncLock, SYNC_LEASE_MS } from './sync-lock';
export { progressText, type SyncProgress, type SyncPhase } from './progress';
export { getRecordSyncState, useRecordSyncState, getSyncIssues, RECORD_SYNC_LABELS, type RecordSyncState, type RecordSyncInfo } from './record-sync-state';
export { useSyncStatus, type SyncStatusView } from './use-sync-status';
export { useAttachmentFile, type AttachmentFileState } from './use-attachment-file';
