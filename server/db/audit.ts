/**
 * The two traces every write leaves, written in the same transaction as the write itself:
 *
 * - a change sequence and a change_log row, for sync. `nextChangeSeq` bumps the organisation's counter
 *   with one UPDATE … RETURNING. That UPDATE takes the organisation row's lock and holds it until the
 *   transaction ends, so concurrent writers in one organisation get strictly increasing numbers AND
 *   commit in that order: a device that has pulled up to seq N can never later find a committed N−1.
 *   (A rolled-back transaction leaves a gap, which pull must tolerate; it never leaves a late arrival.)
 *   The price is that writers of one organisation queue behind each other from the moment they take a
 *   number: take it late in the transaction, and take a batch's numbers at once (`recordChanges`).
 * - an audit_log row: who did what, when, with before/after, for people.
 *
 * Repositories call `auditedWrite` for the common case (one synced record, one change, one audit row).
 */
import { and, desc, eq, sql, type SQL } from 'drizzle-orm';
import type { AuditEntry } from '../../shared/schemas/audit';
import type { DbOrTx, Tx } from './client';
import { auditLog, changeLog, organisations, users } from './schema';
import type { SyncedEntity } from './schema/synced-tables';

export class UnknownOrganisationError extends Error {
  override name = 'UnknownOrganisationError';
  constructor(readonly organisationId: string) {
    super(`No organisation with id ${organisationId}.`);
  }
}

/**
 * Reserves `count` consecutive change sequences for an organisation and returns them in order.
 * Must run inside a transaction (see the module comment: the row lock is what keeps commit order).
 */
export async function reserveChangeSeqs(tx: Tx, organisationId: string, count: number): Promise<number[]> {
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`count must be a positive integer, got ${count}.`);
  const [row] = await tx
    .update(organisations)
    .set({ changeSeq: sql`${organisations.changeSeq} + ${count}` })
    .where(eq(organisations.id, organisationId))
    .returning({ changeSeq: organisations.changeSeq });
  if (!row) throw new UnknownOrganisationError(organisationId);
  const first = row.changeSeq - count + 1;
  return Array.from({ length: count }, (_, i) => first + i);
}

/** The organisation's next change sequence (strictly greater than every one handed out before). */
export async function nextChangeSeq(tx: Tx, organisationId: string): Promise<number> {
  const [seq] = await reserveChangeSeqs(tx, organisationId, 1);
  return seq!;
}

export interface ChangeInput {
  organisationId: string;
  entity: SyncedEntity;
  entityId: string;
  /** The record's revision after this write (≥ 1). */
  revision: number;
  /** True when this write is the tombstone. */
  deleted: boolean;
}

function checkRevision(revision: number): void {
  if (!Number.isInteger(revision) || revision < 1) throw new RangeError(`revision must be an integer ≥ 1, got ${revision}.`);
}

/** Takes the next sequence and logs the change under it; returns the sequence for the row's change_seq. */
export async function recordChange(tx: Tx, change: ChangeInput): Promise<number> {
  checkRevision(change.revision);
  const seq = await nextChangeSeq(tx, change.organisationId);
  const { organisationId, entity, entityId, revision, deleted } = change;
  await tx.insert(changeLog).values({ organisationId, seq, entity, entityId, revision, deleted });
  return seq;
}

/** Bulk form of recordChange for one organisation: one counter bump, one multi-row insert; seqs in input order. */
export async function recordChanges(tx: Tx, organisationId: string, changes: Omit<ChangeInput, 'organisationId'>[]): Promise<number[]> {
  if (changes.length === 0) return [];
  changes.forEach((c) => checkRevision(c.revision));
  const seqs = await reserveChangeSeqs(tx, organisationId, changes.length);
  // Multi-row INSERT stays well under PostgreSQL's 65,535 bind parameters at 6 columns per row.
  const CHUNK_ROWS = 5_000;
  for (let start = 0; start < changes.length; start += CHUNK_ROWS) {
    await tx.insert(changeLog).values(
      changes
        .slice(start, start + CHUNK_ROWS)
        .map((c, i) => ({ organisationId, seq: seqs[start + i]!, entity: c.entity, entityId: c.entityId, revision: c.revision, deleted: c.deleted })),
    );
  }
  return seqs;
}

export interface AuditInput {
  /** Null only for actions outside any organisation. */
  organisationId: string | null;
  /** Null for the system (seed, scheduled jobs). */
  actorUserId: string | null;
  action: string;
  entity: string;
  entityId: string;
  /** The record before the write (null on create) and after it (null on a hard delete). Never secrets. */
  before: unknown;
  after: unknown;
  requestId?: string | null;
}

/** Writes one audit_log row and returns its id. Use the write's own transaction so both land or neither. */
export async function recordAudit(tx: DbOrTx, input: AuditInput): Promise<number> {
  const [row] = await tx
    .insert(auditLog)
    .values({
      organisationId: input.organisationId,
      actorUserId: input.actorUserId,
      action: input.action,
      entity: input.entity,
      entityId: input.entityId,
      before: input.before ?? null,
      after: input.after ?? null,
      requestId: input.requestId ?? null,
    })
    .returning({ id: auditLog.id });
  return row!.id;
}

export interface AuditedWriteInput extends ChangeInput {
  actorUserId: string | null;
  action: string;
  before: unknown;
  requestId?: string | null;
}

/**
 * One synced write with both traces: takes the change sequence, runs `write(changeSeq)` (which must
 * store the record with that change_seq and return it), then logs the change and the audit row with the
 * returned record as `after`. Everything happens in `tx`: if any step throws, nothing is kept.
 */
export async function auditedWrite<T>(
  tx: Tx,
  input: AuditedWriteInput,
  write: (changeSeq: number) => Promise<T>,
): Promise<{ changeSeq: number; row: T }> {
  const changeSeq = await recordChange(tx, input);
  const row = await write(changeSeq);
  await recordAudit(tx, {
    organisationId: input.organisationId,
    actorUserId: input.actorUserId,
    action: input.action,
    entity: input.entity,
    entityId: input.entityId,
    before: input.before,
    after: row,
    requestId: input.requestId ?? null,
  });
  return { changeSeq, row };
}

/**
 * An organisation's audit rows as the API shows them (AuditEntrySchema): newest first, with the
 * actor's name, narrowed by `where` (e.g. the rows of one site and everything on it).
 */
export async function listAuditEntries(db: DbOrTx, organisationId: string, limit: number, where?: SQL): Promise<AuditEntry[]> {
  const rows = await db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      actorUserId: auditLog.actorUserId,
      actorName: users.name,
      action: auditLog.action,
      entity: auditLog.entity,
      entityId: auditLog.entityId,
      before: auditLog.before,
      after: auditLog.after,
      requestId: auditLog.requestId,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .where(and(eq(auditLog.organisationId, organisationId), where))
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(limit);
  return rows.map((row) => ({ ...row, id: String(row.id), at: row.at.toISOString() }));
}
