/**
 * Pull: every change since the stored cursor, page by page. Each page and the cursor after it are
 * written in ONE Dexie transaction, so a dropped connection between pages loses nothing and repeats
 * nothing: the next run starts from the last page that was stored.
 *
 * What a pulled record does on the device:
 * - captured records (walks, stations, readings, sweeps): replace the device's copy — unless the device
 *   holds an unsynced edit of it (an outbox entry). Then the device's edit stays; if the server's
 *   revision is newer than the one the edit started from, a syncConflicts row keeps the server's version
 *   beside it (both kept; the push will open the server-side conflict). A record the device lost a
 *   conflict on keeps the device's version while the server still calls it conflicted, and takes the
 *   server's outcome once a reviewer has chosen (conflicted: false).
 * - decisions (re-measure requests), watch bands, zone sets: stored; a tombstone removes reference data.
 * - surveys: the state and settings of surveys taken offline here are updated.
 * - survey assignments and flags are not kept on the device (taking a survey offline fetches its bundle).
 */
import { readingFieldTesla, CAPTURE_ENTITIES, type CaptureEntity } from '@shared/schemas/capture';
import type { PullChange } from '@shared/schemas/sync';
import type { DecisionRow, FringewalkDb, SyncConflictRow, WatchBandRow, ZoneSetRow } from '@/db';
import { getPull } from './http';
import { CONFLICT_MESSAGES } from './push';
import { capturedTable, capturedTables } from './tables';

export const PULL_PAGE_SIZE = 1000;

export interface PullSummary {
  pages: number;
  changes: number;
  applied: number;
  /** Server changes held back because the device has an unsynced edit of the record. */
  keptLocal: number;
  conflicts: number;
  cursor: number;
}

export interface PullOptions {
  db: FringewalkDb;
  orgId: string;
  limit?: number;
  onProgress?: (pulled: number) => void;
  signal?: AbortSignal;
}

const CAPTURED = new Set<string>(Object.keys(CAPTURE_ENTITIES));

export async function readCursor(db: FringewalkDb, orgId: string): Promise<number> {
  return (await db.syncState.get(orgId))?.cursor ?? 0;
}

function pick<T extends object>(record: Record<string, unknown>, keys: (keyof T)[]): T {
  const out: Record<string, unknown> = {};
  for (const k of keys) out[k as string] = record[k as string];
  return out as T;
}

async function applyCaptured(db: FringewalkDb, entity: CaptureEntity, pulled: Record<string, unknown>, summary: PullSummary, touchedStations: Set<string>) {
  const parsed = CAPTURE_ENTITIES[entity].safeParse(pulled);
  if (!parsed.success) return;
  const record = parsed.data as { id: string; surveyId: string; revision: number; deleted: boolean } & Record<string, unknown>;
  const conflicted = pulled.conflicted === true;
  const table = capturedTable(db, entity);
  const key: [string, string] = [entity, record.id];
  const queued = await db.outbox.where('[surveyId+entity+recordId]').equals([record.surveyId, entity, record.id]).sortBy('seq');
  const mark = await db.syncConflicts.get(key);
  const local = await table.get(record.id);

  if (queued.length > 0) {
    summary.keptLocal++;
    if (record.revision > queued[0]!.baseRevision) {
      summary.conflicts++;
      await db.syncConflicts.put({
        entity, recordId: record.id, surveyId: record.surveyId, origin: mark?.origin === 'push' ? 'push' : 'pull', conflictId: mark?.conflictId ?? null,
        serverRevision: record.revision, serverVersion: pulled, localVersion: local ?? null, message: mark?.message ?? CONFLICT_MESSAGES.pull, markedAt: new Date().toISOString(),
      } satisfies SyncConflictRow);
    }
    return;
  }
  // A conflict this device lost stays until a reviewer's choice reaches it: that is a NEW revision, no longer
  // conflicted. Until then the device keeps showing its own version, the server's stays beside it.
  if (mark?.origin === 'push' && (conflicted || record.revision <= (mark.serverRevision ?? 0))) {
    if (mark.serverVersion === null || record.revision >= (mark.serverRevision ?? 0)) {
      await db.syncConflicts.put({ ...mark, serverRevision: record.revision, serverVersion: pulled });
    }
    return;
  }

  const row: Record<string, unknown> = { ...record };
  if (entity === 'field_readings') row.fieldT = typeof pulled.fieldT === 'number' ? pulled.fieldT : readingFieldTesla(record as never);
  if (entity === 'stations') row.latestFieldT = (local as { latestFieldT?: number | null } | undefined)?.latestFieldT ?? null;
  await table.put(row as never);
  summary.applied++;
  if (entity === 'field_readings') {
    touchedStations.add(record.stationId as string);
    if (local && local.stationId !== record.stationId) touchedStations.add(local.stationId as string);
  }
  if (entity === 'stations') touchedStations.add(record.id);

  if (conflicted) {
    summary.conflicts++;
    await db.syncConflicts.put({
      entity, recordId: record.id, surveyId: record.surveyId, origin: mark?.origin ?? 'server', conflictId: mark?.conflictId ?? null,
      serverRevision: record.revision, serverVersion: pulled, localVersion: mark?.localVersion ?? null, message: mark?.message ?? CONFLICT_MESSAGES.server, markedAt: new Date().toISOString(),
    } satisfies SyncConflictRow);
  } else if (mark) {
    await db.syncConflicts.delete(key);
  }

  // Files other devices captured: remembered so they can be downloaded on demand.
  if (entity === 'field_readings' || entity === 'sweeps') {
    const kind = entity === 'field_readings' ? 'photo' : 'trace';
    const sha256 = (entity === 'field_readings' ? record.photoSha256 : record.traceSha256) as string | null;
    const have = sha256 ? await db.attachments.where('recordId').equals(record.id).filter((a) => a.sha256 === sha256).count() : 0;
    if (!sha256 || have > 0 || record.deleted) await db.remoteFiles.delete([record.id, kind]);
    else await db.remoteFiles.put({ recordId: record.id, kind, entity, surveyId: record.surveyId, sha256, arrived: pulled.attachmentPending !== true, downloadError: null });
  }
}

