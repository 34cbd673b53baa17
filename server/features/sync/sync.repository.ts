/**
 * Every database statement of sync (push, pull, conflicts, repeat groups). The bulk paths — applying a
 * push, its change_log rows, the processed-mutation rows — are single `INSERT … SELECT FROM unnest(…)`
 * statements with one array per column (STACK.md, "Performance facts": Drizzle's builder spends most of
 * its time building SQL text for many rows); Drizzle's builder is kept for the reads and the few-row
 * writes. The rules live in sync.service.ts.
 */
import { and, asc, eq, getTableColumns, inArray, sql, type SQL } from 'drizzle-orm';
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core';
import type { CaptureEntity } from '../../../shared/schemas/capture';
import type { PulledEntity } from '../../../shared/schemas/sync';
import { recordAudit, reserveChangeSeqs } from '../../db/audit';
import type { Db, DbOrTx, Tx } from '../../db/client';
import {
  decisions,
  fieldReadings,
  flags,
  repeatRecomputeQueue,
  stations,
  surveyAssignments,
  surveys,
  sweeps,
  syncConflicts,
  syncMutations,
  walks,
  watchBands,
  zoneSets,
} from '../../db/schema';
import type { SyncedEntity } from '../../db/schema/synced-tables';

export const CAPTURE_TABLES = { walks, stations, field_readings: fieldReadings, sweeps } as const;

const PULL_TABLES = {
  surveys,
  survey_assignments: surveyAssignments,
  walks,
  stations,
  field_readings: fieldReadings,
  sweeps,
  decisions,
  flags,
  watch_bands: watchBands,
  zone_sets: zoneSets,
} as const satisfies Record<PulledEntity, PgTable>;

/** A row as Drizzle reads it (camelCase keys, Date for timestamps). */
export type DbRow = Record<string, unknown> & { id: string; organisationId: string; revision: number; deleted: boolean; changeSeq: number };

/** PostgreSQL errors worth running the whole transaction again for: deadlock, serialization failure. */
const RETRYABLE_CODES = new Set(['40P01', '40001']);
const TRANSACTION_ATTEMPTS = 3;

function pgCode(error: unknown): string | undefined {
  for (let current: unknown = error, depth = 0; current && depth < 4; depth += 1) {
    const code = (current as { code?: unknown }).code;
    if (typeof code === 'string') return code;
    current = (current as { cause?: unknown }).cause;
  }
  return undefined;
}

/** The constraint a failed statement broke, for a CONSTRAINT_FAILED rejection. */
export function constraintOf(error: unknown): { code: string; constraint: string | null; message: string } | null {
  for (let current: unknown = error, depth = 0; current && depth < 4; depth += 1) {
    const e = current as { code?: unknown; constraint?: unknown; message?: unknown };
    if (typeof e.code === 'string' && /^(23|22)/.test(e.code)) {
      return { code: e.code, constraint: typeof e.constraint === 'string' ? e.constraint : null, message: String(e.message ?? '') };
    }
    current = (current as { cause?: unknown }).cause;
  }
  return null;
}

// ------------------------------------------------------------------------------------- bulk writing

interface ColumnSpec {
  key: string;
  name: string;
  cast: string;
  json: boolean;
}

/** Columns a push writes: everything but the generated |B| and the server-kept timestamps. */
function writableColumns(table: PgTable): ColumnSpec[] {
  return Object.entries(getTableColumns(table))
    .filter(([key, column]) => !(column as PgColumn & { generated?: unknown }).generated && key !== 'createdAt' && key !== 'updatedAt')
    .map(([key, column]) => {
      const type = column.getSQLType();
      return { key, name: column.name, cast: `${type}[]`, json: type === 'jsonb' };
    });
}

const WRITABLE = Object.fromEntries(Object.entries(CAPTURE_TABLES).map(([entity, table]) => [entity, writableColumns(table)])) as Record<CaptureEntity, ColumnSpec[]>;

