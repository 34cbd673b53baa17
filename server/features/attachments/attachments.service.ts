/**
 * Attachments captured offline (issue 5 §6): a field reading's photo, a sweep's trace file. The device
 * pushes the record first (it names the file's SHA-256; the server derives the object key from it), then
 * uploads the file here. Whole-file uploads, idempotent by SHA-256, stand in for resumable chunks: the
 * files are small (photos are resized on the device, traces are CSV), an interrupted upload stores
 * nothing (the file goes to the object store only after every byte arrived and the checksum matched),
 * and sending the whole file again completes it. A record whose file has not arrived is pulled with
 * `attachmentPending: true`; the arrival gives the record a new change sequence, so other devices learn
 * it and may download the file on demand.
 */
import { fileTypeFromBuffer } from 'file-type';
import type { Role } from '../../../shared/schemas/common';
import type { AttachmentUploadResult } from '../../../shared/schemas/sync';
import { ATTACHMENT_OWNER, type AttachmentKind } from '../../../shared/sync/attachment-key';
import { AppError, notFound } from '../../lib/errors';
import type { Storage, StoredObject } from '../../lib/storage';
import type { AttachmentsRepository, OwnerRecord } from './attachments.repository';

export interface AttachmentActor {
  organisationId: string;
  userId: string;
  role: Role;
  requestId?: string | undefined;
}

/** Content types accepted per kind (what the device's camera and the analyser export produce). */
export const ATTACHMENT_CONTENT_TYPES: Record<AttachmentKind, readonly string[]> = {
  photo: ['image/jpeg', 'image/png', 'image/webp'],
  trace: ['text/csv', 'text/plain'],
};

export function createAttachmentsService(deps: { repo: AttachmentsRepository; storage: Storage }) {
  const { repo, storage } = deps;

  async function ownerFor(actor: AttachmentActor, recordId: string, kind: AttachmentKind, forWrite: boolean): Promise<OwnerRecord> {
    const owner = await repo.findOwner(actor.organisationId, ATTACHMENT_OWNER[kind], recordId);
    // Another organisation's record looks exactly like a missing one.
    if (!owner) throw new AppError('NOT_FOUND', `No ${kind === 'photo' ? 'field reading' : 'sweep'} with that id on the server: push the record first, then upload its file.`);
    const needsAssignment = forWrite ? actor.role !== 'admin' : actor.role === 'surveyor';
    if (needsAssignment && !(await repo.isAssigned(actor.organisationId, owner.surveyId, actor.userId))) {
      throw new AppError('NOT_ASSIGNED', 'You are not assigned to this record’s survey.');
    }
    if (forWrite && actor.role === 'surveyor' && owner.surveyorUserId !== actor.userId) throw new AppError('FORBIDDEN', 'This record was made by another surveyor.');
    return owner;
  }

  return {
    /** Checks made before the body is read (cheap refusals first). */
    async prepareUpload(actor: AttachmentActor, recordId: string, kind: AttachmentKind, sha256: string): Promise<OwnerRecord> {
      const owner = await ownerFor(actor, recordId, kind, true);
      if (!owner.sha256 || !owner.objectKey) {
        throw new AppError('ATTACHMENT_MISMATCH', `This record names no ${kind}; push the record with its ${kind}'s SHA-256 first.`);
      }
      if (owner.sha256 !== sha256) {
        throw new AppError('ATTACHMENT_MISMATCH', `This record names a different ${kind} (another SHA-256): push the record's latest version first.`, { expectedSha256: owner.sha256 });
      }
      return owner;
    },

    async upload(
      actor: AttachmentActor,
      owner: OwnerRecord,
      kind: AttachmentKind,
      file: { body: Buffer; sha256: string; contentType: string },
    ): Promise<{ created: boolean; result: AttachmentUploadResult }> {
      const objectKey = owner.objectKey!;
      if (kind === 'photo') {
        const detected = await fileTypeFromBuffer(file.body);
        if (!detected || !ATTACHMENT_CONTENT_TYPES.photo.includes(detected.mime)) {
          throw new AppError('UNSUPPORTED_FILE_TYPE', 'The photo is not a JPEG, PNG or WebP image.', { detected: detected?.mime ?? null });
        }
      } else if (file.body.includes(0)) {
        throw new AppError('UNSUPPORTED_FILE_TYPE', 'The trace file is not text (CSV of frequency and level).');
      }
      const result = { objectKey, sha256: file.sha256, bytes: file.body.length, contentType: file.contentType };
      if (await repo.findArrived(actor.organisationId, objectKey)) return { created: false, result: { ...result, alreadyStored: true } };
      // The object first, then the row that says it arrived: a crash between the two leaves an object a
      // retry overwrites with the same bytes, never a row pointing at nothing.
      await storage.putObject(objectKey, file.body, file.contentType);
      const created = await repo.recordArrival({ organisationId: actor.organisationId, owner, objectKey, kind, sha256: file.sha256, contentType: file.contentType, bytes: file.body.length, userId: actor.userId, requestId: actor.requestId ?? null });
      return { created, result: { ...result, alreadyStored: !created } };
    },

    async download(actor: AttachmentActor, recordId: string, kind: AttachmentKind): Promise<{ object: StoredObject; sha256: string; contentType: string; bytes: number }> {
      const owner = await ownerFor(actor, recordId, kind, false);
      if (!owner.objectKey) throw notFound(`That record's ${kind}`);
      const arrived = await repo.findArrived(actor.organisationId, owner.objectKey);
      if (!arrived) throw new AppError('NOT_FOUND', `The ${kind} has not reached the server yet; it uploads when the surveyor's device next syncs.`, { attachmentPending: true });
      const object = await storage.getObject(owner.objectKey);
      if (!object) throw new AppError('SERVICE_UNAVAILABLE', 'The file store does not have this file right now. Try again in a moment.');
      return { object, sha256: arrived.sha256, contentType: arrived.contentType, bytes: arrived.bytes };
    },
  };
}
export type AttachmentsService = ReturnType<typeof createAttachmentsService>;