async function applyDecision(db: FringewalkDb, pulled: Record<string, unknown>) {
  const readingId = pulled.fieldReadingId as string | null;
  const sweepId = pulled.sweepId as string | null;
  const judged = readingId ? await db.fieldReadings.get(readingId) : sweepId ? await db.sweeps.get(sweepId) : undefined;
  const row = {
    ...pick<DecisionRow>(pulled, ['id', 'organisationId', 'revision', 'surveyId', 'fieldReadingId', 'sweepId', 'verdict', 'note', 'reviewerUserId', 'decidedAt']),
    // The judged record may arrive later in the pull (it moved to a later sequence when edited): '' until then.
    stationId: judged?.stationId ?? '',
    deleted: pulled.deleted === true,
  };
  await db.decisions.put(row as DecisionRow);
}

async function applyPage(db: FringewalkDb, orgId: string, changes: PullChange[], nextCursor: number, summary: PullSummary) {
  const tables = [db.outbox, db.syncConflicts, db.remoteFiles, db.attachments, db.decisions, db.surveys, db.watchBands, db.zoneSets, db.syncState, ...capturedTables(db)];
  await db.transaction('rw', tables, async () => {
    const touchedStations = new Set<string>();
    // Parents before children within a page, so a decision finds its reading.
    for (const change of changes) {
      if (CAPTURED.has(change.entity)) await applyCaptured(db, change.entity as CaptureEntity, change.record, summary, touchedStations);
    }
    for (const { entity, record } of changes) {
      if (entity === 'decisions') await applyDecision(db, record);
      else if (entity === 'surveys') {
        const local = await db.surveys.get(record.id as string);
        if (local) {
          await db.surveys.put({
            ...local,
            ...pick(record, ['name', 'state', 'zoneSetId', 'startsOn', 'endsOn', 'species', 'maxHarmonic', 'repeatRadiusM', 'notes', 'revision'] as never[]),
          });
        }
      } else if (entity === 'watch_bands') {
        if (record.deleted) await db.watchBands.delete(record.id as string);
        else await db.watchBands.put(pick<WatchBandRow>(record, ['id', 'organisationId', 'revision', 'siteId', 'name', 'lowerHz', 'upperHz', 'reason', 'source', 'severity']));
      } else if (entity === 'zone_sets') {
        if (record.deleted) await db.zoneSets.delete(record.id as string);
        else await db.zoneSets.put(pick<ZoneSetRow>(record, ['id', 'organisationId', 'revision', 'name', 'edition', 'thresholds']));
      }
    }
    // Decisions stored before their reading was on the device learn their station now.
    const orphans = await db.decisions.where('stationId').equals('').toArray();
    for (const d of orphans) {
      const judged = d.fieldReadingId ? await db.fieldReadings.get(d.fieldReadingId) : d.sweepId ? await db.sweeps.get(d.sweepId) : undefined;
      if (judged) await db.decisions.update(d.id, { stationId: judged.stationId });
    }
    for (const stationId of touchedStations) {
      let newest: { fieldT: number; measuredAt: string } | null = null;
      await db.fieldReadings
        .where('stationId')
        .equals(stationId)
        .each((r) => {
          if (!r.deleted && (!newest || r.measuredAt > newest.measuredAt)) newest = { fieldT: r.fieldT, measuredAt: r.measuredAt };
        });
      await db.stations.update(stationId, { latestFieldT: (newest as { fieldT: number } | null)?.fieldT ?? null });
    }
    const state = await db.syncState.get(orgId);
    await db.syncState.put({ key: orgId, cursor: nextCursor, lastSyncAt: state?.lastSyncAt ?? null, lastError: state?.lastError ?? null });
  });
}

export async function pullChanges(options: PullOptions): Promise<PullSummary> {
  const { db, orgId, limit = PULL_PAGE_SIZE } = options;
  const summary: PullSummary = { pages: 0, changes: 0, applied: 0, keptLocal: 0, conflicts: 0, cursor: await readCursor(db, orgId) };
  options.onProgress?.(0);
  for (;;) {
    const page = await getPull(orgId, String(summary.cursor), limit, options.signal);
    const next = Number(page.nextCursor);
    if (!Number.isSafeInteger(next)) throw new Error(`The server sent a pull cursor this version of the app does not understand (${page.nextCursor}).`);
    await applyPage(db, orgId, page.changes, next, summary);
    summary.pages++;
    summary.changes += page.changes.length;
    summary.cursor = next;
    options.onProgress?.(summary.changes);
    if (!page.hasMore || page.changes.length === 0) break;
  }
  return summary;
}
