/**
 * Sync between devices and the server (issue 5; DESIGN.md §4). shared/schemas/sync.ts has the wire
 * shapes; this is the rule book.
 *
 * PUSH — one transaction per batch, in these steps:
 *  1. Each mutation is parsed on its own (the MutationSchema envelope, then its entity's capture schema;
 *     the payload's id, surveyId and organisationId must match the mutation and the URL). A bad one is
 *     `rejected` with the zod issues; the rest of the batch goes on. This runs while the database works
 *     on step 2, which needs only the ids as sent.
 *  2. ONE statement (repository `batchContext`) advisory-locks the batch's record ids (sorted, per
 *     transaction) and reads everything the batch is decided against: the stored answers of its
 *     mutation ids in sync_mutations (ids seen before are answered with the result stored the first time
 *     and not applied again), its surveys and assignments, its references and its records' rows. A
 *     retry racing the first attempt locks the same record ids, so it waits until the first commits;
 *     its reads being older than that commit, it then collides with the first attempt's keys (records,
 *     stored answers) when it writes, and its rerun (careful mode, below) finds its mutations answered.
 *     The answers are stored at the end of the transaction, in the one write statement.
 *  3. Permission per mutation: the survey must exist in this organisation (another organisation's survey
 *     looks exactly like a missing one: SURVEY_NOT_FOUND), be `open` (SURVEY_NOT_OPEN otherwise, with
 *     the state), and the user must be assigned to it (NOT_ASSIGNED) — admins may write into any open
 *     survey of their organisation without an assignment. A surveyor writes walks, readings and sweeps
 *     only under their own name (NOT_OWNER); stations are shared by the survey's surveyors. The route
 *     itself admits admin, reviewer and surveyor.
 *  4. References: a reading's or sweep's station, and any walk, must exist on the server or be created
 *     earlier in the same batch; otherwise STATION_UNKNOWN / WALK_UNKNOWN — a retriable rejection, so a
 *     device whose station is still in a later batch simply retries (out-of-order batches are refused,
 *     not reordered). Levels, rooms and instruments must be of this organisation and fit the survey's
 *     site (REFERENCE_UNKNOWN).
 *  5. The records' rows are read FOR UPDATE (in step 2), then each mutation is decided in batch order
 *     against the record as the batch has left it:
 *     - no record: created, revision 1;
 *     - baseRevision = the server's revision: applied, revision + 1 (a tombstone is a write like any
 *       other);
 *     - otherwise, if the incoming record equals the server's (all fields but revision): applied with no
 *       write (a re-sent change is not a conflict);
 *     - otherwise an edit reaching a tombstone is KEPT (the record revives, revision + 1) and an
 *       edit_vs_delete conflict records the tombstone; any other mismatch is a `conflict` (edit_vs_edit,
 *       or delete_vs_edit for a deletion reaching an edited record): the server row stays, the incoming
 *       version goes to sync_conflicts, and the record gets a new change sequence (not a new revision)
 *       so every device pulls it again with `conflicted: true`. Records are never merged field by field.
 *  6. The writes. A batch that changes an existing record had its change sequences reserved in step 2
 *     (one per mutation not answered before, the organisation's counter row locked before the records'
 *     rows, in every writer's order; what the batch does not use is given back in the write — no gap).
 *     A batch that only creates records reserves exactly what it uses in its write statement, the first
 *     thing that statement does: its reads, checks and decisions do not wait for another push of the
 *     organisation to commit, which matters when a device has two batches on the way
 *     (shared/sync/push-plan.ts). The counter row stays locked to the end of the transaction either way
 *     (the pull's ordering rests on it). Then ONE statement (writable CTEs, rows sent as column arrays)
 *     for the new records (a plain INSERT per entity), the changed ones (`… ON CONFLICT (id) DO
 *     UPDATE`), the sequence-only touches, the change_log rows, the audit rows, the stored answers and
 *     the repeat queue — BEGIN, two statements (a third when the batch records conflicts) and COMMIT per
 *     batch whatever its size. If the write fails on a database constraint the schemas do not express
 *     (or on a key a racing push took, step 2), the whole transaction runs again in careful mode, each
 *     record in its own savepoint: the failing record's mutations are rejected (CONSTRAINT_FAILED), the
 *     rest apply.
 *  7. Audit: every update, tombstone, revival and conflict has its own audit_log row with before and
 *     after; creations are listed (entity, id, revision) in one `sync_push` row per batch with the device,
 *     because a created record's "after" is the row itself and writing 500 copies of it would double the
 *     cost of a push for no information (the sync_mutations rows name the user and device of each).
 *  8. Readings or stations changed → the survey joins repeat_recompute_queue in the same transaction,
 *     and repeat groups are recomputed after the commit, debounced per survey, in the background
 *     (repeats.service.ts).
 *
 * Server-assigned, never taken from the device: revision, changeSeq, timestamps, and the attachment
 * object keys (derived from the record and the file's SHA-256; shared/sync/attachment-key.ts). Device
 * clocks (queuedAt, measuredAt, startedAt) are stored and never used for ordering.
 *
 * PULL — every change visible to the caller with change_seq > cursor, ordered by change_seq, in pages.
 * Surveyors see the surveys they are assigned to (all records of those surveys, any surveyor's,
 * including decisions — remeasure requests — flags and tombstones) plus the organisation's watch bands
 * and zone sets; every other role sees the whole organisation. Why `seq > cursor` loses nothing while
 * writes continue: a writer takes its sequences from the organisation's counter row with an UPDATE,
 * holding that row lock until it commits (server/db/audit.ts). So a transaction holding seq N commits
 * before any transaction can take N + 1: once a page has shown N, every smaller sequence is committed
 * (or rolled back for good), and no change can later appear behind the cursor. Each page is read in one
 * REPEATABLE READ snapshot, so its heads and its records agree. A record written again after being
 * pulled moves to a new, higher sequence and comes again — as the new change it is.
 */
