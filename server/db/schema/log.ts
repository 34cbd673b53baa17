/**
 * The two logs every write leaves (server/db/audit.ts writes both):
 * - audit_log: who did what, when, with the row before and after — for people (admins, regulators).
 * - change_log: one row per change of a synced record, numbered by the organisation's monotonic
 *   counter — for machines (devices pull `since=<seq>` in pages, DESIGN.md §4).
 * Neither is synced itself, and neither is ever updated or deleted by the application.
 */
import { sql } from 'drizzle-orm';
import { bigint, bigserial, boolean, check, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { organisations, users } from './organisations';

export const auditLog = pgTable(
  'audit_log',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    /** Null only for actions outside any organisation (a user changing their own password). */
    organisationId: uuid('organisation_id').references(() => organisations.id),
    /** Null for the system (seeding, scheduled jobs); kept if the user is later removed. */
    actorUserId: uuid('actor_user_id').references(() => users.id, { onDelete: 'set null' }),
    /** Verb: create, update, delete, sign_off, reopen, acknowledge, … */
    action: text('action').notNull(),
    /** Table name of what was written. */
    entity: text('entity').notNull(),
    /** Text, because some entities have composite keys (a membership is user:organisation). */
    entityId: text('entity_id').notNull(),
    before: jsonb('before'),
    after: jsonb('after'),
    /** The HTTP request's id, to tie the row to the request log. */
    requestId: text('request_id'),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('audit_log_org_at_idx').on(t.organisationId, t.at), index('audit_log_entity_idx').on(t.entity, t.entityId)],
);

export const changeLog = pgTable(
  'change_log',
  {
    // No foreign key: every synced write appends a row here, in the same transaction as the record whose
    // own organisation key is checked; a second check per row would cost more than the row itself.
    organisationId: uuid('organisation_id').notNull(),
    seq: bigint('seq', { mode: 'number' }).notNull(),
    /** Table name of the synced record. */
    entity: text('entity').notNull(),
    entityId: uuid('entity_id').notNull(),
    revision: integer('revision').notNull(),
    deleted: boolean('deleted').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    // Only the key: every synced write appends a row here, and devices pull from the tables themselves by
    // change_seq, so no other index earns its cost on the push path.
    primaryKey({ columns: [t.organisationId, t.seq] }),
    check('change_log_seq_ck', sql`${t.seq} >= 1 AND ${t.revision} >= 1`),
  ],
);
