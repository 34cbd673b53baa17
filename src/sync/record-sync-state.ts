/**
 * Where one record stands with the server, for badges on the capture screens:
 * - rejected: the server refused the latest change; the message says why (fix it and save, or send again);
 * - conflict: another device changed it too; both versions are kept until a reviewer chooses;
 * - local: changes wait in the outbox (message set when it waits for its station or walk);
 * - synced: the server holds what the device holds.
 */
import { useLiveQuery } from 'dexie-react-hooks';
import type { CaptureEntity } from '@shared/schemas/capture';
import { db as appDb, type FringewalkDb, type OutboxRow, type SyncConflictRow } from '@/db';

export type RecordSyncState = 'local' | 'synced' | 'rejected' | 'conflict';

export interface RecordSyncInfo {
  state: RecordSyncState;
  message: string | null;
}

export const RECORD_SYNC_LABELS: Record<RecordSyncState, string> = {
  local: 'On this device only',
  synced: 'Synced',
  rejected: 'Refused by the server',
  conflict: 'Conflict: a reviewer will choose',
};

export async function getRecordSyncState(db: FringewalkDb, entity: CaptureEntity, id: string): Promise<RecordSyncInfo> {
  const queued = (await db.outbox.where('recordId').equals(id).toArray()).filter((o) => o.entity === entity);
  const rejected = queued.filter((o) => o.status === 'rejected').sort((a, b) => (b.seq ?? 0) - (a.seq ?? 0))[0];
  if (rejected) return { state: 'rejected', message: rejected.error };
  const conflict = await db.syncConflicts.get([entity, id]);
  if (conflict) return { state: 'conflict', message: conflict.message };
  if (queued.length > 0) return { state: 'local', message: queued.map((o) => o.error).find((e) => e) ?? null };
  return { state: 'synced', message: null };
}

export function useRecordSyncState(entity: CaptureEntity, id: string | null | undefined, store: FringewalkDb = appDb): RecordSyncInfo | undefined {
  return useLiveQuery(() => (id ? getRecordSyncState(store, entity, id) : undefined), [entity, id, store]);
}

export interface SyncIssues {
  rejected: OutboxRow[];
  conflicts: SyncConflictRow[];
}

/** Everything a person must look at: refused changes (newest per record) and conflicts. */
export async function getSyncIssues(db: FringewalkDb, orgId?: string): Promise<SyncIssues> {
  const refused = (await db.outbox.where('status').equals('rejected').toArray()).filter((o) => !orgId || o.payload.organisationId === orgId);
  const newest = new Map<string, OutboxRow>();
  for (const o of refused) if ((newest.get(o.recordId)?.seq ?? -1) < (o.seq ?? 0)) newest.set(o.recordId, o);
  const conflicts = await db.syncConflicts.toArray();
  return { rejected: [...newest.values()], conflicts };
}
