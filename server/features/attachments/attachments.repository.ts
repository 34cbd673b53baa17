/**
 * Attachments' database side: the owning record (a field reading's photo, a sweep's trace), the row that
 * says a file has arrived, and the record's new change sequence so devices pull `attachmentPending:
 * false`. A new sequence, not a new revision: the record's content did not change (it named the file's
 * hash all along), so a device editing it meanwhile does not meet a conflict.
 */
import { and, eq, sql } from 'drizzle-orm';
import { reserveChangeSeqs } from '../../db/audit';
import type { Db } from '../../db/client';
import { attachments, fieldReadings, surveyAssignments, surveys, sweeps } from '../../db/schema';

export interface OwnerRecord {
  entity: 'field_readings' | 'sweeps';
  id: string;
  surveyId: string;
  surveyState: 'open' | 'submitted' | 'signed_off';
  surveyorUserId: string;
  revision: number;
  deleted: boolean;
  sha256: string | null;
  objectKey: string | null;
}

export function createAttachmentsRepository(db: Db) {
  return {
    async findOwner(organisationId: string, entity: 'field_readings' | 'sweeps', recordId: string): Promise<OwnerRecord | null> {
      const table = entity === 'field_readings' ? fieldReadings : sweeps;
      const sha = entity === 'field_readings' ? fieldReadings.photoSha256 : sweeps.traceSha256;
      const key = entity === 'field_readings' ? fieldReadings.photoObjectKey : sweeps.traceObjectKey;
      const [row] = await db
        .select({
          id: table.id,
          surveyId: table.surveyId,
          surveyState: surveys.state,
          surveyorUserId: table.surveyorUserId,
          revision: table.revision,
          deleted: table.deleted,
          sha256: sha,
          objectKey: key,
        })
        .from(table)
        .innerJoin(surveys, and(eq(surveys.id, table.surveyId), eq(surveys.organisationId, table.organisationId)))
        .where(and(eq(table.organisationId, organisationId), eq(table.id, recordId)));
      return row ? { entity, ...row } : null;
    },

    async isAssigned(organisationId: string, surveyId: string, userId: string): Promise<boolean> {
      const rows = await db
        .select({ id: surveyAssignments.id })
        .from(surveyAssignments)
        .where(and(eq(surveyAssignments.organisationId, organisationId), eq(surveyAssignments.surveyId, surveyId), eq(surveyAssignments.userId, userId), eq(surveyAssignments.deleted, false)))
        .limit(1);
      return rows.length > 0;
    },

    async findArrived(organisationId: string, objectKey: string) {
      const [row] = await db
        .select()
        .from(attachments)
        .where(and(eq(attachments.organisationId, organisationId), eq(attachments.objectKey, objectKey)));
      return row ?? null;
    },

    /**
     * Records the arrival (once: a second arrival of the same key changes nothing) and, in the same
     * transaction, gives the owning record a new change sequence with its change_log row and an audit row.
     */
    async recordArrival(
      input: { organisationId: string; owner: OwnerRecord; objectKey: string; kind: 'photo' | 'trace'; sha256: string; contentType: string; bytes: number; userId: string; requestId: string | null },
    ): Promise<boolean> {
      return db.transaction(async (tx) => {
        const inserted = await tx
          .insert(attachments)
          .values({
            organisationId: input.organisationId,
            objectKey: input.objectKey,
            entity: input.owner.entity,
            recordId: input.owner.id,
            kind: input.kind,
            sha256: input.sha256,
            contentType: input.contentType,
            bytes: input.bytes,
            uploadedByUserId: input.userId,
          })
          .onConflictDoNothing()
          .returning({ key: attachments.objectKey });
        if (inserted.length === 0) return false;
        const [seq] = await reserveChangeSeqs(tx, input.organisationId, 1);
        const table = input.owner.entity === 'field_readings' ? fieldReadings : sweeps;
        const [row] = await tx
          .update(table)
          .set({ changeSeq: seq!, updatedAt: new Date() })
          .where(and(eq(table.organisationId, input.organisationId), eq(table.id, input.owner.id)))
          .returning({ revision: table.revision, deleted: table.deleted });
        await tx.execute(sql`
          INSERT INTO change_log (organisation_id, seq, entity, entity_id, revision, deleted)
          VALUES (${input.organisationId}::uuid, ${seq!}, ${input.owner.entity}, ${input.owner.id}::uuid, ${row!.revision}, ${row!.deleted})`);
        await tx.execute(sql`
          INSERT INTO audit_log (organisation_id, actor_user_id, action, entity, entity_id, before, after, request_id)
          VALUES (${input.organisationId}::uuid, ${input.userId}::uuid, 'attachment_arrived', ${input.owner.entity}, ${input.owner.id},
                  NULL, ${JSON.stringify({ objectKey: input.objectKey, kind: input.kind, sha256: input.sha256, contentType: input.contentType, bytes: input.bytes })}::jsonb, ${input.requestId})`);
        return true;
      });
    },
  };
}
export type AttachmentsRepository = ReturnType<typeof createAttachmentsRepository>;
