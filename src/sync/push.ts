/**
 * Push: drain the outbox to the server in batches, in queue order, and write each mutation's answer back
 * into the device store in the same Dexie transaction that removes or marks its outbox entry.
 *
 * - applied: the entry goes; the record takes the server's revision (and any later queued edits of it
 *   are rebased onto that revision, so they do not read as conflicts).
 * - conflict: the entry goes (the server holds the incoming version for a reviewer); the record keeps
 *   the device's version and a syncConflicts row keeps the server's beside it.
 * - rejected: the entry stays, status 'rejected', with the server's message; nothing is dropped.
 *   STATION_UNKNOWN / WALK_UNKNOWN mean the parent has not arrived yet: the entry stays pending and is
 *   tried again after the rest of the run's batches (its parent may be among them).
 *
 * Up to PUSH_IN_FLIGHT batches are on the way at once, when the later cannot overtake anything of the
 * earlier that it depends on (shared/sync/push-plan.ts); otherwise it waits for their answers.
 */
import { PUSH_MAX_MUTATIONS, type PushResult } from '@shared/schemas/sync';
import type { Mutation } from '@shared/sync/mutation';
import { batchFootprint, PUSH_BATCH_SIZE, pushInTurn } from '@shared/sync/push-plan';
import { normaliseOutbox, type FringewalkDb, type OutboxRow, type SyncConflictRow } from '@/db';
import { isApiRequestError } from '@/lib/api';
import { postPush } from './http';
import { capturedTable, capturedTables } from './tables';

export { PUSH_BATCH_SIZE };
/** The server refuses a push body over 1 MB (413); stay under it with room for the envelope. */
export const PUSH_MAX_BODY_BYTES = 900_000;
/** Passes over "parent not there yet" entries within one run before leaving them for the next run. */
const MAX_PARENT_RETRY_PASSES = 3;
const PARENT_CODES = new Set(['STATION_UNKNOWN', 'WALK_UNKNOWN']);

export const CONFLICT_MESSAGES = {
  push: 'Another device changed this record first. The server kept both versions; a reviewer will choose.',
  revived: 'This record had been deleted on the server. Your edit was kept and a reviewer will confirm it.',
  pull: 'The server has a newer version of this record than the one your unsynced edit started from. Both are kept.',
  server: 'Two devices changed this record; a reviewer will choose which version stands.',
} as const;

export interface PushSummary {
  sent: number;
  applied: number;
  conflicts: number;
  rejected: number;
  /** Entries left pending because their station or walk is not on the server yet. */
  waiting: number;
}

export interface PushOptions {
  db: FringewalkDb;
  orgId: string;
  deviceId: string;
  batchSize?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
}

const toMutation = (row: OutboxRow): Mutation => ({
  mutationId: row.mutationId,
  entity: row.entity,
  recordId: row.recordId,
  surveyId: row.surveyId,
  baseRevision: row.baseRevision,
  payload: row.payload,
  queuedAt: row.queuedAt,
});

/** The server's message, with field paths when it names them ("magnitudeT: |B| cannot be negative."). */
export function rejectionText(error: { code: string; message: string; details?: unknown }): string {
  const issues = (error.details as { issues?: unknown } | undefined)?.issues;
  if (!Array.isArray(issues) || issues.length === 0) return error.message;
  const lines = issues.flatMap((i) => {
    const { path, message } = (i ?? {}) as { path?: unknown; message?: unknown };
    if (typeof message !== 'string') return [];
    const where = Array.isArray(path) ? path.join('.') : typeof path === 'string' ? path : '';
    return [where ? `${where.replace(/^payload\./, '')}: ${message}` : message];
  });
  return lines.length ? `${error.message} ${lines.join('; ')}` : error.message;
}

