/**
 * Files captured with records (a reading's photo, a sweep's trace): uploaded after the record that owns
 * them has reached the server (the server derives the object key from the record and refuses a file
 * for a record it does not hold), one file at a time, each whole with its SHA-256 in X-Content-SHA256.
 * An interrupted upload stores nothing on the server; the file stays marked not uploaded here and goes
 * again, whole, on the next run. On other devices the file is downloaded on demand and checked against
 * the hash the record names.
 */
import { v7 as uuidv7 } from 'uuid';
import type { AttachmentRow, FringewalkDb, RemoteFileRow } from '@/db';
import { ApiRequestError, isApiRequestError } from '@/lib/api';
import { getAttachment, putAttachment } from './http';
import { capturedTable } from './tables';

export interface UploadProgress {
  file: number;
  files: number;
  bytesDone: number;
  bytesTotal: number;
}

export interface UploadSummary {
  uploaded: number;
  failed: number;
  /** Files whose record has not reached the server yet (queued or refused), left for later. */
  waiting: number;
}

async function sha256Hex(data: ArrayBuffer): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', data);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Files not yet on the server whose record is (no queued or refused change of it remains). */
async function uploadable(db: FringewalkDb, orgId: string): Promise<{ ready: AttachmentRow[]; waiting: number }> {
  const rows = (await db.attachments.toArray()).filter((a) => !a.uploadedAt);
  const ready: AttachmentRow[] = [];
  let waiting = 0;
  for (const a of rows) {
    const owner = await capturedTable(db, a.entity).get(a.recordId);
    if (!owner || owner.organisationId !== orgId || owner.deleted) continue;
    const named = a.kind === 'photo' ? owner.photoSha256 : owner.traceSha256;
    // A photo replaced by a newer one: the record no longer names this file.
    if (named !== a.sha256) continue;
    const queued = await db.outbox.where('[surveyId+entity+recordId]').equals([a.surveyId, a.entity, a.recordId]).count();
    if (queued > 0) waiting++;
    else ready.push(a);
  }
  ready.sort((x, y) => (x.createdAt < y.createdAt ? -1 : 1));
  return { ready, waiting };
}

export async function uploadAttachments(options: { db: FringewalkDb; orgId: string; onProgress?: (p: UploadProgress) => void; signal?: AbortSignal }): Promise<UploadSummary> {
  const { db, orgId } = options;
  const { ready, waiting } = await uploadable(db, orgId);
  const summary: UploadSummary = { uploaded: 0, failed: 0, waiting };
  const bytesTotal = ready.reduce((sum, a) => sum + a.bytes, 0);
  let bytesDone = 0;
  for (const [i, a] of ready.entries()) {
    options.onProgress?.({ file: i + 1, files: ready.length, bytesDone, bytesTotal });
    try {
      const result = await putAttachment(orgId, { recordId: a.recordId, kind: a.kind, data: a.data, mime: a.mime, sha256: a.sha256 }, options.signal);
      await db.attachments.update(a.id, { uploadedAt: new Date().toISOString(), objectKey: result.objectKey, uploadError: null, uploadAttempts: (a.uploadAttempts ?? 0) + 1 });
      summary.uploaded++;
    } catch (error) {
      // No answer at all: the network is gone, so is the rest of this run (it is retried with backoff).
      if (!isApiRequestError(error) || error.isNetworkError || error.status >= 500) {
        await db.attachments.update(a.id, { uploadAttempts: (a.uploadAttempts ?? 0) + 1, uploadError: error instanceof Error ? error.message : String(error) });
        throw error;
      }
      // Refused (wrong type, record changed meanwhile): kept on the device with the reason, tried again next run.
      await db.attachments.update(a.id, { uploadAttempts: (a.uploadAttempts ?? 0) + 1, uploadError: error.message });
      summary.failed++;
    }
    bytesDone += a.bytes;
    options.onProgress?.({ file: i + 1, files: ready.length, bytesDone, bytesTotal });
  }
  return summary;
}

/** Fetch another device's file for a record, check it against the record's SHA-256, and keep it here. */
export async function downloadAttachment(db: FringewalkDb, orgId: string, recordId: string, kind: RemoteFileRow['kind']): Promise<AttachmentRow> {
  const remote = await db.remoteFiles.get([recordId, kind]);
  if (!remote) {
    const have = await db.attachments.where('recordId').equals(recordId).filter((a) => a.kind === kind).first();
    if (have) return have;
    throw new ApiRequestError({ status: 404, code: 'NOT_FOUND', message: 'This record names no file to download.' });
  }
  try {
    const file = await getAttachment(orgId, recordId, kind);
    const sha256 = await sha256Hex(file.data);
    if (sha256 !== remote.sha256) {
      throw new ApiRequestError({ status: 200, code: 'CHECKSUM_MISMATCH', message: 'The downloaded file does not match the one the record names. Try again.' });
    }
    const row: AttachmentRow = {
      id: uuidv7(), entity: remote.entity, recordId, surveyId: remote.surveyId, kind, data: file.data, mime: file.mime, bytes: file.data.byteLength,
      sha256, createdAt: new Date().toISOString(), uploadedAt: new Date().toISOString(), objectKey: null,
    };
    await db.transaction('rw', db.attachments, db.remoteFiles, async () => {
      await db.attachments.put(row);
      await db.remoteFiles.delete([recordId, kind]);
    });
    return row;
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    await db.remoteFiles.update([recordId, kind], { downloadError: message });
    throw error;
  }
}
