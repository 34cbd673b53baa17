import { v7 as uuidv7 } from 'uuid';
import type { AttachmentKind, AttachmentRow } from '@/db';
import { sha256HexOfBuffer } from './sha256';

/** Prepared outside the transaction: hashing is async Web Crypto work, which would let an IndexedDB transaction commit early. */
export async function prepareAttachment(
  blob: Blob,
  kind: AttachmentKind,
  entity: AttachmentRow['entity'],
  surveyId: string,
): Promise<Omit<AttachmentRow, 'recordId'>> {
  const data = await blob.arrayBuffer();
  return {
    id: uuidv7(),
    entity,
    surveyId,
    kind,
    data,
    mime: blob.type || 'application/octet-stream',
    bytes: blob.size,
    sha256: await sha256HexOfBuffer(data),
    createdAt: new Date().toISOString(),
    uploadedAt: null,
    objectKey: null,
  };
}
