/**
 * Row types of the device store. Each captured row is its wire record (shared/schemas/capture.ts) plus
 * a few device-only columns that are derived on the device and never pushed (the outbox payload is
 * always the parsed wire record, so these cannot leak into a sync).
 */
import type { FieldReading, Station, Sweep, Walk } from '@shared/schemas/capture';
import type {
  OfflineDecision,
  OfflineEmitter,
  OfflineInstrument,
  OfflineLevel,
  OfflinePlan,
  OfflineRoom,
  OfflineSite,
  OfflineSource,
  OfflineSurveyRecord,
  OfflineWatchBand,
  OfflineZoneSet,
} from '@shared/schemas/offline';
import type { FieldUnitSchema } from '@shared/schemas/vocabulary';
import type { Mutation } from '@shared/sync/mutation';
import type { z } from 'zod';

export type FieldUnit = z.infer<typeof FieldUnitSchema>;

/** A survey taken offline: the server's record plus when and how big the download was. */
export interface SurveyRow extends OfflineSurveyRecord {
  takenOfflineAt: string;
  /** Server clock of the bundle this row came from. */
  bundleGeneratedAt: string;
  /** Bytes the download wrote (JSON + plan images), as counted by takeSurveyOffline. */
  bytes: number;
}
export type SiteRow = OfflineSite;
export type LevelRow = OfflineLevel;
export type PlanRow = OfflinePlan;
export type RoomRow = OfflineRoom;
export type SourceRow = OfflineSource;
export type EmitterRow = OfflineEmitter;
export type InstrumentRow = OfflineInstrument;
export type WatchBandRow = OfflineWatchBand;
export type ZoneSetRow = OfflineZoneSet;
export type DecisionRow = OfflineDecision;

/**
 * Files are kept as ArrayBuffer + MIME type rather than Blob: every IndexedDB (and fake-indexeddb in
 * tests) clones an ArrayBuffer, while Blob storage has been unreliable in some mobile browsers.
 */
export interface PlanImageRow {
  planId: string;
  data: ArrayBuffer;
  mime: string;
  bytes: number;
  fetchedAt: string;
}

export type WalkRow = Walk;

export interface StationRow extends Station {
  /** |B| in tesla of the newest live reading at this station (by measuredAt), null when none. Device-only. */
  latestFieldT: number | null;
}

export interface FieldReadingRow extends FieldReading {
  /** |B| in tesla, whichever way it was entered (readingFieldTesla). Device-only. */
  fieldT: number;
}

export type SweepRow = Sweep;

export type AttachmentKind = 'photo' | 'trace';

/** A file that belongs to a record; the sync uploads it after the record itself has been pushed (the server needs the record, which names the file by its SHA-256, first). */
export interface AttachmentRow {
  id: string;
  entity: 'field_readings' | 'sweeps';
  recordId: string;
  surveyId: string;
  kind: AttachmentKind;
  data: ArrayBuffer;
  mime: string;
  bytes: number;
  sha256: string;
  createdAt: string;
  /** Set by the sync once the object store holds it. */
  uploadedAt: string | null;
  objectKey: string | null;
  /** The server's reason when the last upload was refused (the sync retries on its next run). */
  uploadError?: string | null;
  uploadAttempts?: number;
}

export type OutboxStatus = 'pending' | 'rejected';

export interface OutboxRow extends Mutation {
  /** Auto-incremented queue position: the sync pushes in this order. */
  seq?: number;
  status: OutboxStatus;
  /** The server's reason when rejected (the zod message), else null. */
  error: string | null;
}

export interface SyncStateRow {
  /** The organisation id: the pull cursor is per organisation (DESIGN.md §4). */
  key: string;
  cursor: number;
  lastSyncAt: string | null;
  lastError: string | null;
}

export interface DraftRow {
  key: string;
  value: unknown;
  updatedAt: string;
}

export interface MetaRow {
  key: string;
  value: unknown;
}

/**
 * A sync conflict as the device knows it (src/sync). `push`: this device's edit lost a race and the
 * server kept both (conflictId names the server's record of it); `pull`: the server moved on while this
 * device still holds an unsynced edit; `server`: another device's conflict, pulled with the record.
 * The device's own version stays in its table; the server's is kept here beside it.
 */
export interface SyncConflictRow {
  entity: 'walks' | 'stations' | 'field_readings' | 'sweeps';
  recordId: string;
  surveyId: string;
  origin: 'push' | 'pull' | 'server';
  conflictId: string | null;
  serverRevision: number | null;
  serverVersion: Record<string, unknown> | null;
  localVersion: Record<string, unknown> | null;
  message: string;
  markedAt: string;
}

/** A photo or trace another device captured, named by a pulled record; downloaded on demand. */
export interface RemoteFileRow {
  recordId: string;
  kind: AttachmentKind;
  entity: 'field_readings' | 'sweeps';
  surveyId: string;
  sha256: string;
  /** False while the server is still waiting for the capturing device to upload it. */
  arrived: boolean;
  downloadError: string | null;
}
