/**
 * Where an attachment lives in the object store. The server derives the key from the owning record and
 * the file's SHA-256 (devices send the hash; the key in a pushed payload is ignored), so the same file
 * always lands on the same key — which makes whole-file upload retries idempotent — and a record that
 * names a new file gets a new key instead of overwriting the old one.
 */
import type { CaptureEntity } from '../schemas/capture';

export type AttachmentKind = 'photo' | 'trace';

/** Which record kind owns which attachment kind. */
export const ATTACHMENT_OWNER: Record<AttachmentKind, Extract<CaptureEntity, 'field_readings' | 'sweeps'>> = {
  photo: 'field_readings',
  trace: 'sweeps',
};

export function attachmentObjectKey(organisationId: string, kind: AttachmentKind, recordId: string, sha256: string): string {
  return `orgs/${organisationId}/${ATTACHMENT_OWNER[kind]}/${recordId}/${kind}-${sha256}`;
}
