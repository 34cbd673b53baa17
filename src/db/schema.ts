/**
 * The device store's version history. APPEND ONLY: a device may still hold any earlier version, and
 * Dexie upgrades it by running every later step in order. Never edit a step that has shipped, never
 * drop a table that holds captured data; reshape rows in `.upgrade()` instead.
 *
 * Index strings list only what is queried (Dexie stores every property anyway); booleans and nulls
 * are not indexable in IndexedDB, so no index names one.
 */
import type Dexie from 'dexie';
import { readingFieldTesla } from '@shared/schemas/capture';
import type { FieldReadingRow, OutboxRow, StationRow } from './types';

/** Version 1: the first layout. Kept verbatim so tests can build a version-1 database and upgrade it. */
export const SCHEMA_V1 = {
  surveys: 'id',
  sites: 'id',
  levels: 'id, siteId',
  plans: 'id, levelId',
  planImages: 'planId',
  rooms: 'id, levelId',
  sources: 'id, siteId',
  emitters: 'id, roomId',
  instruments: 'id, organisationId',
  watchBands: 'id, organisationId',
  zoneSets: 'id',
  walks: 'id, surveyId',
  stations: 'id, surveyId, [surveyId+levelId]',
  fieldReadings: 'id, surveyId, stationId, walkId',
  sweeps: 'id, surveyId, stationId, walkId',
  decisions: 'id, surveyId',
  outbox: '++seq, &mutationId, surveyId, recordId',
  syncState: 'key',
  meta: 'key',
} as const;

/**
 * Version 2: outbox entries get a status (pending / rejected) and an index to count pending records
 * per survey without reading payloads; readings carry |B| (fieldT) and stations the |B| of their
 * newest reading, so the plan view colours 5,000 stations without touching every reading; walk lists
 * read newest-first from an index; photos and traces get an attachments table; drafts get a table.
 */
export const SCHEMA_V2 = {
  ...SCHEMA_V1,
  walks: 'id, surveyId, [surveyId+deviceId]',
  fieldReadings: 'id, surveyId, stationId, walkId, [walkId+measuredAt]',
  sweeps: 'id, surveyId, stationId, walkId, [walkId+measuredAt]',
  decisions: 'id, surveyId, stationId',
  outbox: '++seq, &mutationId, surveyId, recordId, status, [surveyId+entity+recordId]',
  attachments: 'id, recordId, surveyId',
  drafts: 'key',
} as const;

/**
 * Version 3 (the sync engine, src/sync): conflicts the sync found for a record (the server's version kept
 * beside the device's until a reviewer chooses), and files other devices captured that this device can
 * download on demand. Both only hold rows while there is something to say, so they stay small.
 */
export const SCHEMA_V3 = {
  ...SCHEMA_V2,
  syncConflicts: '[entity+recordId], surveyId',
  remoteFiles: '[recordId+kind], surveyId',
} as const;

/**
 * Version 4: readings by station, oldest to newest ([stationId+measuredAt]), so a save finds the
 * station's newest live reading (the colour on the plan) by reading one or two rows from the top of the
 * station's range instead of every reading ever taken there. An index only: nothing to reshape.
 */
export const SCHEMA_V4 = {
  ...SCHEMA_V3,
  fieldReadings: 'id, surveyId, stationId, walkId, [walkId+measuredAt], [stationId+measuredAt]',
} as const;

export const CURRENT_SCHEMA_VERSION = 4;

export function declareVersions(db: Dexie): void {
  db.version(1).stores(SCHEMA_V1);
  db.version(2)
    .stores(SCHEMA_V2)
    .upgrade(async (tx) => {
      await tx
        .table<OutboxRow>('outbox')
        .toCollection()
        .modify((row) => {
          row.status ??= 'pending';
          row.error ??= null;
        });
      const latest = new Map<string, { fieldT: number; measuredAt: string }>();
      await tx
        .table<FieldReadingRow>('fieldReadings')
        .toCollection()
        .modify((row) => {
          row.fieldT = readingFieldTesla(row);
          if (row.deleted) return;
          const known = latest.get(row.stationId);
          if (!known || row.measuredAt > known.measuredAt) latest.set(row.stationId, { fieldT: row.fieldT, measuredAt: row.measuredAt });
        });
      await tx
        .table<StationRow>('stations')
        .toCollection()
        .modify((row) => {
          row.latestFieldT = latest.get(row.id)?.fieldT ?? null;
        });
    });
  // New tables only: nothing to reshape.
  db.version(3).stores(SCHEMA_V3);
  // A new index only: IndexedDB builds it from the rows already stored.
  db.version(4).stores(SCHEMA_V4);
}
