/**
 * The server's own bookkeeping for sync (issue 5; server/features/sync/sync.service.ts explains the
 * protocol). None of these tables is synced itself: devices learn their effects through the records
 * they touch (a conflict marks its record, an arrived attachment clears `attachmentPending`).
 *
 * - sync_mutations: every outbox mutation the server has applied or answered with a conflict, with the
 *   answer it gave, so a retried batch is answered from here and applied no second time. Rejections are
 *   not kept: a rejection is retriable (the station may arrive in a later batch, the survey may reopen).
 * - sync_conflicts: the incoming version the server did not apply (or, edit against a deletion, the
 *   tombstone it replaced), beside the server's version, until a reviewer chooses.
 * - attachments: a file that has arrived in the object store for a record (photo of a field reading,
 *   trace of a sweep), keyed by its object key, which the server derives from the record and the file's
 *   SHA-256, so uploading the same file again is a no-op.
 * - repeat_recompute_queue: surveys whose repeat-reading groups must be recomputed (written in the push
 *   transaction, so a crash between the push and the recomputation loses nothing).
 */
import { sql } from 'drizzle-orm';
import { bigint, check, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { CONFLICT_KINDS } from '../../../shared/schemas/sync';
import { organisations, users } from './organisations';

export const syncMutations = pgTable(
  'sync_mutations',
  {
    // No foreign keys (like change_log): the organisation comes from the pusher's membership and the user
    // from their session, both checked on the request; a key check per row would cost more than the row.
    organisationId: uuid('organisation_id').notNull(),
    mutationId: uuid('mutation_id').notNull(),
    deviceId: text('device_id').notNull(),
    userId: uuid('user_id'),
    entity: text('entity').notNull(),
    recordId: uuid('record_id').notNull(),
    /**
     * The per-mutation answer given the first time, replayed on a retry. A plain `applied` answer (most
     * of them) is kept in the two typed columns and `result` stays null; any other answer (a conflict,
     * an applied edit that revived a deleted record) is kept whole in `result`. Typed columns, because
     * PostgreSQL builds a jsonb value per row at a cost a push of 500 readings noticed.
     */
    appliedRevision: integer('applied_revision'),
    appliedChangeSeq: bigint('applied_change_seq', { mode: 'number' }),
    result: jsonb('result').$type<Record<string, unknown>>(),
    /** Device clock when queued: recorded only. */
    queuedAt: timestamp('queued_at', { withTimezone: true }),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  // No index beyond the key: every push writes a row per mutation, and only the key is ever looked up.
  (t) => [
    primaryKey({ columns: [t.organisationId, t.mutationId] }),
    check('sync_mutations_answer_ck', sql`${t.result} IS NOT NULL OR (${t.appliedRevision} IS NOT NULL AND ${t.appliedChangeSeq} IS NOT NULL)`),
  ],
);

const CONFLICT_STATES = ['open', 'resolved'] as const;

export const syncConflicts = pgTable(
  'sync_conflicts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisations.id),
    surveyId: uuid('survey_id').notNull(),
    entity: text('entity').notNull(),
    recordId: uuid('record_id').notNull(),
    kind: text('kind', { enum: CONFLICT_KINDS }).notNull(),
    state: text('state', { enum: CONFLICT_STATES }).notNull().default('open'),
    /** The server's record when the conflict was found (for edit_vs_delete: the tombstone it replaced). */
    serverRevision: integer('server_revision').notNull(),
    serverVersion: jsonb('server_version').$type<Record<string, unknown>>().notNull(),
    /** What the device sent, and the revision its edit started from. */
    incomingBaseRevision: integer('incoming_base_revision').notNull(),
    incomingVersion: jsonb('incoming_version').$type<Record<string, unknown>>().notNull(),
    mutationId: uuid('mutation_id').notNull(),
    deviceId: text('device_id').notNull(),
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    resolvedByUserId: uuid('resolved_by_user_id').references(() => users.id, { onDelete: 'set null' }),
    /** Which version the reviewer kept. */
    resolution: text('resolution', { enum: ['server', 'incoming'] }),
    resolutionNote: text('resolution_note'),
    /** The record's revision written by the resolution. */
    resolvedRevision: integer('resolved_revision'),
  },
  (t) => [
    index('sync_conflicts_survey_idx').on(t.organisationId, t.surveyId, t.state),
    index('sync_conflicts_record_idx').on(t.recordId, t.state),
    check('sync_conflicts_kind_ck', sql`${t.kind} IN ('edit_vs_edit', 'edit_vs_delete', 'delete_vs_edit')`),
    check(
      'sync_conflicts_state_ck',
      sql`(${t.state} = 'open' AND ${t.resolvedAt} IS NULL AND ${t.resolution} IS NULL) OR (${t.state} = 'resolved' AND ${t.resolvedAt} IS NOT NULL AND ${t.resolution} IN ('server', 'incoming') AND ${t.resolvedRevision} >= 1)`,
    ),
  ],
);

export const attachments = pgTable(
  'attachments',
  {
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisations.id),
    objectKey: text('object_key').notNull(),
    entity: text('entity').notNull(),
    recordId: uuid('record_id').notNull(),
    kind: text('kind', { enum: ['photo', 'trace'] }).notNull(),
    sha256: text('sha256').notNull(),
    contentType: text('content_type').notNull(),
    bytes: bigint('bytes', { mode: 'number' }).notNull(),
    uploadedByUserId: uuid('uploaded_by_user_id').references(() => users.id, { onDelete: 'set null' }),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organisationId, t.objectKey] }),
    index('attachments_record_idx').on(t.recordId),
    check('attachments_sha256_ck', sql`${t.sha256} ~ '^[0-9a-f]{64}$'`),
    check('attachments_bytes_ck', sql`${t.bytes} >= 0`),
  ],
);

export const repeatRecomputeQueue = pgTable('repeat_recompute_queue', {
  surveyId: uuid('survey_id').primaryKey(),
  organisationId: uuid('organisation_id')
    .notNull()
    .references(() => organisations.id),
  requestedAt: timestamp('requested_at', { withTimezone: true }).notNull().defaultNow(),
});
