/**
 * Every database statement of sync (push, pull, conflicts, repeat groups). The bulk paths — applying a
 * push, its change_log rows, the processed-mutation rows — are single `INSERT … SELECT FROM
 * unnest($1::uuid[], $2::integer[], …)` statements: the rows travel as one array literal per column,
 * written here (`arrayLiteral`) rather than by the driver, whose per-element conversion costs over
 * twice as much (STACK.md, "Performance facts": Drizzle's builder spends most of its time building SQL
 * text for many rows, so it is not used for them either). Lookups by a batch's ids join `unnest(ids)`
 * LATERAL to a key lookup that cannot be flattened into a join (LIMIT 1, or FOR UPDATE), so each id is
 * one index probe whatever the planner believes about a table a bulk push has just grown (`id = ANY(…)`
 * and plain joins became sequential scans of the whole table there). Drizzle's builder is kept for the
 * other reads and the few-row writes. The rules live in sync.service.ts.
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
  /** The SQL type, e.g. `uuid`, `double precision`, an enum's name. */
  type: string;
  column: PgColumn;
}

/** Columns a push writes: everything but the generated |B| and the server-kept timestamps. */
function writableColumns(table: PgTable): ColumnSpec[] {
  return Object.entries(getTableColumns(table))
    .filter(([key, column]) => !(column as PgColumn & { generated?: unknown }).generated && key !== 'createdAt' && key !== 'updatedAt')
    .map(([key, column]) => {
      return { key, name: column.name, type: column.getSQLType(), column: column as PgColumn };
    });
}

const WRITABLE = Object.fromEntries(Object.entries(CAPTURE_TABLES).map(([entity, table]) => [entity, writableColumns(table)])) as Record<CaptureEntity, ColumnSpec[]>;

const q = (name: string) => `"${name.replace(/"/g, '""')}"`;

/**
 * `unnest($1::uuid[], $2::integer[], …) AS u("organisationId", …)`: the rows as one array per column,
 * each sent as one PostgreSQL array literal (missing keys become NULL; a jsonb column's values are
 * sent as JSON texts). Measured on 500 readings: the insert is about a tenth cheaper than parsing the
 * same rows out of one JSON text with `json_to_recordset`, and the five-column change_log insert half
 * as dear. A column with one value in every row (the organisation, the survey, the surveyor, a unit)
 * is sent once, as a single parameter, not repeated in an array.
 */
function recordset(columns: ColumnSpec[], rows: Record<string, unknown>[], seqBase?: string): { from: SQL; select: SQL; names: string } {
  const value = (c: ColumnSpec, r: Record<string, unknown>) => (c.type === 'jsonb' ? jsonText(r[c.key]) : (r[c.key] ?? null));
  const arrays: { alias: string; type: string; values: unknown[] }[] = [];
  const select = columns.map((c) => {
    const values = rows.map((r) => value(c, r));
    const first = values[0];
    const constant = rows.length > 1 && c.key !== 'id' && (first === null || typeof first !== 'object') && values.every((v) => v === first);
    if (!constant) arrays.push({ alias: c.key, type: c.type, values });
    const expr = constant ? sql`${Object.is(first, -0) ? '-0' : first}::${sql.raw(c.type)}` : sql.raw(`u.${q(c.key)}`);
    // `seqBase`: the rows' changeSeq are places in a batch, added to the base the statement reserved.
    return seqBase && c.key === 'changeSeq' ? sql`${sql.raw(seqBase)} + ${expr}` : expr;
  });
  return { from: unnestColumns(arrays), select: sql.join(select, sql`, `), names: columns.map((c) => q(c.name)).join(', ') };
}

/** An `applied` answer with nothing but its revision and sequence (no conflict id). */
function isPlainApplied(answer: Record<string, unknown>): answer is { status: 'applied'; revision: number; changeSeq: number } {
  if (answer.status !== 'applied' || typeof answer.revision !== 'number' || typeof answer.changeSeq !== 'number') return false;
  for (const key in answer) if (key !== 'status' && key !== 'revision' && key !== 'changeSeq') return false;
  return true;
}

const jsonText = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));

