/**
 * The one path by which a captured record reaches the store: validate with the shared wire schema, then
 * write the record AND its outbox entry in ONE Dexie transaction (DESIGN.md §4), so the outbox can never
 * miss a change the device holds, nor hold one it does not. Revisions: 1 on create, +1 on every edit or
 * tombstone; the mutation records the revision the change started from (0 for a new record).
 */
import type { Table, Transaction } from 'dexie';
import { v7 as uuidv7 } from 'uuid';
import type { z } from 'zod';
import { type CaptureEntity } from '@shared/schemas/capture';
import { MutationSchema, nextRevision } from '@shared/sync/mutation';
import { CaptureError, CaptureValidationError, db, toCaptureError, type OutboxRow } from '@/db';

interface SyncedRecord {
  id: string;
  organisationId: string;
  surveyId: string;
  revision: number;
  deleted: boolean;
}

export interface SyncedWriteSpec<R extends SyncedRecord, Row extends R> {
  entity: CaptureEntity;
  table: Table<Row, string>;
  schema: z.ZodType<R>;
  /** The stored row: the wire record plus device-only columns. */
  toRow: (record: R) => Row;
  /** Further tables the same transaction touches (derived columns, attachments). */
  extraTables?: Table[];
  /** Runs inside the transaction after the record and its mutation are written. */
  after?: (record: R, previous: Row | undefined, tx: Transaction) => Promise<void>;
  /** What the record is called in messages ("That field reading"). */
  label: string;
}

/** Parse with the wire schema; bad input throws CaptureValidationError with zod's issues. */
export function parseRecord<R>(schema: z.ZodType<R>, candidate: unknown): R {
  const parsed = schema.safeParse(candidate);
  if (!parsed.success) throw new CaptureValidationError(parsed.error.issues);
  return parsed.data;
}

function queue(entity: CaptureEntity, record: SyncedRecord, baseRevision: number): OutboxRow {
  const mutation = MutationSchema.parse({
    mutationId: uuidv7(),
    entity,
    recordId: record.id,
    surveyId: record.surveyId,
    baseRevision,
    payload: record as unknown as Record<string, unknown>,
    queuedAt: new Date().toISOString(),
  });
  return { ...mutation, status: 'pending', error: null };
}

/** Create (no id, or an id the device does not hold) or edit (an id it holds) one record. */
export async function saveSynced<R extends SyncedRecord, Row extends R>(
  spec: SyncedWriteSpec<R, Row>,
  input: Omit<R, 'id' | 'revision' | 'deleted'> & { id?: string },
): Promise<R> {
  const id = input.id ?? uuidv7();
  // Validate before opening the transaction: bad input never touches the store.
  const draft = parseRecord(spec.schema, { ...input, id, revision: 1, deleted: false });
  try {
    return await db.transaction('rw', [spec.table, db.outbox, ...(spec.extraTables ?? [])], async (tx) => {
      const previous = await spec.table.get(id);
      if (previous?.deleted) throw new CaptureError('RECORD_NOT_FOUND', `${spec.label} was deleted; it cannot be edited.`);
      if (previous && (previous.surveyId !== draft.surveyId || previous.organisationId !== draft.organisationId)) {
        throw new CaptureError('RECORD_CONFLICT', `${spec.label} belongs to another survey.`);
      }
      const baseRevision = previous?.revision ?? 0;
      const record = { ...draft, revision: nextRevision(baseRevision) };
      await spec.table.put(spec.toRow(record));
      await db.outbox.add(queue(spec.entity, record, baseRevision));
      await spec.after?.(record, previous, tx);
      return record;
    });
  } catch (error) {
    throw toCaptureError(error);
  }
}

/** A deletion is a tombstone (deleted: true, revision + 1) queued like an edit; never a removal. */
export async function tombstoneSynced<R extends SyncedRecord, Row extends R>(
  spec: SyncedWriteSpec<R, Row> & { guard?: (row: Row) => Promise<void> },
  id: string,
): Promise<R> {
  try {
    return await db.transaction('rw', [spec.table, db.outbox, ...(spec.extraTables ?? [])], async (tx) => {
      const previous = await spec.table.get(id);
      if (!previous) throw new CaptureError('RECORD_NOT_FOUND', `${spec.label} is not on this device.`);
      if (previous.deleted) return parseRecord(spec.schema, previous);
      await spec.guard?.(previous);
      const record = { ...parseRecord(spec.schema, previous), deleted: true, revision: nextRevision(previous.revision) };
      await spec.table.put(spec.toRow(record));
      await db.outbox.add(queue(spec.entity, record, previous.revision));
      await spec.after?.(record, previous, tx);
      return record;
    });
  } catch (error) {
    throw toCaptureError(error);
  }
}
