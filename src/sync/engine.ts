/**
 * The sync engine (issue 5; DESIGN.md §4): one run pushes the outbox, uploads the files of records the
 * server now holds, then pulls every change since the stored cursor. Runs are serialised across tabs
 * (sync-lock.ts); the scheduler (scheduler.ts) decides when to run and retries with backoff. The engine
 * works on whichever device store it is given, so tests can run two "devices" in one process.
 */
import type { FringewalkDb } from '@/db';
import { getDeviceIdIn } from './device-id';
import { pullChanges, type PullSummary } from './pull';
import { pushOutbox, type PushSummary } from './push';
import { uploadAttachments, type UploadSummary } from './attachments';
import type { SyncProgress } from './progress';
import { withSyncLock, type LockOptions } from './sync-lock';

export interface SyncEngineOptions {
  db: FringewalkDb;
  orgId: string;
  batchSize?: number;
  pullLimit?: number;
  lock?: LockOptions;
  onProgress?: (progress: SyncProgress) => void;
}

export type SyncRunResult =
  | { status: 'done'; push: PushSummary; uploads: UploadSummary; pull: PullSummary; finishedAt: string }
  | { status: 'busy' };

export interface SyncEngine {
  readonly orgId: string;
  /** One run; throws (ApiRequestError for the network or the server) when it fails part-way — what was stored stays stored. */
  run(options?: { signal?: AbortSignal; onProgress?: (progress: SyncProgress) => void }): Promise<SyncRunResult>;
}

export function createSyncEngine(options: SyncEngineOptions): SyncEngine {
  const { db, orgId } = options;
  return {
    orgId,
    async run(runOptions = {}) {
      const report = (p: SyncProgress) => {
        options.onProgress?.(p);
        runOptions.onProgress?.(p);
      };
      const { signal } = runOptions;
      const outcome = await withSyncLock(
        db,
        async () => {
          try {
            const deviceId = await getDeviceIdIn(db);
            const push = await pushOutbox({ db, orgId, deviceId, batchSize: options.batchSize, signal, onProgress: (done, total) => report({ phase: 'pushing', done, total }) });
            const uploads = await uploadAttachments({
              db,
              orgId,
              signal,
              onProgress: (p) => report({ phase: 'uploading', done: p.file, total: p.files, bytesDone: p.bytesDone, bytesTotal: p.bytesTotal }),
            });
            const pull = await pullChanges({ db, orgId, limit: options.pullLimit, signal, onProgress: (done) => report({ phase: 'pulling', done, total: null }) });
            const finishedAt = new Date().toISOString();
            await db.syncState.update(orgId, { lastSyncAt: finishedAt, lastError: null });
            return { status: 'done' as const, push, uploads, pull, finishedAt };
          } catch (error) {
            const message = error instanceof Error ? error.message : String(error);
            await db.syncState
              .get(orgId)
              .then((s) => db.syncState.put({ key: orgId, cursor: s?.cursor ?? 0, lastSyncAt: s?.lastSyncAt ?? null, lastError: message }))
              .catch(() => {});
            throw error;
          }
        },
        options.lock,
      );
      return outcome.acquired ? outcome.value : { status: 'busy' };
    },
  };
}
