/**
 * Create / update / tombstone for one synced record with both traces (server/db/audit.ts): a new
 * revision, a change sequence and change_log row, and an audit row with the record before and after,
 * all in the caller's transaction. Repositories of site setup use these so that no write forgets a
 * trace. Updates are scoped by organisation as well as id.
 */
import { and, eq } from 'drizzle-orm';
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core';
import { v7 as uuidv7 } from 'uuid';
import type { AuditContext } from '../lib/audit-context';
import { auditedWrite } from './audit';
import type { Tx } from './client';
import type { SyncedEntity } from './schema/synced-tables';

type SyncedTable = PgTable & {
  id: PgColumn;
  organisationId: PgColumn;
  revision: PgColumn;
  changeSeq: PgColumn;
  deleted: PgColumn;
  updatedAt: PgColumn;
};

interface SyncedRow {
  id: string;
  organisationId: string;
  revision: number;
}

export async function createSynced<T extends SyncedTable>(
  tx: Tx,
  table: T,
  entity: SyncedEntity,
  organisationId: string,
  values: Omit<T['$inferInsert'], 'id' | 'organisationId' | 'changeSeq' | 'revision'> & { id?: string },
  ctx: AuditContext,
): Promise<T['$inferSelect']> {
  const id = values.id ?? uuidv7();
  const { row } = await auditedWrite(
    tx,
    { organisationId, entity, entityId: id, revision: 1, deleted: false, actorUserId: ctx.actorUserId, action: 'create', before: null, requestId: ctx.requestId ?? null },
    async (changeSeq) => {
      const rows = (await tx
        .insert(table)
        .values({ ...values, id, organisationId, changeSeq, revision: 1 } as never)
        .returning()) as T['$inferSelect'][];
      return rows[0]!;
    },
  );
  return row;
}

export async function updateSynced<T extends SyncedTable>(
  tx: Tx,
  table: T,
  entity: SyncedEntity,
  before: SyncedRow & T['$inferSelect'],
  patch: Partial<T['$inferInsert']>,
  ctx: AuditContext,
  options: { action?: string; deleted?: boolean } = {},
): Promise<T['$inferSelect']> {
  const revision = before.revision + 1;
  const deleted = options.deleted ?? false;
  const { row } = await auditedWrite(
    tx,
    {
      organisationId: before.organisationId,
      entity,
      entityId: before.id,
      revision,
      deleted,
      actorUserId: ctx.actorUserId,
      action: options.action ?? (deleted ? 'delete' : 'update'),
      before,
      requestId: ctx.requestId ?? null,
    },
    async (changeSeq) => {
      const rows = (await tx
        .update(table)
        .set({ ...patch, revision, changeSeq, deleted, updatedAt: new Date() } as never)
        .where(and(eq(table.id, before.id), eq(table.organisationId, before.organisationId)))
        .returning()) as T['$inferSelect'][];
      return rows[0]!;
    },
  );
  return row;
}

export function tombstoneSynced<T extends SyncedTable>(tx: Tx, table: T, entity: SyncedEntity, before: SyncedRow & T['$inferSelect'], ctx: AuditContext): Promise<T['$inferSelect']> {
  return updateSynced(tx, table, entity, before, {}, ctx, { deleted: true });
}
