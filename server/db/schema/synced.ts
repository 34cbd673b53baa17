/**
 * Building blocks every synced table uses, beside `syncedColumns()` (columns.ts):
 * - `organisationId`: the tenant. Every child carries it too (denormalised), so a pull or a role check
 *   filters by one indexed column, and the composite foreign keys below can prove at the database
 *   level that a child and its parent belong to the same organisation.
 * - `syncConstraints()`: the pull index (organisation, change_seq) — unique, because pull pages use
 *   change_seq as a cursor and two rows sharing one value could be split across pages and skipped —,
 *   the (id, organisation) key the same-organisation foreign keys point at, and the revision check.
 */
import { sql } from 'drizzle-orm';
import { check, foreignKey, type AnyPgColumn, type PgColumn, unique, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { syncedColumns } from './columns';
import { organisations } from './organisations';

export const organisationColumn = () =>
  uuid('organisation_id')
    .notNull()
    .references(() => organisations.id);

/** organisation_id + the sync columns, in that order, for the top of every synced table. */
export const syncedOrgColumns = () => ({ organisationId: organisationColumn(), ...syncedColumns() });

interface SyncedShape {
  id: AnyPgColumn;
  organisationId: AnyPgColumn;
  revision: AnyPgColumn;
  changeSeq: AnyPgColumn;
}

export function syncConstraints(table: string, t: SyncedShape) {
  return [
    uniqueIndex(`${table}_org_seq_uq`).on(t.organisationId, t.changeSeq),
    unique(`${table}_id_org_uq`).on(t.id, t.organisationId),
    check(`${table}_revision_ck`, sql`${t.revision} >= 1`),
    check(`${table}_change_seq_ck`, sql`${t.changeSeq} >= 1`),
  ];
}

/**
 * A foreign key on (child column, organisation_id) → (parent id, parent organisation_id): the parent
 * must exist AND be in the same organisation. A null child column is not checked (MATCH SIMPLE), which
 * is what optional links (a station's room) want.
 */
export function sameOrg(name: string, column: PgColumn, organisationId: PgColumn, parent: { id: PgColumn; organisationId: PgColumn }) {
  return foreignKey({ name, columns: [column, organisationId], foreignColumns: [parent.id, parent.organisationId] });
}

/** Rejects NaN and ±Infinity, which double precision otherwise stores happily. */
export const finite = (column: AnyPgColumn) => sql`(${column} > '-Infinity'::float8 AND ${column} < 'Infinity'::float8)`;