/** Pending entries of this organisation, in queue order. */
async function pendingEntries(db: FringewalkDb, orgId: string, only?: Set<string>): Promise<OutboxRow[]> {
  const rows = await db.outbox.where('status').equals('pending').toArray();
  return rows
    .map(normaliseOutbox)
    .filter((r) => r.payload.organisationId === orgId && (!only || only.has(r.mutationId)))
    .sort((a, b) => (a.seq ?? 0) - (b.seq ?? 0));
}

/** A rejected entry followed by a newer queued change of the same record is superseded: payloads are whole records. */
async function dropSupersededRejections(db: FringewalkDb): Promise<void> {
  await db.transaction('rw', db.outbox, async () => {
    const rejected = await db.outbox.where('status').equals('rejected').toArray();
    for (const row of rejected) {
      const newer = await db.outbox
        .where('[surveyId+entity+recordId]')
        .equals([row.surveyId, row.entity, row.recordId])
        .filter((o) => (o.seq ?? 0) > (row.seq ?? 0) && o.status === 'pending')
        .count();
      if (newer > 0) await db.outbox.delete(row.seq!);
    }
  });
}

/** Split into batches of at most `size` mutations and PUSH_MAX_BODY_BYTES of JSON. */
function batches(rows: OutboxRow[], size: number): OutboxRow[][] {
  const out: OutboxRow[][] = [];
  let current: OutboxRow[] = [];
  let bytes = 0;
  for (const row of rows) {
    const rowBytes = JSON.stringify(toMutation(row)).length + 1;
    if (current.length > 0 && (current.length >= size || bytes + rowBytes > PUSH_MAX_BODY_BYTES)) {
      out.push(current);
      current = [];
      bytes = 0;
    }
    current.push(row);
    bytes += rowBytes;
  }
  if (current.length) out.push(current);
  return out;
}

async function applyResults(db: FringewalkDb, batch: OutboxRow[], results: PushResult[], summary: PushSummary, waiting: Set<string>): Promise<void> {
  const inBatch = new Set(batch.map((r) => r.mutationId));
  await db.transaction('rw', [db.outbox, db.syncConflicts, ...capturedTables(db)], async () => {
    for (const [i, row] of batch.entries()) {
      const result = results[i]!;
      const table = capturedTable(db, row.entity);
      const key: [string, string] = [row.entity, row.recordId];
      if (result.status === 'applied') {
        summary.applied++;
        waiting.delete(row.mutationId);
        await db.outbox.where('mutationId').equals(row.mutationId).delete();
        const later = (await db.outbox.where('[surveyId+entity+recordId]').equals([row.surveyId, row.entity, row.recordId]).sortBy('seq')).filter(
          (o) => !inBatch.has(o.mutationId),
        );
        let revision = result.revision;
        const rebase = revision !== (row.payload.revision as number);
        if (rebase) {
          for (const next of later) {
            await db.outbox.update(next.seq!, { baseRevision: revision, payload: { ...next.payload, revision: revision + 1 } });
            revision += 1;
          }
        }
        if (rebase || later.length === 0) {
          const local = await table.get(row.recordId);
          if (local && local.revision !== revision) await table.update(row.recordId, { revision });
        }
        const mark = await db.syncConflicts.get(key);
        if (result.conflictId) {
          await db.syncConflicts.put({
            entity: row.entity, recordId: row.recordId, surveyId: row.surveyId, origin: 'push', conflictId: result.conflictId,
            serverRevision: result.revision, serverVersion: null, localVersion: row.payload, message: CONFLICT_MESSAGES.revived, markedAt: new Date().toISOString(),
          } satisfies SyncConflictRow);
        } else if (mark && mark.origin === 'pull') {
          // The server took this edit as it stood: the newer version the pull saw was this device's own.
          await db.syncConflicts.delete(key);
        }
      } else if (result.status === 'conflict') {
        summary.conflicts++;
        waiting.delete(row.mutationId);
        await db.outbox.where('mutationId').equals(row.mutationId).delete();
        const server = result.server;
        await db.syncConflicts.put({
          entity: row.entity, recordId: row.recordId, surveyId: row.surveyId, origin: 'push', conflictId: result.conflictId,
          serverRevision: typeof server.revision === 'number' ? server.revision : null, serverVersion: server, localVersion: row.payload,
          message: CONFLICT_MESSAGES.push, markedAt: new Date().toISOString(),
        } satisfies SyncConflictRow);
      } else if (PARENT_CODES.has(result.error.code)) {
        summary.waiting++;
        waiting.add(row.mutationId);
        await db.outbox.update(row.seq!, { error: `Waiting: ${result.error.message}` });
      } else {
        summary.rejected++;
        waiting.delete(row.mutationId);
        await db.outbox.update(row.seq!, { status: 'rejected', error: rejectionText(result.error) });
      }
    }
  });
}