function toArrays(columns: ColumnSpec[], rows: Record<string, unknown>[]): SQL[] {
  return columns.map((c) => {
    const values = rows.map((row) => {
      const v = row[c.key];
      if (v === undefined || v === null) return null;
      if (c.json) return JSON.stringify(v);
      if (v instanceof Date) return v.toISOString();
      return v;
    });
    return sql`${sql.param(values)}::${sql.raw(c.cast)}`;
  });
}

const q = (name: string) => `"${name.replace(/"/g, '""')}"`;

export function createSyncRepository(db: Db) {
  return {
    /** Runs `fn` in one transaction, again (up to 3 times) when PostgreSQL aborts it for a deadlock. */
    async transaction<T>(fn: (tx: Tx) => Promise<T>, options: { isolationLevel?: 'read committed' | 'repeatable read'; accessMode?: 'read only' | 'read write' } = {}): Promise<T> {
      for (let attempt = 1; ; attempt += 1) {
        try {
          return await db.transaction(fn, options);
        } catch (error) {
          if (attempt >= TRANSACTION_ATTEMPTS || !RETRYABLE_CODES.has(pgCode(error) ?? '')) throw error;
        }
      }
    },

    /** Savepoint: `fn`'s statements are undone on failure without aborting the transaction. */
    async savepoint<T>(tx: Tx, fn: (tx: Tx) => Promise<T>): Promise<T> {
      return tx.transaction(fn);
    },

    // ------------------------------------------------------------------------------ processed mutations

    /** Stored answers of the mutation ids this organisation has seen before. */
    async seenMutations(tx: Tx, organisationId: string, mutationIds: string[]): Promise<Map<string, Record<string, unknown>>> {
      const seen = new Map<string, Record<string, unknown>>();
      if (mutationIds.length === 0) return seen;
      const rows = await tx
        .select({ mutationId: syncMutations.mutationId, result: syncMutations.result })
        .from(syncMutations)
        .where(and(eq(syncMutations.organisationId, organisationId), sql`${syncMutations.mutationId} = ANY(${sql.param(mutationIds)}::uuid[])`));
      for (const row of rows) if (row.result) seen.set(row.mutationId, row.result);
      return seen;
    },

    // ------------------------------------------------------------------------------- permissions, refs

    async findSurveys(tx: DbOrTx, organisationId: string, surveyIds: string[]) {
      if (surveyIds.length === 0) return [];
      return tx
        .select({ id: surveys.id, state: surveys.state, siteId: surveys.siteId, deleted: surveys.deleted, repeatRadiusM: surveys.repeatRadiusM })
        .from(surveys)
        .where(and(eq(surveys.organisationId, organisationId), inArray(surveys.id, surveyIds)));
    },

    /** The surveys (of those given, or all when omitted) the user is assigned to, in any assignment role. */
    async assignedSurveyIds(tx: DbOrTx, organisationId: string, userId: string, surveyIds?: string[]): Promise<string[]> {
      const rows = await tx
        .selectDistinct({ surveyId: surveyAssignments.surveyId })
        .from(surveyAssignments)
        .where(
          and(
            eq(surveyAssignments.organisationId, organisationId),
            eq(surveyAssignments.userId, userId),
            eq(surveyAssignments.deleted, false),
            surveyIds ? inArray(surveyAssignments.surveyId, surveyIds) : undefined,
          ),
        );
      return rows.map((r) => r.surveyId);
    },

    /**
     * Transaction-scoped advisory locks on the record ids, taken in sorted order so two pushes touching
     * overlapping records cannot deadlock; with them, reading a record and deciding applied/conflict
     * cannot race another push of the same record (including two creates of a new id).
     */
    async lockRecordIds(tx: Tx, recordIds: string[]): Promise<void> {
      if (recordIds.length === 0) return;
      await tx.execute(sql`
        SELECT pg_advisory_xact_lock(k) FROM (
          SELECT DISTINCT hashtextextended(id::text, 7531) AS k FROM unnest(${sql.param(recordIds)}::uuid[]) AS id ORDER BY 1
        ) locks`);
    },

    /** Current rows by id, in any organisation (the caller tells own rows from foreign ids), locked. */
    async loadRecords(tx: Tx, entity: CaptureEntity, ids: string[]): Promise<DbRow[]> {
      if (ids.length === 0) return [];
      const table = CAPTURE_TABLES[entity];
      const rows = await tx
        .select()
        .from(table)
        .where(sql`${table.id} = ANY(${sql.param(ids)}::uuid[])`)
        .for('update');
      return rows as unknown as DbRow[];
    },

    /**
     * Every reference a batch names, in one round trip: which of the stations, walks, levels, rooms and
     * instruments exist in this organisation, with what the checks need (a station's or walk's survey, a
     * level's site, a room's level).
     */
    async references(tx: Tx, organisationId: string, want: { stations: string[]; walks: string[]; levels: string[]; rooms: string[]; instruments: string[] }) {
      const ids = (list: string[]) => sql`${sql.param(list)}::uuid[]`;
      const result = await tx.execute<{ kind: string; id: string; parent: string | null }>(sql`
        SELECT 'station' AS kind, id, survey_id AS parent FROM stations WHERE organisation_id = ${organisationId}::uuid AND id = ANY(${ids(want.stations)})
        UNION ALL SELECT 'walk', id, survey_id FROM walks WHERE organisation_id = ${organisationId}::uuid AND id = ANY(${ids(want.walks)})
        UNION ALL SELECT 'level', id, site_id FROM levels WHERE organisation_id = ${organisationId}::uuid AND id = ANY(${ids(want.levels)})
        UNION ALL SELECT 'room', id, level_id FROM rooms WHERE organisation_id = ${organisationId}::uuid AND id = ANY(${ids(want.rooms)})
        UNION ALL SELECT 'instrument', id, NULL FROM instruments WHERE organisation_id = ${organisationId}::uuid AND id = ANY(${ids(want.instruments)})`);
      const out = { stations: new Map<string, string>(), walks: new Map<string, string>(), levels: new Map<string, string>(), rooms: new Map<string, string>(), instruments: new Set<string>() };
      for (const r of result.rows) {
        if (r.kind === 'station') out.stations.set(r.id, r.parent!);
        else if (r.kind === 'walk') out.walks.set(r.id, r.parent!);
        else if (r.kind === 'level') out.levels.set(r.id, r.parent!);
        else if (r.kind === 'room') out.rooms.set(r.id, r.parent!);
        else out.instruments.add(r.id);
      }
      return out;
    },

    /** The surveys of a batch with, for each, whether the user is assigned to it — one round trip. */
    async surveysWithAssignment(tx: Tx, organisationId: string, userId: string, surveyIds: string[]) {
      const result = await tx.execute<{ id: string; state: 'open' | 'submitted' | 'signed_off'; site_id: string; deleted: boolean; assigned: boolean }>(sql`
        SELECT s.id, s.state, s.site_id, s.deleted,
               EXISTS (SELECT 1 FROM survey_assignments a WHERE a.survey_id = s.id AND a.organisation_id = s.organisation_id AND a.user_id = ${userId}::uuid AND NOT a.deleted) AS assigned
        FROM surveys s WHERE s.organisation_id = ${organisationId}::uuid AND s.id = ANY(${sql.param(surveyIds)}::uuid[])`);
      return result.rows;
    },

    /**
     * The end of a push in one statement (writable CTEs): the change_log rows, the stored answers, the
     * audit rows and the repeat-recomputation queue entries.
     */
    async finishBatch(
      tx: Tx,
      input: {
        organisationId: string;
        deviceId: string;
        userId: string;
        requestId: string | null;
        changes: { seq: number; entity: SyncedEntity; entityId: string; revision: number; deleted: boolean }[];
        mutations: { mutationId: string; entity: string; recordId: string; queuedAt: string | null; result: Record<string, unknown> }[];
        audits: { action: string; entity: string; entityId: string; before: unknown; after: unknown }[];
        dirtySurveyIds: string[];
      },
    ): Promise<void> {
      const org = sql`${input.organisationId}::uuid`;
      const p = <T>(values: T[], cast: string) => sql`${sql.param(values)}::${sql.raw(cast)}`;
      const json = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));
      const { changes: c, mutations: m, audits: a } = input;
      await tx.execute(sql`
        WITH log AS (
          INSERT INTO change_log (organisation_id, seq, entity, entity_id, revision, deleted)
          SELECT ${org}, s, e, i, r, d FROM unnest(${p(c.map((x) => x.seq), 'bigint[]')}, ${p(c.map((x) => x.entity), 'text[]')}, ${p(c.map((x) => x.entityId), 'uuid[]')},
                                                   ${p(c.map((x) => x.revision), 'int[]')}, ${p(c.map((x) => x.deleted), 'boolean[]')}) AS u(s, e, i, r, d)
        ), answers AS (
          INSERT INTO sync_mutations (organisation_id, mutation_id, device_id, user_id, entity, record_id, queued_at, result)
          SELECT ${org}, mi, ${input.deviceId}, ${input.userId}::uuid, e, r, qa, res
          FROM unnest(${p(m.map((x) => x.mutationId), 'uuid[]')}, ${p(m.map((x) => x.entity), 'text[]')}, ${p(m.map((x) => x.recordId), 'uuid[]')},
                      ${p(m.map((x) => x.queuedAt), 'timestamptz[]')}, ${p(m.map((x) => JSON.stringify(x.result)), 'jsonb[]')}) AS u(mi, e, r, qa, res)
          ON CONFLICT (organisation_id, mutation_id) DO NOTHING
        ), audit AS (
          INSERT INTO audit_log (organisation_id, actor_user_id, action, entity, entity_id, before, after, request_id)
          SELECT ${org}, ${input.userId}::uuid, ac, e, i, b, af, ${input.requestId}
          FROM unnest(${p(a.map((x) => x.action), 'text[]')}, ${p(a.map((x) => x.entity), 'text[]')}, ${p(a.map((x) => x.entityId), 'text[]')},
                      ${p(a.map((x) => json(x.before)), 'jsonb[]')}, ${p(a.map((x) => json(x.after)), 'jsonb[]')}) AS u(ac, e, i, b, af)
        )
        INSERT INTO repeat_recompute_queue (survey_id, organisation_id)
        SELECT s, ${org} FROM unnest(${p(input.dirtySurveyIds, 'uuid[]')}) AS s
        ON CONFLICT (survey_id) DO UPDATE SET requested_at = now()`);
    },

    // ------------------------------------------------------------------------------------ the writes

    /** Counter bump for `count` sequences (the organisation row lock: see server/db/audit.ts). */
    reserveChangeSeqs: (tx: Tx, organisationId: string, count: number) => reserveChangeSeqs(tx, organisationId, count),

    /**
     * Inserts new records and overwrites existing ones of one entity in one statement. `rows` carry
     * every writable column (wire values; the server has set revision, changeSeq and the object keys).
     * The WHERE keeps a row of another organisation untouched even if a check upstream were missed.
     * Returns the ids written.
     */
    async upsertRecords(tx: Tx, entity: CaptureEntity, rows: Record<string, unknown>[]): Promise<string[]> {
      if (rows.length === 0) return [];
      const table = q(entity);
      const columns = WRITABLE[entity];
      const names = columns.map((c) => q(c.name)).join(', ');
      const updates = columns
        .filter((c) => c.key !== 'id' && c.key !== 'organisationId')
        .map((c) => `${q(c.name)} = EXCLUDED.${q(c.name)}`)
        .join(', ');
      const result = await tx.execute<{ id: string }>(sql`
        INSERT INTO ${sql.raw(table)} (${sql.raw(names)}, updated_at)
        SELECT u.*, now() FROM unnest(${sql.join(toArrays(columns, rows), sql`, `)}) AS u(${sql.raw(names)})
        ON CONFLICT (id) DO UPDATE SET ${sql.raw(updates)}, updated_at = now()
        WHERE ${sql.raw(table)}.organisation_id = EXCLUDED.organisation_id
        RETURNING id`);
      return result.rows.map((r) => r.id);
    },

    /** Inserts records known to be new (their ids are locked and were not found): a plain bulk INSERT. */
    async insertRecords(tx: Tx, entity: CaptureEntity, rows: Record<string, unknown>[]): Promise<void> {
      if (rows.length === 0) return;
      const columns = WRITABLE[entity];
      const names = columns.map((c) => q(c.name)).join(', ');
      await tx.execute(sql`
        INSERT INTO ${sql.raw(q(entity))} (${sql.raw(names)})
        SELECT * FROM unnest(${sql.join(toArrays(columns, rows), sql`, `)})`);
    },

    /** Gives records a new change sequence without a new revision: their server-side state changed. */
    async touchRecords(tx: Tx, entity: CaptureEntity, items: { id: string; changeSeq: number }[]): Promise<void> {
      if (items.length === 0) return;
      await tx.execute(sql`
        UPDATE ${sql.raw(q(entity))} t SET change_seq = u.seq, updated_at = now()
        FROM unnest(${sql.param(items.map((i) => i.id))}::uuid[], ${sql.param(items.map((i) => i.changeSeq))}::bigint[]) AS u(id, seq)
        WHERE t.id = u.id`);
    },

    async insertChangeLog(tx: Tx, organisationId: string, entries: { seq: number; entity: SyncedEntity; entityId: string; revision: number; deleted: boolean }[]): Promise<void> {
      if (entries.length === 0) return;
      await tx.execute(sql`
        INSERT INTO change_log (organisation_id, seq, entity, entity_id, revision, deleted)
        SELECT ${organisationId}::uuid, s, e, i, r, d
        FROM unnest(${sql.param(entries.map((e) => e.seq))}::bigint[], ${sql.param(entries.map((e) => e.entity))}::text[],
                    ${sql.param(entries.map((e) => e.entityId))}::uuid[], ${sql.param(entries.map((e) => e.revision))}::int[],
                    ${sql.param(entries.map((e) => e.deleted))}::boolean[]) AS u(s, e, i, r, d)`);
    },

    async insertAuditRows(
      tx: Tx,
      organisationId: string,
      actorUserId: string | null,
      requestId: string | null,
      entries: { action: string; entity: string; entityId: string; before: unknown; after: unknown }[],
    ): Promise<void> {
      if (entries.length === 0) return;
      const json = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));
      await tx.execute(sql`
        INSERT INTO audit_log (organisation_id, actor_user_id, action, entity, entity_id, before, after, request_id)
        SELECT ${organisationId}::uuid, ${actorUserId}::uuid, a, e, i, b, af, ${requestId}
        FROM unnest(${sql.param(entries.map((e) => e.action))}::text[], ${sql.param(entries.map((e) => e.entity))}::text[],
                    ${sql.param(entries.map((e) => e.entityId))}::text[], ${sql.param(entries.map((e) => json(e.before)))}::jsonb[],
                    ${sql.param(entries.map((e) => json(e.after)))}::jsonb[]) AS u(a, e, i, b, af)`);
    },

    recordAudit: (tx: DbOrTx, input: Parameters<typeof recordAudit>[1]) => recordAudit(tx, input),

    async insertConflicts(tx: Tx, rows: (typeof syncConflicts.$inferInsert)[]): Promise<string[]> {
      if (rows.length === 0) return [];
      const out = await tx.insert(syncConflicts).values(rows).returning({ id: syncConflicts.id });
      return out.map((r) => r.id);
    },

    async markRepeatsDirty(tx: Tx, organisationId: string, surveyIds: string[]): Promise<void> {
      if (surveyIds.length === 0) return;
      await tx.execute(sql`
        INSERT INTO repeat_recompute_queue (survey_id, organisation_id)
        SELECT s, ${organisationId}::uuid FROM unnest(${sql.param(surveyIds)}::uuid[]) AS s
        ON CONFLICT (survey_id) DO UPDATE SET requested_at = now()`);
    },

    // ------------------------------------------------------------------------------------------ pull

    /**
     * Phase one of a pull: the (entity, id, seq) of the next `limit` visible changes after `since`,
     * across every pulled table, each sub-select walking its (organisation_id, change_seq) unique index.
     * `surveyIds` null means the whole organisation; otherwise survey-scoped tables are filtered to those
     * surveys (assignments also to the user's own), organisation-wide tables (bands, zone sets) are not.
     */
    async pullHeads(tx: Tx, organisationId: string, since: number, limit: number, scope: { surveyIds: string[]; userId: string } | null) {
      const parts = (Object.entries(PULL_TABLES) as [PulledEntity, (typeof PULL_TABLES)[PulledEntity]][]).map(([entity, table]) => {
        const t = table as unknown as { organisationId: PgColumn; changeSeq: PgColumn; id: PgColumn; surveyId?: PgColumn; userId?: PgColumn };
        let filter: SQL | undefined;
        if (scope) {
          const ids = sql`${sql.param(scope.surveyIds)}::uuid[]`;
          if (entity === 'surveys') filter = sql`${t.id} = ANY(${ids})`;
          else if (entity === 'survey_assignments') filter = sql`(${t.surveyId!} = ANY(${ids}) OR ${t.userId!} = ${scope.userId}::uuid)`;
          else if (t.surveyId) filter = sql`${t.surveyId} = ANY(${ids})`;
        }
        return sql`(SELECT ${entity}::text AS entity, ${t.id} AS id, ${t.changeSeq} AS seq FROM ${table}
          WHERE ${t.organisationId} = ${organisationId}::uuid AND ${t.changeSeq} > ${since}${filter ? sql` AND ${filter}` : sql``}
          ORDER BY ${t.changeSeq} LIMIT ${limit})`;
      });
      const result = await tx.execute<{ entity: PulledEntity; id: string; seq: string | number }>(
        sql`SELECT entity, id, seq FROM (${sql.join(parts, sql` UNION ALL `)}) heads ORDER BY seq LIMIT ${limit}`,
      );
      return result.rows.map((r) => ({ entity: r.entity, id: r.id, seq: Number(r.seq) }));
    },

    /** Phase two: the full records of one entity, with the server-only marks. */
    async pullRecords(tx: Tx, organisationId: string, entity: PulledEntity, ids: string[]): Promise<DbRow[]> {
      if (ids.length === 0) return [];
      const table = PULL_TABLES[entity] as unknown as PgTable & { id: PgColumn; organisationId: PgColumn };
      const extra: Record<string, SQL> = {};
      // Qualified by hand: Drizzle leaves columns unqualified inside sql`` in a single-table select, and
      // inside these sub-selects an unqualified name would bind to the inner table.
      const t = sql.raw(q(entity));
      if (entity in CAPTURE_TABLES) {
        extra.conflicted = sql<boolean>`EXISTS (SELECT 1 FROM sync_conflicts c WHERE c.record_id = ${t}.id AND c.organisation_id = ${t}.organisation_id AND c.state = 'open')`;
      }
      const keyColumn = entity === 'field_readings' ? 'photo_object_key' : entity === 'sweeps' ? 'trace_object_key' : null;
      if (keyColumn) {
        const key = sql.raw(`${q(entity)}.${keyColumn}`);
        extra.attachmentPending = sql<boolean>`(${key} IS NOT NULL AND NOT EXISTS (SELECT 1 FROM attachments a WHERE a.organisation_id = ${t}.organisation_id AND a.object_key = ${key}))`;
      }
      const rows = await tx
        .select({ ...getTableColumns(table), ...extra })
        .from(table)
        .where(and(eq(table.organisationId, organisationId), sql`${table.id} = ANY(${sql.param(ids)}::uuid[])`));
      return rows as unknown as DbRow[];
    },

    // ------------------------------------------------------------------------------------- conflicts

    async listConflicts(organisationId: string, filter: { surveyId?: string; state: 'open' | 'resolved' | 'all' }) {
      return db
        .select()
        .from(syncConflicts)
        .where(
          and(
            eq(syncConflicts.organisationId, organisationId),
            filter.surveyId ? eq(syncConflicts.surveyId, filter.surveyId) : undefined,
            filter.state === 'all' ? undefined : eq(syncConflicts.state, filter.state),
          ),
        )
        .orderBy(asc(syncConflicts.createdAt), asc(syncConflicts.id));
    },

    async findConflict(tx: DbOrTx, organisationId: string, conflictId: string, lock = false) {
      const query = tx
        .select()
        .from(syncConflicts)
        .where(and(eq(syncConflicts.organisationId, organisationId), eq(syncConflicts.id, conflictId)));
      const [row] = lock ? await query.for('update') : await query;
      return row ?? null;
    },

    async currentRevisions(entity: CaptureEntity, ids: string[]): Promise<Map<string, number>> {
      if (ids.length === 0) return new Map();
      const table = CAPTURE_TABLES[entity];
      const rows = await db
        .select({ id: table.id, revision: table.revision })
        .from(table)
        .where(inArray(table.id, ids));
      return new Map(rows.map((r) => [r.id, r.revision]));
    },

    async markConflictResolved(
      tx: Tx,
      conflictId: string,
      values: { resolvedByUserId: string; resolution: 'server' | 'incoming'; resolutionNote: string | null; resolvedRevision: number },
    ) {
      const [row] = await tx
        .update(syncConflicts)
        .set({ ...values, state: 'resolved', resolvedAt: new Date() })
        .where(eq(syncConflicts.id, conflictId))
        .returning();
      return row!;
    },

    /** Other open conflicts of the record (resolving one supersedes them: see the service). */
    async openConflictIds(tx: Tx, recordId: string): Promise<string[]> {
      const rows = await tx
        .select({ id: syncConflicts.id })
        .from(syncConflicts)
        .where(and(eq(syncConflicts.recordId, recordId), eq(syncConflicts.state, 'open')));
      return rows.map((r) => r.id);
    },

    // --------------------------------------------------------------------------------------- repeats

    async surveyForRepeats(tx: DbOrTx, organisationId: string, surveyId: string) {
      const [row] = await tx
        .select({ id: surveys.id, repeatRadiusM: surveys.repeatRadiusM, deleted: surveys.deleted, state: surveys.state })
        .from(surveys)
        .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId)));
      return row ?? null;
    },

    /**
     * The readings that take part in repeat grouping: live readings at live stations, not rejected by
     * the latest live decision on them, with the station's position and the instrument's uncertainty.
     */
    async repeatInputs(tx: DbOrTx, organisationId: string, surveyId: string) {
      // Four single-table reads joined here rather than one SQL join: right after a bulk push the
      // planner's row estimates are stale (autovacuum has not analysed yet) and it picked a nested loop
      // that cost seconds for 10,000 readings; these scans cannot go wrong that way.
      const org = sql`${organisationId}::uuid`;
      const survey = sql`${surveyId}::uuid`;
      const stationRows = await tx.execute<{ id: string; level_id: string; x_m: number; y_m: number }>(
        sql`SELECT id, level_id, x_m, y_m FROM stations WHERE organisation_id = ${org} AND survey_id = ${survey} AND NOT deleted`,
      );
      const readingRows = await tx.execute<{ id: string; station_id: string; height_m: number; field_t: number; instrument_id: string | null }>(
        sql`SELECT id, station_id, height_m, field_t, instrument_id FROM field_readings WHERE organisation_id = ${org} AND survey_id = ${survey} AND NOT deleted AND field_t > 0 ORDER BY id`,
      );
      const instrumentRows = await tx.execute<{ id: string; relative_uncertainty: number | null }>(sql`SELECT id, relative_uncertainty FROM instruments WHERE organisation_id = ${org}`);
      const rejectedRows = await tx.execute<{ id: string }>(sql`
        SELECT field_reading_id AS id FROM (
          SELECT DISTINCT ON (field_reading_id) field_reading_id, verdict FROM decisions
          WHERE organisation_id = ${org} AND survey_id = ${survey} AND NOT deleted AND field_reading_id IS NOT NULL
          ORDER BY field_reading_id, change_seq DESC) latest
        WHERE verdict = 'rejected'`);
      const stationsById = new Map(stationRows.rows.map((st) => [st.id, st]));
      const uncertainty = new Map(instrumentRows.rows.map((i) => [i.id, i.relative_uncertainty]));
      const rejected = new Set(rejectedRows.rows.map((r) => r.id));
      const out: { id: string; station_id: string; level_id: string; x_m: number; y_m: number; height_m: number; field_t: number; relative_uncertainty: number | null }[] = [];
      for (const r of readingRows.rows) {
        const st = stationsById.get(r.station_id);
        if (!st || rejected.has(r.id)) continue;
        out.push({ id: r.id, station_id: r.station_id, level_id: st.level_id, x_m: st.x_m, y_m: st.y_m, height_m: r.height_m, field_t: r.field_t, relative_uncertainty: r.instrument_id ? (uncertainty.get(r.instrument_id) ?? null) : null });
      }
      return out;
    },

    /** Takes the survey's repeat-recomputation lock and its queue entry (true when one was waiting). */
    async beginRepeatRecompute(tx: Tx, surveyId: string): Promise<boolean> {
      await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtextextended(${surveyId}::text, 4242))`);
      const removed = await tx.delete(repeatRecomputeQueue).where(eq(repeatRecomputeQueue.surveyId, surveyId)).returning({ id: repeatRecomputeQueue.surveyId });
      return removed.length > 0;
    },

    async isRepeatDirty(tx: DbOrTx, surveyId: string): Promise<boolean> {
      const rows = await tx.select({ id: repeatRecomputeQueue.surveyId }).from(repeatRecomputeQueue).where(eq(repeatRecomputeQueue.surveyId, surveyId));
      return rows.length > 0;
    },

    async dirtySurveys(): Promise<{ surveyId: string; organisationId: string }[]> {
      return db.select({ surveyId: repeatRecomputeQueue.surveyId, organisationId: repeatRecomputeQueue.organisationId }).from(repeatRecomputeQueue);
    },

    async repeatFlags(tx: DbOrTx, organisationId: string, surveyId: string) {
      return tx
        .select()
        .from(flags)
        .where(and(eq(flags.organisationId, organisationId), eq(flags.surveyId, surveyId), eq(flags.kind, 'repeat_disagreement'), eq(flags.deleted, false)));
    },

    async insertFlags(tx: Tx, rows: (typeof flags.$inferInsert)[]) {
      if (rows.length === 0) return [];
      return tx.insert(flags).values(rows).returning();
    },

    /** New details or a tombstone for many flags in one statement. */
    async updateFlags(tx: Tx, items: { id: string; details: Record<string, unknown>; deleted: boolean; revision: number; changeSeq: number }[]) {
      if (items.length === 0) return;
      await tx.execute(sql`
        UPDATE flags f SET details = u.details, deleted = u.deleted, revision = u.revision, change_seq = u.seq, updated_at = now()
        FROM unnest(${sql.param(items.map((i) => i.id))}::uuid[], ${sql.param(items.map((i) => JSON.stringify(i.details)))}::jsonb[],
                    ${sql.param(items.map((i) => i.deleted))}::boolean[], ${sql.param(items.map((i) => i.revision))}::int[],
                    ${sql.param(items.map((i) => i.changeSeq))}::bigint[]) AS u(id, details, deleted, revision, seq)
        WHERE f.id = u.id`);
    },

  };
}
export type SyncRepository = ReturnType<typeof createSyncRepository>;