import { createHash } from 'node:crypto';
import { z } from 'zod';
import type { Role } from '../../../shared/schemas/common';
import { CAPTURE_ENTITIES, type CaptureEntity } from '../../../shared/schemas/capture';
import {
  PULLED_ENTITIES,
  type ConflictListQuerySchema,
  type PullChange,
  type PullQuery,
  type PullResponse,
  type PushRejectionCode,
  type PushRequest,
  type PushResponse,
  type PushResult,
  type ResolveConflict,
  type SyncConflict,
} from '../../../shared/schemas/sync';
import { attachmentObjectKey } from '../../../shared/sync/attachment-key';
import { MutationSchema, type Mutation } from '../../../shared/sync/mutation';
import type { Tx } from '../../db/client';
import type { SyncedEntity } from '../../db/schema/synced-tables';
import { AppError, notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { constraintOf, type BatchContext, type DbRow, type SyncRepository } from './sync.repository';

export interface SyncActor {
  organisationId: string;
  userId: string;
  role: Role;
  requestId?: string | undefined;
}

/** Roles that may push; emc and viewer read only. */
export const PUSH_ROLES = ['admin', 'reviewer', 'surveyor'] as const satisfies readonly Role[];
export const CONFLICT_ROLES = ['admin', 'reviewer'] as const satisfies readonly Role[];

/** Order in which a batch's entities are written, parents first (the foreign keys). */
const WRITE_ORDER: CaptureEntity[] = ['walks', 'stations', 'field_readings', 'sweeps'];
/** Keys a device may send but the server decides (and so leaves out of "same content"). */
const SERVER_KEYS = new Set(['revision', 'changeSeq', 'createdAt', 'updatedAt', 'photoObjectKey', 'traceObjectKey', 'fieldT', 'conflicted', 'attachmentPending']);
const ISO_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/;

type Rejection = { code: PushRejectionCode; message: string; details?: unknown };
const reject = (code: PushRejectionCode, message: string, details?: unknown): Rejection => ({ code, message, ...(details === undefined ? {} : { details }) });

function issuesOf(error: z.ZodError, prefix: string) {
  return error.issues.map((i) => ({ path: [prefix, ...i.path.map(String)].filter(Boolean).join('.'), message: i.message }));
}

/** A database row in the capture wire shape (ISO strings for timestamps), plus changeSeq. */
export function toWire(entity: CaptureEntity, row: DbRow): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(CAPTURE_ENTITIES[entity].shape)) {
    const v = row[key];
    out[key] = v instanceof Date ? v.toISOString() : (v ?? null);
  }
  out.changeSeq = row.changeSeq;
  return out;
}

/** A pulled row: every column, Dates as ISO strings. */
function toPulled(row: DbRow): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, v] of Object.entries(row)) out[key] = v instanceof Date ? v.toISOString() : v;
  return out;
}

function canonical(record: Record<string, unknown>): string {
  const keys = Object.keys(record)
    .filter((k) => !SERVER_KEYS.has(k))
    .sort();
  return JSON.stringify(
    keys.map((k) => {
      const v = record[k];
      return [k, typeof v === 'string' && ISO_TIME.test(v) && !Number.isNaN(Date.parse(v)) ? new Date(v).toISOString() : (v ?? null)];
    }),
  );
}

/** The server's object keys for a record's attachment, from the hash the device sent. */
function withObjectKeys(entity: CaptureEntity, organisationId: string, record: Record<string, unknown>): Record<string, unknown> {
  if (entity === 'field_readings') {
    const sha = record.photoSha256 as string | null;
    return { ...record, photoObjectKey: sha ? attachmentObjectKey(organisationId, 'photo', record.id as string, sha) : null };
  }
  if (entity === 'sweeps') {
    const sha = record.traceSha256 as string | null;
    return { ...record, traceObjectKey: sha ? attachmentObjectKey(organisationId, 'trace', record.id as string, sha) : null };
  }
  return record;
}

interface Candidate {
  index: number;
  mutation: Mutation;
  record: Record<string, unknown>;
}

/** The state of one record as the batch goes: the server's row, then each write the batch makes. */
interface Current {
  wire: Record<string, unknown>;
  revision: number;
  deleted: boolean;
  surveyId: string;
  ownerUserId: string | null;
}

interface WriteEvent {
  kind: 'write' | 'touch';
  entity: CaptureEntity;
  recordId: string;
  revision: number;
  deleted: boolean;
  /** Indexes of the mutations whose outcome depends on this event. */
  mutations: number[];
  action?: 'create' | 'update' | 'delete' | 'revive';
  before?: Record<string, unknown> | null;
  record?: Record<string, unknown>;
  seq?: number;
  conflict?: ConflictDraft;
}