async function send(options: PushOptions, batch: OutboxRow[]): Promise<PushResult[]> {
  try {
    const { results } = await postPush(options.orgId, { deviceId: options.deviceId, mutations: batch.map(toMutation) }, options.signal);
    if (results.length !== batch.length || results.some((r, i) => r.mutationId !== batch[i]!.mutationId)) {
      throw new Error('The server answered a push with results that do not match the mutations sent.');
    }
    return results;
  } catch (error) {
    // 413: the body was too large after all (big notes): split and send the halves.
    if (isApiRequestError(error) && error.status === 413 && batch.length > 1) {
      const half = Math.ceil(batch.length / 2);
      return [...(await send(options, batch.slice(0, half))), ...(await send(options, batch.slice(half)))];
    }
    throw error;
  }
}

export async function pushOutbox(options: PushOptions): Promise<PushSummary> {
  const { db, orgId } = options;
  const size = Math.min(options.batchSize ?? PUSH_BATCH_SIZE, PUSH_MAX_MUTATIONS);
  await dropSupersededRejections(db);
  const summary: PushSummary = { sent: 0, applied: 0, conflicts: 0, rejected: 0, waiting: 0 };
  const waiting = new Set<string>();
  let rows = await pendingEntries(db, orgId);
  let total = rows.length;
  let done = 0;
  options.onProgress?.(done, total);
  for (let pass = 0; rows.length > 0; pass++) {
    const appliedBefore = summary.applied + summary.conflicts;
    await pushInTurn(
      batches(rows, size),
      (planned) => batchFootprint(planned),
      async (planned) => {
        // As they stand now: an earlier batch's answers may have rebased these entries (a record the
        // server made at another revision than the device counted), or removed them.
        const batch = (await db.outbox.bulkGet(planned.map((r) => r.seq!))).flatMap((r) => (r && r.status === 'pending' ? [normaliseOutbox(r)] : []));
        if (batch.length > 0) {
          const results = await send(options, batch);
          summary.sent += batch.length;
          await applyResults(db, batch, results, summary, waiting);
        }
        done += planned.length;
        options.onProgress?.(done, total);
      },
    );
    // Parents pushed in this pass may have unblocked the entries that waited for them.
    const progressed = summary.applied + summary.conflicts > appliedBefore;
    if (waiting.size === 0 || !progressed || pass + 1 >= MAX_PARENT_RETRY_PASSES) break;
    rows = await pendingEntries(db, orgId, waiting);
    summary.waiting -= rows.length;
    total += rows.length;
  }
  return summary;
}

/** Send refused entries again (after an admin assigned the surveyor, or the survey was reopened). */
export async function resendRejected(db: FringewalkDb, recordIds?: readonly string[]): Promise<number> {
  return db.transaction('rw', db.outbox, async () => {
    const rows = await db.outbox.where('status').equals('rejected').toArray();
    const chosen = rows.filter((r) => !recordIds || recordIds.includes(r.recordId));
    for (const row of chosen) await db.outbox.update(row.seq!, { status: 'pending', error: null });
    return chosen.length;
  });
}
