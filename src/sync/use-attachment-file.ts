import { useEffect, useState } from 'react';
import { useLiveQuery } from 'dexie-react-hooks';
import { db, type AttachmentKind } from '@/db';

export type AttachmentFileState =
  | { status: 'none' }
  | { status: 'local'; url: string; uploaded: boolean }
  /** On the server, not on this device yet: download on demand (downloadAttachment). */
  | { status: 'remote'; error: string | null }
  /** The record names a file the capturing device has not uploaded yet. */
  | { status: 'not-arrived' };

/** A record's photo or trace as this device can show it; object URLs are revoked on change and unmount. */
export function useAttachmentFile(recordId: string | null | undefined, kind: AttachmentKind): AttachmentFileState | undefined {
  const found = useLiveQuery(async () => {
    if (!recordId) return { local: undefined, remote: undefined };
    const local = (await db.attachments.where('recordId').equals(recordId).filter((a) => a.kind === kind).toArray()).sort((a, b) => (a.createdAt < b.createdAt ? 1 : -1))[0];
    return { local, remote: local ? undefined : await db.remoteFiles.get([recordId, kind]) };
  }, [recordId, kind]);
  const [url, setUrl] = useState<string | null>(null);
  const local = found?.local;
  useEffect(() => {
    if (!local) return setUrl(null);
    const next = URL.createObjectURL(new Blob([local.data], { type: local.mime }));
    setUrl(next);
    return () => URL.revokeObjectURL(next);
  }, [local]);
  if (!found) return undefined;
  if (local && url) return { status: 'local', url, uploaded: Boolean(local.uploadedAt) };
  if (found.remote) return found.remote.arrived ? { status: 'remote', error: found.remote.downloadError } : { status: 'not-arrived' };
  return { status: 'none' };
}