/** An audit row of a push; `changeSeq`, when given, is set into `after` by the write (see writeBatch). */
type AuditDraft = { action: string; entity: string; entityId: string; before: unknown; after: unknown; changeSeq?: number };

interface ConflictDraft {
  kind: 'edit_vs_edit' | 'edit_vs_delete' | 'delete_vs_edit';
  serverRevision: number;
  serverVersion: Record<string, unknown>;
  mutation: Mutation;
  incoming: Record<string, unknown>;
  id?: string;
}

/** The mutation envelope; the payload is checked just after by its entity's capture schema (an object check here, not a second walk over its fields). */
const EnvelopeSchema = MutationSchema.extend({
  payload: z.custom<Record<string, unknown>>((v) => typeof v === 'object' && v !== null && !Array.isArray(v), { message: 'Invalid input: expected the record (an object).' }),
});

/** Text the database reads as a UUID (looser than the schemas' check; used only to look ids up early). */
const UUID_TEXT = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const REFERENCE_KEYS = { stations: ['stationId'], walks: ['walkId'], levels: ['levelId'], rooms: ['roomId'], instruments: ['instrumentId', 'analyserId', 'antennaId'] } as const;

/**
 * The ids a batch names, taken from the body as sent (before each mutation is checked): what to lock
 * and look up. A superset of what the checked batch needs — a malformed mutation's ids are looked up
 * for nothing — and every id the checked batch uses is among them, because checking keeps them as sent.
 */
function idHints(body: PushRequest) {
  const out = {
    recordIds: [] as string[],
    records: new Map<CaptureEntity, string[]>(),
    mutationIds: [] as string[],
    surveyIds: [] as string[],
    stations: [] as string[],
    walks: [] as string[],
    levels: [] as string[],
    rooms: [] as string[],
    instruments: [] as string[],
  };
  const isId = (v: unknown): v is string => typeof v === 'string' && UUID_TEXT.test(v);
  for (const m of body.mutations) {
    if (isId(m.mutationId)) out.mutationIds.push(m.mutationId);
    if (isId(m.surveyId)) out.surveyIds.push(m.surveyId);
    if (isId(m.recordId)) {
      out.recordIds.push(m.recordId);
      if (typeof m.entity === 'string' && Object.hasOwn(CAPTURE_ENTITIES, m.entity)) {
        const entity = m.entity as CaptureEntity;
        const list = out.records.get(entity);
        if (list) list.push(m.recordId);
        else out.records.set(entity, [m.recordId]);
      }
    }
    const p = m.payload;
    if (typeof p !== 'object' || p === null) continue;
    for (const [kind, keys] of Object.entries(REFERENCE_KEYS) as [keyof typeof REFERENCE_KEYS, readonly string[]][]) {
      for (const key of keys) {
        const v = (p as Record<string, unknown>)[key];
        if (isId(v)) out[kind].push(v);
      }
    }
  }
  return out;
}

export interface SyncServiceDeps {
  repo: SyncRepository;
  logger: Logger;
  /** Called after a commit that changed readings or stations (the repeat recomputation scheduler). */
  onRepeatsDirty?: (organisationId: string, surveyIds: string[]) => void;
}

