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

/** A record checked against its wire schema, ready to be written by writeSyncedInTx. */
export interface SyncedDraft<R extends SyncedRecord, Row extends R> {
  spec: SyncedWriteSpec<R, Row>;
  draft: R;
  /** The id was made here, so no stored version can exist: the write skips looking for one. */
  fresh: boolean;
}

/** Validate a create or edit before any transaction opens: bad input never touches the store. */
export function draftSynced<R extends SyncedRecord, Row extends R>(
  spec: SyncedWriteSpec<R, Row>,
  input: Omit<R, 'id' | 'revision' | 'deleted'> & { id?: string },
): SyncedDraft<R, Row> {
  const id = input.id ?? uuidv7();
  return { spec, draft: parseRecord(spec.schema, { ...input, id, revision: 1, deleted: false }), fresh: input.id === undefined };
}

/** Every table a write of these drafts touches: theirs, the outbox, and their extra tables. */
export function tablesFor(...drafts: ReadonlyArray<{ spec: { table: unknown; extraTables?: Table[] } }>): Table[] {
  const tables = new Set<Table>([db.outbox]);
  for (const { spec } of drafts) {
    tables.add(spec.table as Table);
    for (const t of spec.extraTables ?? []) tables.add(t);
  }
  return [...tables];
}

/**
 * Write one validated record and its outbox entry inside the caller's transaction (which must include
 * tablesFor(it)). Several calls in one transaction are all-or-nothing: a station made by the first
 * reading on a new spot is written with that reading, never without it.
 */
export async function writeSyncedInTx<R extends SyncedRecord, Row extends R>({ spec, draft, fresh }: SyncedDraft<R, Row>, tx: Transaction): Promise<R> {
  const previous = fresh ? undefined : await spec.table.get(draft.id);
  if (previous?.deleted) throw new CaptureError('RECORD_NOT_FOUND', `${spec.label} was deleted; it cannot be edited.`);
  if (previous && (previous.surveyId !== draft.surveyId || previous.organisationId !== draft.organisationId)) {
    throw new CaptureError('RECORD_CONFLICT', `${spec.label} belongs to another survey.`);
  }
  const baseRevision = previous?.revision ?? 0;
  const record = { ...draft, revision: nextRevision(baseRevision) };
  // Both requests go to IndexedDB at once (a transaction runs its requests in order): one round trip.
  await Promise.all([spec.table.put(spec.toRow(record)), db.outbox.add(queue(spec.entity, record, baseRevision))]);
  await spec.after?.(record, previous, tx);
  return record;
}

/** Create (no id, or an id the device does not hold) or edit (an id it holds) one record. */
export async function saveSynced<R extends SyncedRecord, Row extends R>(
  spec: SyncedWriteSpec<R, Row>,
  input: Omit<R, 'id' | 'revision' | 'deleted'> & { id?: string },
): Promise<R> {
  // Validate before opening the transaction: bad input never touches the store.
  const prepared = draftSynced(spec, input);
  try {
    return await db.transaction('rw', [spec.table, db.outbox, ...(spec.extraTables ?? [])], (tx) => writeSyncedInTx(prepared, tx));
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