const ESCAPED = /[\\"]/;

/**
 * A PostgreSQL array literal (`{…}`) of one column's values, sent as one text parameter. Every text is
 * quoted (so no value can split into two elements or read as NULL), numbers and booleans are written
 * as they are. The driver does the same for a JavaScript array, at over twice the cost (500 readings
 * × 23 columns: 3.1 ms against 1.4 ms, measured in Node 20).
 */
export function arrayLiteral(values: readonly unknown[]): string {
  let out = '{';
  for (let i = 0; i < values.length; i += 1) {
    if (i > 0) out += ',';
    const v = values[i];
    if (v === null || v === undefined) out += 'NULL';
    else if (typeof v === 'number') out += Object.is(v, -0) ? '-0' : String(v);
    else if (typeof v === 'bigint') out += String(v);
    else if (typeof v === 'boolean') out += v ? 't' : 'f';
    else {
      const text = typeof v === 'string' ? v : v instanceof Date ? v.toISOString() : JSON.stringify(v);
      out += ESCAPED.test(text) ? `"${text.replace(/[\\"]/g, '\\$&')}"` : `"${text}"`;
    }
  }
  return `${out}}`;
}

/** `unnest($1::type[], …) AS u(alias, …)`: rows as parallel column arrays, all of one length. */
function unnestColumns(columns: { alias: string; type: string; values: unknown[] }[]): SQL {
  const arrays = columns.map((c) => sql`${arrayLiteral(c.values)}::${sql.raw(c.type)}[]`);
  return sql`unnest(${sql.join(arrays, sql`, `)}) AS u(${sql.raw(columns.map((c) => q(c.alias)).join(', '))})`;
}

/** Every column of a capture table (generated |B| included), for reading whole rows with raw SQL. */
const READ_COLUMNS = Object.fromEntries(
  Object.entries(CAPTURE_TABLES).map(([entity, table]) => [entity, Object.entries(getTableColumns(table)).map(([key, column]) => ({ key, name: column.name, column }))]),
) as Record<CaptureEntity, { key: string; name: string; column: PgColumn }[]>;

/** A row as `to_jsonb` gives it (column names, JSON values) in Drizzle's shape (camelCase keys, Dates). */
function mapRow(entity: CaptureEntity, raw: Record<string, unknown>): DbRow {
  const out: Record<string, unknown> = {};
  for (const { key, name, column } of READ_COLUMNS[entity]) {
    const v = raw[name];
    out[key] = v === null || v === undefined ? null : column.mapFromDriverValue(v);
  }
  return out as DbRow;
}

/**
 * Inserts records or overwrites existing ones of one entity. The WHERE keeps a row of another
 * organisation untouched even if a check upstream were missed.
 */
function upsertStatement(entity: CaptureEntity, rows: Record<string, unknown>[], seqBase?: string): SQL {
  const table = q(entity);
  const columns = WRITABLE[entity];
  const u = recordset(columns, rows, seqBase);
  const updates = columns
    .filter((c) => c.key !== 'id' && c.key !== 'organisationId')
    .map((c) => `${q(c.name)} = EXCLUDED.${q(c.name)}`)
    .join(', ');
  return sql`
    INSERT INTO ${sql.raw(table)} (${sql.raw(u.names)}, updated_at)
    SELECT ${u.select}, now() FROM ${u.from}
    ON CONFLICT (id) DO UPDATE SET ${sql.raw(updates)}, updated_at = now()
    WHERE ${sql.raw(table)}.organisation_id = EXCLUDED.organisation_id`;
}

const uuids = (ids: readonly string[]) => sql`${arrayLiteral([...new Set(ids)])}::uuid[]`;

/** What a push batch needs to know before deciding, read in one statement (see `batchContext`). */
export interface BatchContext {
  /** Stored answers of mutation ids seen before (with their mutation id). */
  seen: Map<string, Record<string, unknown>>;
  surveys: Map<string, { id: string; state: 'open' | 'submitted' | 'signed_off'; siteId: string; deleted: boolean; assigned: boolean }>;
  /** Station and walk id → survey id; level id → site id; room id → level id. */
  stations: Map<string, string>;
  walks: Map<string, string>;
  levels: Map<string, string>;
  rooms: Map<string, string>;
  instruments: Set<string>;
  /** The current rows of the batch's records, per capture table. */
  records: { entity: CaptureEntity; rows: DbRow[] }[];
  /**
   * Change sequences reserved for the batch (first … first + count − 1; count 0 when every mutation
   * was answered before): the organisation's counter is locked until the transaction ends, so what the
   * batch does not use is given back at its end (`writeBatch`'s `counter`).
   */
  seqs: { first: number; count: number };
}

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

    /**
     * Everything a batch is decided against, in ONE statement: first the advisory locks on its record
     * ids, sorted, as `lockRecordIds` takes them; then the stored answers of its mutation ids; then
     * whether any of its records exists already. Only then, and only if one does, the reservation of one
     * change sequence per mutation not answered before (at most what the batch can use, the rest given
     * back at its end), which locks the organisation's counter row before the records' rows are locked
     * FOR UPDATE — the order of every other writer (attachments, site setup), so none can deadlock with
     * it. A batch that only creates records locks no row here: its write statement reserves its
     * sequences (`writeBatch`, `reserve`), so its reads and checks run while another push of the
     * organisation holds the counter, instead of after. Then its surveys with whether the user is
     * assigned; the stations, walks, levels, rooms and instruments it names that exist in this
     * organisation; and the current rows of its records, in any organisation (the caller tells own rows
     * from foreign ids). Ids may be a superset of the batch's (they are asked before the batch has been
     * checked); the caller looks up only what it needs.
     *
     * The reads share the statement's snapshot, taken before the locks were granted: a push that held
     * them and committed while this one waited is not seen here, except through FOR UPDATE (which reads
     * the latest version of an existing row). Whatever else it wrote this push then collides with on a
     * key when it writes (the record it created, the mutation ids it stored), and the rerun (careful mode,
     * a new transaction) sees it all. A plain retry, the common case, waits for nothing.
     */
    async batchContext(
      tx: Tx,
      organisationId: string,
      userId: string,
      want: {
        recordIds: string[];
        mutationIds: string[];
        /** Change sequences to reserve at most: one per mutation sent, less those already answered. */
        mutationCount: number;
        surveyIds: string[];
        records: Map<CaptureEntity, string[]>;
        stations: string[];
        walks: string[];
        levels: string[];
        rooms: string[];
        instruments: string[];
      },
    ): Promise<BatchContext> {
      const org = sql`${organisationId}::uuid`;
      const records = [...want.records].map(([entity, ids]) => ({ entity, table: sql.raw(q(entity)), ids: uuids(ids) }));
      const probes = records.map(({ table, ids }) => sql`SELECT 1 FROM unnest(${ids}) AS k(id) WHERE EXISTS (SELECT 1 FROM ${table} t WHERE t.id = k.id)`);
      const recordParts = records.map(
        ({ entity, table, ids }) => sql`
        UNION ALL
        SELECT ${entity}, x.id, NULL, x.row FROM unnest(${ids}) AS k(id)
          CROSS JOIN LATERAL (SELECT t.id, to_jsonb(t.*) AS row FROM ${table} t WHERE t.id = k.id FOR UPDATE) x
          WHERE (SELECT found FROM existing)`,
      );
      // `.execute()` sends the statement now: awaiting Drizzle's lazy query object would send it only on
      // the next microtask, after the caller's synchronous checks of the batch, instead of beside them.
      const result = await tx.execute<{ kind: string; id: string; parent: string | null; data: unknown }>(sql`
        WITH locks AS MATERIALIZED (
          SELECT count(pg_advisory_xact_lock(k)) AS n FROM (
            SELECT DISTINCT hashtextextended(id::text, 7531) AS k FROM unnest(${uuids(want.recordIds)}) AS id ORDER BY 1) keys
        ), seen AS MATERIALIZED (
          SELECT s.mutation_id, s.result FROM locks, unnest(${uuids(want.mutationIds)}) AS k(id)
          CROSS JOIN LATERAL (
            SELECT mutation_id, COALESCE(result, jsonb_build_object('status', 'applied', 'revision', applied_revision, 'changeSeq', applied_change_seq)) AS result
            FROM sync_mutations WHERE organisation_id = ${org} AND mutation_id = k.id LIMIT 1) s
        ), existing AS MATERIALIZED (
          SELECT EXISTS (${probes.length > 0 ? sql.join(probes, sql` UNION ALL `) : sql`SELECT 1 WHERE false`}) AS found FROM locks
        ), seq AS (
          UPDATE organisations SET change_seq = change_seq + (${want.mutationCount}::int - (SELECT count(*) FROM seen))
          WHERE id = ${org} AND (SELECT found FROM existing) AND ${want.mutationCount}::int > (SELECT count(*) FROM seen)
          RETURNING change_seq, ${want.mutationCount}::int - (SELECT count(*) FROM seen) AS reserved
        )
        SELECT 'seen' AS kind, mutation_id AS id, NULL::uuid AS parent, result AS data FROM seen
        UNION ALL
        SELECT 'seq', NULL, NULL, jsonb_build_object('last', change_seq, 'count', reserved) FROM seq
        UNION ALL
        SELECT 'survey', s.id, s.site_id,
               jsonb_build_object('state', s.state, 'deleted', s.deleted, 'assigned',
                 EXISTS (SELECT 1 FROM survey_assignments a WHERE a.survey_id = s.id AND a.organisation_id = s.organisation_id AND a.user_id = ${userId}::uuid AND NOT a.deleted))
          FROM surveys s WHERE s.organisation_id = ${org} AND s.id = ANY(${uuids(want.surveyIds)})
        UNION ALL
        SELECT 'station', x.id, x.survey_id, NULL FROM unnest(${uuids(want.stations)}) AS k(id)
          CROSS JOIN LATERAL (SELECT id, survey_id FROM stations WHERE id = k.id AND organisation_id = ${org} LIMIT 1) x
        UNION ALL
        SELECT 'walk', x.id, x.survey_id, NULL FROM unnest(${uuids(want.walks)}) AS k(id)
          CROSS JOIN LATERAL (SELECT id, survey_id FROM walks WHERE id = k.id AND organisation_id = ${org} LIMIT 1) x
        UNION ALL SELECT 'level', id, site_id, NULL FROM levels WHERE organisation_id = ${org} AND id = ANY(${uuids(want.levels)})
        UNION ALL SELECT 'room', id, level_id, NULL FROM rooms WHERE organisation_id = ${org} AND id = ANY(${uuids(want.rooms)})
        UNION ALL SELECT 'instrument', id, NULL, NULL FROM instruments WHERE organisation_id = ${org} AND id = ANY(${uuids(want.instruments)})
        ${sql.join(recordParts, sql``)}`).execute();
      const out: BatchContext = { seqs: { first: 0, count: 0 }, seen: new Map(), surveys: new Map(), stations: new Map(), walks: new Map(), levels: new Map(), rooms: new Map(), instruments: new Set(), records: [] };
      const byEntity = new Map<CaptureEntity, DbRow[]>();
      for (const r of result.rows) {
        if (r.kind === 'seq') {
          const d = r.data as { last: number; count: number };
          out.seqs = { first: Number(d.last) - Number(d.count) + 1, count: Number(d.count) };
        } else if (r.kind === 'seen') {
          // Answers are stored without their mutation id (older rows have it: the same value).
          if (r.data) out.seen.set(r.id, { mutationId: r.id, ...(r.data as Record<string, unknown>) });
        } else if (r.kind === 'survey') {
          const d = r.data as { state: 'open' | 'submitted' | 'signed_off'; deleted: boolean; assigned: boolean };
          out.surveys.set(r.id, { id: r.id, siteId: r.parent!, state: d.state, deleted: d.deleted, assigned: d.assigned });
        } else if (r.kind === 'station') out.stations.set(r.id, r.parent!);
        else if (r.kind === 'walk') out.walks.set(r.id, r.parent!);
        else if (r.kind === 'level') out.levels.set(r.id, r.parent!);
        else if (r.kind === 'room') out.rooms.set(r.id, r.parent!);
        else if (r.kind === 'instrument') out.instruments.add(r.id);
        else {
          const entity = r.kind as CaptureEntity;
          const row = mapRow(entity, r.data as Record<string, unknown>);
          const list = byEntity.get(entity);
          if (list) list.push(row);
          else byEntity.set(entity, [row]);
        }
      }
      out.records = [...byEntity].map(([entity, rows]) => ({ entity, rows }));
      return out;
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
     * A push batch's writes in ONE statement (writable CTEs; foreign keys are checked at its end, so a
     * reading may name a station inserted beside it): new records in a plain INSERT and changed ones in
     * an upsert per table, the sequence-only touches, then the change_log rows, the stored answers, the
     * audit rows — the batch's `sync_push` row, listing the records it created, made here from the
     * changes — and the repeat-recomputation queue entries. `records` is empty when the records were
     * written already (careful mode, one savepoint each) and there is nothing to touch.
     *
     * Sequences: with `reserve` > 0 the statement first reserves that many from the organisation's
     * counter (locking its row to the end of the transaction) and every sequence given — rows'
     * changeSeq, changes' seq, answers' changeSeq, audits' changeSeq — is a place in the batch (1, 2, …)
     * added to the reserved base; the base is returned. With `reserve` 0 they are the sequences
     * themselves and 0 is returned.
     *
     * The answers are a plain INSERT (no ON CONFLICT: its speculative insertion costs a tenth of a push):
     * the batch's mutation ids were looked up after its record locks, so a duplicate can only come from
     * another batch carrying the same mutation id for other records; its unique violation reruns the
     * batch (careful mode), which then finds that mutation answered and replays the stored answer.
     */
    async writeBatch(
      tx: Tx,
      input: {
        organisationId: string;
        deviceId: string;
        userId: string;
        requestId: string | null;
        records: { entity: CaptureEntity; inserts: Record<string, unknown>[]; upserts: Record<string, unknown>[]; touches: { id: string; changeSeq: number }[] }[];
        /** `created`: listed in the batch's sync_push audit row. */
        changes: { seq: number; entity: SyncedEntity; entityId: string; revision: number; deleted: boolean; created: boolean }[];
        mutations: { mutationId: string; entity: string; recordId: string; queuedAt: string | null; result: Record<string, unknown> }[];
        /** `changeSeq`, when given, is set into `after`. */
        audits: { action: string; entity: string; entityId: string; before: unknown; after: unknown; changeSeq?: number }[];
        /** The batch's own audit row (with the device and the records created), or null for none. */
        pushAudit: { mutations: number } | null;
        dirtySurveyIds: string[];
        /** The organisation's counter as the batch leaves it (the reserved sequences it did not use given back), or null to leave it. */
        counter: number | null;
        reserve: number;
      },
    ): Promise<number> {
      const org = sql`${input.organisationId}::uuid`;
      const base = '(SELECT base FROM seq)';
      const col = <T>(list: T[], alias: string, type: string, value: (x: T) => unknown) => ({ alias, type, values: list.map(value) });
      const ctes: SQL[] = [
        input.reserve > 0
          ? sql`seq AS (UPDATE organisations SET change_seq = change_seq + ${input.reserve}::int WHERE id = ${org} RETURNING change_seq - ${input.reserve}::int AS base)`
          : sql`seq AS (SELECT 0::bigint AS base)`,
      ];
      input.records.forEach(({ entity, inserts, upserts, touches }, n) => {
        const table = sql.raw(q(entity));
        if (inserts.length > 0) {
          const u = recordset(WRITABLE[entity], inserts, base);
          ctes.push(sql`${sql.raw(`new_${n}`)} AS (INSERT INTO ${table} (${sql.raw(u.names)}) SELECT ${u.select} FROM ${u.from})`);
        }
        if (upserts.length > 0) ctes.push(sql`${sql.raw(`changed_${n}`)} AS (${upsertStatement(entity, upserts, base)})`);
        if (touches.length > 0) {
          const u = unnestColumns([col(touches, 'id', 'uuid', (x) => x.id), col(touches, 'seq', 'bigint', (x) => x.changeSeq)]);
          ctes.push(sql`${sql.raw(`touched_${n}`)} AS (UPDATE ${table} t SET change_seq = ${sql.raw(base)} + u.seq, updated_at = now() FROM ${u} WHERE t.id = u.id)`);
        }
      });
      if (input.counter !== null) ctes.push(sql`counter AS (UPDATE organisations SET change_seq = ${input.counter} WHERE id = ${org})`);
      const { changes: c, audits: a } = input;
      const m = input.mutations.map((x) => ({ ...x, plain: isPlainApplied(x.result) }));
      const changes = unnestColumns([
        col(c, 's', 'bigint', (x) => x.seq),
        col(c, 'e', 'text', (x) => x.entity),
        col(c, 'i', 'uuid', (x) => x.entityId),
        col(c, 'r', 'integer', (x) => x.revision),
        col(c, 'd', 'boolean', (x) => x.deleted),
        col(c, 'cr', 'boolean', (x) => x.created),
      ]);
      const answers = unnestColumns([
        col(m, 'mi', 'uuid', (x) => x.mutationId),
        col(m, 'e', 'text', (x) => x.entity),
        col(m, 'r', 'uuid', (x) => x.recordId),
        col(m, 'qa', 'timestamptz', (x) => x.queuedAt),
        // A plain applied answer goes into the typed columns, any other whole into result (see the schema).
        col(m, 'ar', 'integer', (x) => (x.plain ? x.result.revision : null)),
        col(m, 'ac', 'bigint', (x) => (x.plain ? x.result.changeSeq : null)),
        col(m, 'res', 'jsonb', (x) => (x.plain ? null : jsonText(x.result))),
      ]);
      const audit = unnestColumns([
        col(a, 'ac', 'text', (x) => x.action),
        col(a, 'e', 'text', (x) => x.entity),
        col(a, 'i', 'text', (x) => x.entityId),
        col(a, 'b', 'jsonb', (x) => jsonText(x.before)),
        col(a, 'af', 'jsonb', (x) => jsonText(x.after)),
        col(a, 'so', 'bigint', (x) => x.changeSeq ?? null),
      ]);
      const pushAudit = input.pushAudit
        ? sql`
          UNION ALL
          SELECT 'sync_push', 'sync_batch', ${input.deviceId}, NULL, jsonb_build_object(
            'deviceId', ${input.deviceId}::text, 'mutations', ${input.pushAudit.mutations}::int,
            'created', COALESCE((SELECT jsonb_agg(jsonb_build_object('entity', e, 'id', i, 'revision', r, 'changeSeq', ${sql.raw(base)} + s) ORDER BY s) FROM changes WHERE cr), '[]'::jsonb))`
        : sql``;
      const result = await tx.execute<{ base: string | number }>(sql`
        WITH ${sql.join([...ctes, sql``], sql`, `)}changes AS MATERIALIZED (
          SELECT * FROM ${changes}
        ), log AS (
          INSERT INTO change_log (organisation_id, seq, entity, entity_id, revision, deleted)
          SELECT ${org}, ${sql.raw(base)} + s, e, i, r, d FROM changes
        ), answers AS (
          INSERT INTO sync_mutations (organisation_id, mutation_id, device_id, user_id, entity, record_id, queued_at, applied_revision, applied_change_seq, result)
          SELECT ${org}, mi, ${input.deviceId}, ${input.userId}::uuid, e, r, qa, ar, ${sql.raw(base)} + ac, res FROM ${answers}
        ), audit AS (
          INSERT INTO audit_log (organisation_id, actor_user_id, action, entity, entity_id, before, after, request_id)
          SELECT ${org}, ${input.userId}::uuid, ac, e, i, b, af, ${input.requestId} FROM (
            SELECT ac, e, i, b, CASE WHEN so IS NULL THEN af ELSE jsonb_set(af, '{changeSeq}', to_jsonb(${sql.raw(base)} + so)) END AS af FROM ${audit}
            ${pushAudit}) rows
        ), queue AS (
          INSERT INTO repeat_recompute_queue (survey_id, organisation_id, requested_at)
          SELECT s, ${org}, clock_timestamp() FROM unnest(${uuids(input.dirtySurveyIds)}) AS s
          ON CONFLICT (survey_id) DO UPDATE SET requested_at = clock_timestamp()
        )
        SELECT base FROM seq`);
      return Number(result.rows[0]!.base);
    },

    // ------------------------------------------------------------------------------------ the writes

    /** Sets the organisation's counter back to `changeSeq`: only for sequences this transaction reserved and did not use. */
    async setChangeSeq(tx: Tx, organisationId: string, changeSeq: number): Promise<void> {
      await tx.execute(sql`UPDATE organisations SET change_seq = ${changeSeq} WHERE id = ${organisationId}::uuid`);
    },

    /** Counter bump for `count` sequences (the organisation row lock: see server/db/audit.ts). */
    reserveChangeSeqs: (tx: Tx, organisationId: string, count: number) => reserveChangeSeqs(tx, organisationId, count),

    /**
     * Inserts new records and overwrites existing ones of one entity in one statement. `rows` carry
     * every writable column (wire values; the server has set revision, changeSeq and the object keys).
     * Returns the ids written.
     */
    async upsertRecords(tx: Tx, entity: CaptureEntity, rows: Record<string, unknown>[]): Promise<string[]> {
      if (rows.length === 0) return [];
      const result = await tx.execute<{ id: string }>(sql`${upsertStatement(entity, rows)} RETURNING id`);
      return result.rows.map((r) => r.id);
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
      await tx.execute(sql`
        INSERT INTO audit_log (organisation_id, actor_user_id, action, entity, entity_id, before, after, request_id)
        SELECT ${organisationId}::uuid, ${actorUserId}::uuid, a, e, i, b, af, ${requestId}
        FROM unnest(${sql.param(entries.map((e) => e.action))}::text[], ${sql.param(entries.map((e) => e.entity))}::text[],
                    ${sql.param(entries.map((e) => e.entityId))}::text[], ${sql.param(entries.map((e) => jsonText(e.before)))}::jsonb[],
                    ${sql.param(entries.map((e) => jsonText(e.after)))}::jsonb[]) AS u(a, e, i, b, af)`);
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
        INSERT INTO repeat_recompute_queue (survey_id, organisation_id, requested_at)
        SELECT s, ${organisationId}::uuid, clock_timestamp() FROM unnest(${sql.param(surveyIds)}::uuid[]) AS s
        ON CONFLICT (survey_id) DO UPDATE SET requested_at = clock_timestamp()`);
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

    /** The survey's state, read under its row lock (FOR NO KEY UPDATE: pushes' key checks still pass). */
    async lockSurveyState(tx: Tx, surveyId: string): Promise<string | null> {
      const result = await tx.execute<{ state: string }>(sql`SELECT state FROM surveys WHERE id = ${surveyId}::uuid FOR NO KEY UPDATE`);
      return result.rows[0]?.state ?? null;
    },

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

    /**
     * Takes the survey's repeat-recomputation lock (recomputations of one survey run one at a time) and
     * reads its queue entry's stamp, or null when it is not queued. The entry itself is left alone until
     * `finishRepeatRecompute`, so a push re-queuing the survey meanwhile never waits for a recomputation
     * (it updates the entry and goes on), and a crash mid-recomputation leaves the survey queued.
     */
    async beginRepeatRecompute(tx: Tx, surveyId: string): Promise<string | null> {
      await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtextextended(${surveyId}::text, 4242))`);
      const result = await tx.execute<{ stamp: string }>(sql`SELECT requested_at::text AS stamp FROM repeat_recompute_queue WHERE survey_id = ${surveyId}::uuid`);
      return result.rows[0]?.stamp ?? null;
    },

    /**
     * Removes the queue entry read by `beginRepeatRecompute`, unless a push has stamped it again since
     * (its readings may be missing from what was computed: the survey stays queued for another run).
     */
    async finishRepeatRecompute(tx: Tx, surveyId: string, stamp: string): Promise<void> {
      await tx.execute(sql`DELETE FROM repeat_recompute_queue WHERE survey_id = ${surveyId}::uuid AND requested_at = ${stamp}::timestamptz`);
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