export function createSyncService(deps: SyncServiceDeps) {
  const { repo } = deps;

  /** Step 1: each mutation parsed on its own; the valid ones become candidates, the others are rejected. */
  function parseBatch(organisationId: string, body: PushRequest, results: (PushResult | undefined)[]): Candidate[] {
    const candidates: Candidate[] = [];
    const seenInBatch = new Set<string>();
    body.mutations.forEach((raw, index) => {
      const mutationId = raw.mutationId;
      const fail = (r: Rejection) => (results[index] = { mutationId, status: 'rejected', error: r });
      if (seenInBatch.has(mutationId)) return fail(reject('VALIDATION_FAILED', 'This mutation id appears twice in the batch.'));
      seenInBatch.add(mutationId);
      const envelope = EnvelopeSchema.safeParse(raw);
      if (!envelope.success) return fail(reject('VALIDATION_FAILED', 'The mutation is not valid.', { issues: issuesOf(envelope.error, '') }));
      const m = envelope.data;
      const parsed = CAPTURE_ENTITIES[m.entity].safeParse(m.payload);
      if (!parsed.success) return fail(reject('VALIDATION_FAILED', `The ${m.entity.replace('_', ' ')} is not valid: ${parsed.error.issues[0]?.message ?? ''}`.trim(), { issues: issuesOf(parsed.error, 'payload') }));
      const record = parsed.data as Record<string, unknown>;
      if (record.id !== m.recordId) return fail(reject('PAYLOAD_MISMATCH', 'payload.id differs from the mutation’s recordId.'));
      if (record.surveyId !== m.surveyId) return fail(reject('PAYLOAD_MISMATCH', 'payload.surveyId differs from the mutation’s surveyId.'));
      if (record.organisationId !== organisationId) return fail(reject('PAYLOAD_MISMATCH', 'payload.organisationId is not this organisation.'));
      candidates.push({ index, mutation: m, record });
    });
    return candidates;
  }

  async function push(actor: SyncActor, body: PushRequest): Promise<PushResponse> {
    const { organisationId } = actor;
    const results: (PushResult | undefined)[] = new Array(body.mutations.length);
    let candidates: Candidate[] | null = null;
    const hints = idHints(body);

    const dirtySurveys = new Set<string>();
    const attempt = (careful: boolean) =>
      repo.transaction(async (tx) => {
        // A transaction run again (deadlock, careful mode) starts from the parsed batch.
        dirtySurveys.clear();
        for (const c of candidates ?? []) results[c.index] = undefined;
        // 2. One statement locks the record ids (advisory, sorted, per transaction) and then reads the
        // stored answers of the mutation ids, the surveys, the references and the records' rows (FOR
        // UPDATE), with the ids as sent: it goes out now and the database works on it while this process
        // checks the batch (step 1). A retry of the same batch racing this one locks the same ids, so it
        // waits until this transaction commits (and, its reads being older than that commit, collides
        // with this one's keys and is rerun, finding every mutation answered: see batchContext).
        const context = repo.batchContext(tx, organisationId, actor.userId, { ...hints, mutationCount: body.mutations.length });
        let ctx: BatchContext;
        try {
          candidates ??= parseBatch(organisationId, body, results);
        } finally {
          ctx = await context;
        }
        await applyBatch(tx, actor, body.deviceId, candidates, results, dirtySurveys, careful, ctx);
      });
    try {
      await attempt(false);
    } catch (error) {
      // A constraint the schemas do not express failed in a bulk statement: the transaction is gone, so
      // run it again writing each record in its own savepoint, to reject only the records at fault.
      if (!constraintOf(error)) throw error;
      await attempt(true);
    }
    if (dirtySurveys.size > 0) deps.onRepeatsDirty?.(organisationId, [...dirtySurveys]);
    return { results: results.map((r, i) => r ?? { mutationId: body.mutations[i]!.mutationId, status: 'rejected', error: reject('VALIDATION_FAILED', 'Not processed.') }) };
  }

  async function applyBatch(
    tx: Tx,
    actor: SyncActor,
    deviceId: string,
    candidates: Candidate[],
    results: (PushResult | undefined)[],
    dirtySurveys: Set<string>,
    careful: boolean,
    ctx: BatchContext,
  ) {
    const { organisationId, role } = actor;

    // 2. Mutation ids seen before are answered with their stored result.
    for (const c of candidates) {
      const stored = ctx.seen.get(c.mutation.mutationId);
      if (stored) results[c.index] = stored as PushResult;
    }
    const live = candidates.filter((c) => !ctx.seen.has(c.mutation.mutationId));
    // Sequences were reserved with the context (at most one per mutation not answered before); what the
    // batch leaves unused is given back when it writes, so the counter shows no gap.
    const reserved = ctx.seqs;
    const giveBack = (used: number) => (reserved.count > used ? reserved.first + used - 1 : null);
    if (live.length === 0) {
      const counter = giveBack(0);
      if (counter !== null) await repo.setChangeSeq(tx, organisationId, counter);
      return;
    }
    const rejectLive = (c: Candidate, r: Rejection) => (results[c.index] = { mutationId: c.mutation.mutationId, status: 'rejected', error: r });

    // 3. Surveys and assignments (admins need none).
    const surveyRows = ctx.surveys;
    const isAssigned = (surveyId: string) => role === 'admin' || surveyRows.get(surveyId)?.assigned === true;

    // 5a. The records (locked): only those a live mutation names, under the entity it names.
    const wanted = new Set(live.map((c) => `${c.mutation.entity}:${c.mutation.recordId}`));
    const current = new Map<string, Current>();
    const foreign = new Set<string>();
    const entityOf = new Map<string, CaptureEntity>();
    for (const { entity, rows } of ctx.records) {
      for (const row of rows) {
        if (!wanted.has(`${entity}:${row.id}`)) continue;
        if (row.organisationId !== organisationId) {
          foreign.add(row.id);
          continue;
        }
        entityOf.set(row.id, entity);
        current.set(row.id, {
          wire: toWire(entity, row),
          revision: row.revision,
          deleted: row.deleted,
          surveyId: row.surveyId as string,
          ownerUserId: (row.surveyorUserId as string | undefined) ?? null,
        });
      }
    }

    const existedBefore = new Set(current.keys());

    // 4. References (read with the context above).
    const refs = ctx;
    // Parents created by this batch count as present for the mutations after them.
    const batchStations = new Map<string, string>();
    const batchWalks = new Map<string, string>();

    function check(c: Candidate): Rejection | null {
      const { mutation: m, record: r } = c;
      const survey = surveyRows.get(m.surveyId);
      if (!survey || survey.deleted) return reject('SURVEY_NOT_FOUND', 'That survey was not found.');
      if (survey.state !== 'open') return reject('SURVEY_NOT_OPEN', `The survey is ${survey.state.replace('_', ' ')}: it takes no more captured data.`, { state: survey.state });
      if (!isAssigned(m.surveyId)) return reject('NOT_ASSIGNED', 'You are not assigned to this survey.');
      if (foreign.has(m.recordId)) return reject('RECORD_ID_UNAVAILABLE', 'This record id cannot be used; make the record again with a new id.');
      const cur = current.get(m.recordId);
      if (cur && entityOf.get(m.recordId) !== m.entity) return reject('RECORD_ID_UNAVAILABLE', 'This record id belongs to another kind of record.');
      if (cur && cur.surveyId !== m.surveyId) return reject('SURVEY_MISMATCH', 'This record belongs to another survey; records do not move between surveys.');
      if (role === 'surveyor') {
        if (m.entity !== 'stations' && r.surveyorUserId !== actor.userId) return reject('NOT_OWNER', 'A surveyor records only under their own name (surveyorUserId).');
        if (m.entity !== 'stations' && cur && cur.ownerUserId !== actor.userId) return reject('NOT_OWNER', 'This record was made by another surveyor.');
        if (m.entity === 'stations' && !cur && r.createdByUserId !== null && r.createdByUserId !== actor.userId) return reject('NOT_OWNER', 'createdByUserId must be you.');
      }
      if (m.entity === 'stations') {
        const levelSite = refs.levels.get(r.levelId as string);
        if (!levelSite || levelSite !== survey.siteId) return reject('REFERENCE_UNKNOWN', 'The level is not one of this survey’s site.', { field: 'levelId' });
        if (r.roomId) {
          const roomLevel = refs.rooms.get(r.roomId as string);
          if (!roomLevel || roomLevel !== r.levelId) return reject('REFERENCE_UNKNOWN', 'The room is not on this level.', { field: 'roomId' });
        }
      }
      if (m.entity === 'field_readings' || m.entity === 'sweeps') {
        const stationId = r.stationId as string;
        const stationSurvey = batchStations.get(stationId) ?? refs.stations.get(stationId);
        if (!stationSurvey) return reject('STATION_UNKNOWN', 'The station is not on the server yet: send it first, then retry.', { stationId });
        if (stationSurvey !== m.surveyId) return reject('REFERENCE_UNKNOWN', 'The station belongs to another survey.', { field: 'stationId' });
      }
      if (m.entity !== 'walks' && r.walkId) {
        const walkSurvey = batchWalks.get(r.walkId as string) ?? refs.walks.get(r.walkId as string);
        if (!walkSurvey) return reject('WALK_UNKNOWN', 'The walk is not on the server yet: send it first, then retry.', { walkId: r.walkId });
        if (walkSurvey !== m.surveyId) return reject('REFERENCE_UNKNOWN', 'The walk belongs to another survey.', { field: 'walkId' });
      }
      for (const key of ['instrumentId', 'analyserId', 'antennaId']) {
        if (r[key] && !refs.instruments.has(r[key] as string)) return reject('REFERENCE_UNKNOWN', 'That instrument is not one of this organisation’s.', { field: key });
      }
      return null;
    }

    // 5b. Decide each mutation in order.
    const events: WriteEvent[] = [];
    const pendingConflictResults: { index: number; event: WriteEvent; server: Record<string, unknown> }[] = [];
    const sameAsBatch: { index: number; recordId: string }[] = [];
    for (const c of live) {
      const problem = check(c);
      if (problem) {
        rejectLive(c, problem);
        continue;
      }
      const { mutation: m } = c;
      const incoming = withObjectKeys(m.entity, organisationId, c.record);
      const cur = current.get(m.recordId);
      const write = (action: WriteEvent['action'], revision: number, conflict?: ConflictDraft) => {
        const record: Record<string, unknown> = { ...incoming, revision };
        const event: WriteEvent = { kind: 'write', entity: m.entity, recordId: m.recordId, revision, deleted: record.deleted as boolean, mutations: [c.index], action, before: cur?.wire ?? null, record, ...(conflict ? { conflict } : {}) };
        events.push(event);
        current.set(m.recordId, { wire: record, revision, deleted: record.deleted as boolean, surveyId: m.surveyId, ownerUserId: (record.surveyorUserId as string | undefined) ?? null });
        entityOf.set(m.recordId, m.entity);
        if (m.entity === 'stations') batchStations.set(m.recordId, m.surveyId);
        if (m.entity === 'walks') batchWalks.set(m.recordId, m.surveyId);
        results[c.index] = { mutationId: m.mutationId, status: 'applied', revision, changeSeq: 0 };
        return event;
      };

      if (!cur) {
        write('create', 1);
      } else if (m.baseRevision === cur.revision) {
        write(incoming.deleted ? 'delete' : cur.deleted ? 'revive' : 'update', cur.revision + 1);
      } else if (canonical(incoming) === canonical(cur.wire) || (cur.deleted && incoming.deleted)) {
        // Nothing to write; the sequence is the record's own (filled in below when this batch wrote it).
        results[c.index] = { mutationId: m.mutationId, status: 'applied', revision: cur.revision, changeSeq: (cur.wire.changeSeq as number | undefined) ?? 0 };
        if (!cur.wire.changeSeq) sameAsBatch.push({ index: c.index, recordId: m.recordId });
      } else if (cur.deleted) {
        write('revive', cur.revision + 1, { kind: 'edit_vs_delete', serverRevision: cur.revision, serverVersion: cur.wire, mutation: m, incoming });
      } else {
        const event: WriteEvent = {
          kind: 'touch',
          entity: m.entity,
          recordId: m.recordId,
          revision: cur.revision,
          deleted: cur.deleted,
          mutations: [c.index],
          conflict: { kind: incoming.deleted ? 'delete_vs_edit' : 'edit_vs_edit', serverRevision: cur.revision, serverVersion: cur.wire, mutation: m, incoming },
        };
        events.push(event);
        pendingConflictResults.push({ index: c.index, event, server: cur.wire });
      }
    }
    if (events.length === 0) {
      await finish(tx, actor, deviceId, live, results, giveBack(0));
      return;
    }

    // 6. Sequences for every event, in order; a record's row carries the last one. A batch that changes
    // an existing record reserved them with the context (more, continuing them, should that ever fall
    // short; careful mode reserves here, as it writes records one by one before the last statement).
    // A batch that only creates records leaves the reservation to its write statement, the first thing
    // it does, so nothing of this process's work waits under the organisation's counter lock: until
    // then each event's `seq` is its place in the batch (1, 2, …), which the statement adds to the base
    // it reserves, and the answers are put right once it returns (`base`).
    const deferred = !careful && reserved.count === 0;
    const extra = !deferred && events.length > reserved.count ? await repo.reserveChangeSeqs(tx, organisationId, events.length - reserved.count) : [];
    const seqs = deferred ? events.map((_, i) => i + 1) : [...Array.from({ length: Math.min(events.length, reserved.count) }, (_, i) => reserved.first + i), ...extra];
    events.forEach((e, i) => (e.seq = seqs[i]!));
    const finalSeq = new Map<string, number>();
    for (const e of events) finalSeq.set(e.recordId, e.seq!);

    // The last write of each record is what its row becomes.
    const lastWrite = new Map<string, WriteEvent>();
    for (const e of events) if (e.kind === 'write') lastWrite.set(e.recordId, e);
    const failed = new Set<string>();
    const rowsFor = (entity: CaptureEntity, only?: string): Record<string, unknown>[] =>
      [...lastWrite.values()].filter((e) => e.entity === entity && (!only || e.recordId === only) && !failed.has(e.recordId)).map((e) => ({ ...e.record!, changeSeq: finalSeq.get(e.recordId)! }));

    if (careful) {
      // Each record in its own savepoint, so a record the database refuses is rejected alone.
      for (const entity of WRITE_ORDER) {
        for (const e of [...lastWrite.values()].filter((w) => w.entity === entity)) {
          try {
            await repo.savepoint(tx, (sp) => repo.upsertRecords(sp, entity, rowsFor(entity, e.recordId)));
          } catch (inner) {
            if (!constraintOf(inner)) throw inner;
            failed.add(e.recordId);
          }
        }
      }
    }
    const survivors = events.filter((e) => !failed.has(e.recordId));
    for (const s of sameAsBatch) {
      const r = results[s.index];
      if (r?.status === 'applied') results[s.index] = failed.has(s.recordId) ? { mutationId: r.mutationId, status: 'rejected', error: reject('CONSTRAINT_FAILED', 'The server’s database refused this record.', { recordId: s.recordId }) } : { ...r, changeSeq: finalSeq.get(s.recordId)! };
    }
    for (const e of survivors) if (e.kind === 'write' && (e.entity === 'stations' || e.entity === 'field_readings')) dirtySurveys.add(e.record!.surveyId as string);
    for (const e of events.filter((ev) => failed.has(ev.recordId))) {
      for (const index of e.mutations) {
        results[index] = { mutationId: results[index]?.mutationId ?? '', status: 'rejected', error: reject('CONSTRAINT_FAILED', 'The server’s database refused this record.', { recordId: e.recordId }) };
      }
    }

    // Conflicts: both versions kept (their ids go into the answers, so they are written first).
    const drafts = survivors.filter((e) => e.conflict).map((e) => e.conflict!);
    const conflictIds = await repo.insertConflicts(
      tx,
      drafts.map((d) => ({
        organisationId,
        surveyId: d.mutation.surveyId,
        entity: d.mutation.entity,
        recordId: d.mutation.recordId,
        kind: d.kind,
        serverRevision: d.serverRevision,
        serverVersion: d.serverVersion,
        incomingBaseRevision: d.mutation.baseRevision,
        incomingVersion: d.incoming,
        mutationId: d.mutation.mutationId,
        deviceId,
        userId: actor.userId,
      })),
    );
    drafts.forEach((d, i) => (d.id = conflictIds[i]));

    for (const e of survivors) {
      for (const index of e.mutations) {
        const r = results[index];
        if (r?.status !== 'applied') continue;
        results[index] = { ...r, changeSeq: r.changeSeq || e.seq!, ...(e.conflict?.id ? { conflictId: e.conflict.id } : {}) };
      }
    }
    for (const p of pendingConflictResults) {
      if (failed.has(p.event.recordId)) continue;
      results[p.index] = { mutationId: p.event.conflict!.mutation.mutationId, status: 'conflict', conflictId: p.event.conflict!.id!, server: { ...p.server, changeSeq: finalSeq.get(p.event.recordId)! } };
    }

    // Audit (the batch's `sync_push` row, listing the creations, is written from `changes` by the write).
    const perRecord: AuditDraft[] = survivors
      .filter((e) => (e.kind === 'write' && e.action !== 'create') || e.conflict)
      .map((e) => ({
        action: e.conflict ? `sync_conflict_${e.conflict.kind}` : e.action!,
        entity: e.entity,
        entityId: e.recordId,
        before: e.conflict && e.kind === 'touch' ? e.conflict.serverVersion : (e.before ?? null),
        after: e.conflict && e.kind === 'touch' ? { kept: 'server', incoming: e.conflict.incoming, conflictId: e.conflict.id } : e.record!,
        ...(e.conflict && e.kind === 'touch' ? {} : { changeSeq: e.seq! }),
      }));
    const changes = survivors.map((e) => ({ seq: e.seq!, entity: e.entity as SyncedEntity, entityId: e.recordId, revision: e.revision, deleted: e.deleted, created: e.kind === 'write' && e.action === 'create' }));

    // The writes, one statement. Fast path: new records in a plain INSERT per entity, changed ones in an
    // upsert (careful mode wrote them above, each in its savepoint). Records marked conflicted (or
    // re-answered) without a write get their new sequence. Then the batch's traces.
    const touchOnly = survivors.filter((e) => e.kind === 'touch' && !lastWrite.has(e.recordId));
    const records = WRITE_ORDER.map((entity) => {
      const rows = careful ? [] : rowsFor(entity);
      const touches = new Map<string, number>();
      for (const e of touchOnly) if (e.entity === entity) touches.set(e.recordId, finalSeq.get(e.recordId)!);
      return {
        entity,
        inserts: rows.filter((r) => !existedBefore.has(r.id as string)),
        upserts: rows.filter((r) => existedBefore.has(r.id as string)),
        touches: [...touches].map(([id, changeSeq]) => ({ id, changeSeq })),
      };
    });
    const base = await finish(tx, actor, deviceId, live, results, deferred ? null : giveBack(events.length), [...dirtySurveys], changes, perRecord, records, deferred ? events.length : 0);
    if (deferred) {
      // Every answer of a batch of creations is `applied` at one of its own events' places.
      for (const c of live) {
        const r = results[c.index];
        if (r?.status === 'applied') results[c.index] = { ...r, changeSeq: base + r.changeSeq };
      }
    }
  }

  /**
   * The end of a batch, one statement: its change_log rows, its audit rows, the answers given (applied,
   * conflict — rejections are not kept, so a retry is evaluated anew) and the surveys to recompute.
   */
  async function finish(
    tx: Tx,
    actor: SyncActor,
    deviceId: string,
    live: Candidate[],
    results: (PushResult | undefined)[],
    counter: number | null,
    dirty: string[] = [],
    changes: Parameters<SyncRepository['writeBatch']>[1]['changes'] = [],
    audits: AuditDraft[] = [],
    records: Parameters<SyncRepository['writeBatch']>[1]['records'] = [],
    /** How many change sequences the write reserves itself (the `seq`s given are then 1, 2, …). */
    reserve = 0,
  ): Promise<number> {
    // The answer is stored without its mutation id (the row's key; put back when it is read again).
    const mutations = live
      .filter((c) => results[c.index] && results[c.index]!.status !== 'rejected')
      .map((c) => {
        const { mutationId: _key, ...answer } = results[c.index]!;
        return { mutationId: c.mutation.mutationId, entity: c.mutation.entity, recordId: c.mutation.recordId, queuedAt: c.mutation.queuedAt, result: answer as Record<string, unknown> };
      });
    return repo.writeBatch(tx, {
      organisationId: actor.organisationId,
      deviceId,
      userId: actor.userId,
      requestId: actor.requestId ?? null,
      records,
      changes,
      mutations,
      audits,
      pushAudit: changes.length > 0 || audits.length > 0 ? { mutations: live.length } : null,
      dirtySurveyIds: dirty,
      counter,
      reserve,
    });
  }

  // ------------------------------------------------------------------------------------------ pull

  async function pull(actor: SyncActor, query: PullQuery): Promise<PullResponse> {
    const since = Number(query.since);
    return repo.transaction(
      async (tx) => {
        const scope = actor.role === 'surveyor' ? { surveyIds: await repo.assignedSurveyIds(tx, actor.organisationId, actor.userId), userId: actor.userId } : null;
        const heads = await repo.pullHeads(tx, actor.organisationId, since, query.limit + 1, scope);
        const hasMore = heads.length > query.limit;
        const page = heads.slice(0, query.limit);
        const records = new Map<string, Record<string, unknown>>();
        for (const entity of PULLED_ENTITIES) {
          const ids = page.filter((h) => h.entity === entity).map((h) => h.id);
          for (const row of await repo.pullRecords(tx, actor.organisationId, entity, ids)) records.set(`${entity}:${row.id}`, toPulled(row));
        }
        const changes: PullChange[] = [];
        for (const h of page) {
          const record = records.get(`${h.entity}:${h.id}`);
          if (record) changes.push({ seq: h.seq, entity: h.entity, record });
        }
        const last = page.at(-1);
        return { changes, nextCursor: String(last ? last.seq : since), hasMore };
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
  }

  // ------------------------------------------------------------------------------------- conflicts

  function conflictView(row: NonNullable<Awaited<ReturnType<SyncRepository['findConflict']>>>, currentRevision: number | null): SyncConflict {
    return {
      id: row.id,
      surveyId: row.surveyId,
      entity: row.entity,
      recordId: row.recordId,
      kind: row.kind,
      state: row.state,
      serverRevision: row.serverRevision,
      serverVersion: row.serverVersion,
      incomingBaseRevision: row.incomingBaseRevision,
      incomingVersion: row.incomingVersion,
      currentRevision,
      mutationId: row.mutationId,
      deviceId: row.deviceId,
      userId: row.userId,
      createdAt: row.createdAt.toISOString(),
      resolvedAt: row.resolvedAt?.toISOString() ?? null,
      resolvedByUserId: row.resolvedByUserId,
      resolution: row.resolution,
      resolutionNote: row.resolutionNote,
      resolvedRevision: row.resolvedRevision,
    };
  }

  async function listConflicts(actor: SyncActor, filter: z.output<typeof ConflictListQuerySchema>): Promise<SyncConflict[]> {
    const rows = await repo.listConflicts(actor.organisationId, filter);
    const revisions = new Map<string, number>();
    for (const entity of WRITE_ORDER) {
      const ids = rows.filter((r) => r.entity === entity).map((r) => r.recordId);
      for (const [id, rev] of await repo.currentRevisions(entity, ids)) revisions.set(id, rev);
    }
    return rows.map((r) => conflictView(r, revisions.get(r.recordId) ?? null));
  }

  /**
   * A reviewer chooses. `server` keeps the record's current content (for edit_vs_delete: the deletion
   * the edit had overtaken), `incoming` writes the device's version (for edit_vs_delete: the edit the
   * record already shows). Either way the record gets revision + 1 and a new change sequence, so every
   * device pulls the outcome; the choice is audited and the conflict closed.
   */
  async function resolveConflict(actor: SyncActor, conflictId: string, input: ResolveConflict) {
    let dirty: { organisationId: string; surveyId: string } | null = null;
    const out = await repo.transaction(async (tx) => {
      const conflict = await repo.findConflict(tx, actor.organisationId, conflictId, true);
      if (!conflict) throw notFound('That conflict');
      if (conflict.state !== 'open') throw new AppError('CONFLICT_ALREADY_RESOLVED', 'This conflict was already resolved.', { resolution: conflict.resolution });
      const entity = conflict.entity as CaptureEntity;
      const [survey] = await repo.findSurveys(tx, actor.organisationId, [conflict.surveyId]);
      if (survey?.state === 'signed_off') throw new AppError('SURVEY_NOT_OPEN', 'The survey is signed off: reopen it to change its records.', { state: survey.state });
      await repo.lockRecordIds(tx, [conflict.recordId]);
      const [row] = await repo.loadRecords(tx, entity, [conflict.recordId]);
      if (!row || row.organisationId !== actor.organisationId) throw notFound('That conflict’s record');
      const currentWire = toWire(entity, row);
      let content: Record<string, unknown>;
      if (conflict.kind === 'edit_vs_delete') content = input.choose === 'incoming' ? currentWire : { ...currentWire, deleted: true };
      else content = input.choose === 'server' ? currentWire : withObjectKeys(entity, actor.organisationId, conflict.incomingVersion);
      const revision = row.revision + 1;
      const [seq] = await repo.reserveChangeSeqs(tx, actor.organisationId, 1);
      const record: Record<string, unknown> = { ...content, id: row.id, organisationId: row.organisationId, surveyId: row.surveyId, revision, changeSeq: seq! };
      try {
        await repo.savepoint(tx, (sp) => repo.upsertRecords(sp, entity, [record]));
      } catch (error) {
        const info = constraintOf(error);
        if (!info) throw error;
        throw new AppError('CONFLICT', 'The chosen version no longer fits the survey (a record it names is gone).', { constraint: info.constraint });
      }
      await repo.insertChangeLog(tx, actor.organisationId, [{ seq: seq!, entity: entity as SyncedEntity, entityId: row.id, revision, deleted: record.deleted as boolean }]);
      const resolved = await repo.markConflictResolved(tx, conflict.id, {
        resolvedByUserId: actor.userId,
        resolution: input.choose,
        resolutionNote: input.note ?? null,
        resolvedRevision: revision,
      });
      await repo.recordAudit(tx, {
        organisationId: actor.organisationId,
        actorUserId: actor.userId,
        action: 'resolve_conflict',
        entity,
        entityId: row.id,
        before: currentWire,
        after: { ...record, conflictId: conflict.id, choose: input.choose, note: input.note ?? null },
        requestId: actor.requestId ?? null,
      });
      if (entity === 'field_readings' || entity === 'stations') {
        await repo.markRepeatsDirty(tx, actor.organisationId, [row.surveyId as string]);
        dirty = { organisationId: actor.organisationId, surveyId: row.surveyId as string };
      }
      return { conflict: conflictView(resolved, revision), revision, changeSeq: seq! };
    });
    if (dirty) deps.onRepeatsDirty?.((dirty as { organisationId: string }).organisationId, [(dirty as { surveyId: string }).surveyId]);
    return out;
  }

  return { push, pull, listConflicts, resolveConflict };
}
export type SyncService = ReturnType<typeof createSyncService>;

/** sha256 hex of a string (fingerprints). */
export const sha256Hex = (text: string) => createHash('sha256').update(text).digest('hex');
