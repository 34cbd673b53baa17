import { FieldReadingSchema, readingFieldTesla, type FieldReading, type Station } from '@shared/schemas/capture';
import { db, toCaptureError, type FieldReadingRow } from '@/db';
import { prepareAttachment } from './attachments';
import { stationSpec, type StationInput } from './save-station';
import { refreshStationLatest } from './station-latest';
import { draftSynced, parseRecord, tablesFor, writeSyncedInTx } from './write-synced';

export type FieldReadingInput = Omit<FieldReading, 'id' | 'revision' | 'deleted'> & { id?: string };

export const fieldReadingSpec = () => ({
  entity: 'field_readings' as const,
  table: db.fieldReadings,
  schema: FieldReadingSchema,
  label: 'That field reading',
  extraTables: [db.stations, db.attachments],
  toRow: (record: FieldReading): FieldReadingRow => ({ ...record, fieldT: readingFieldTesla(record) }),
});

export interface SaveFieldReadingOptions {
  /** A resized photo (resizePhoto), kept as an attachment. */
  photo?: Blob;
  /**
   * The station to create with this reading (the first reading on a new spot). It is written in the
   * same transaction as the reading, before it in the outbox, and the reading's stationId is set to it:
   * a refused or failed reading leaves no station behind.
   */
  newStation?: StationInput;
}

export interface SavedFieldReading {
  reading: FieldReading;
  /** The station created with the reading, when options.newStation was given. */
  station: Station | null;
}

/**
 * Log a field reading (no id) or correct one (its id), optionally with the new station it was taken at
 * and a photo: one transaction writes the station, the reading, the photo and their outbox entries, and
 * refreshes the station's latest |B|. The reading records the photo's SHA-256; the object key stays null
 * until the sync uploads it.
 */
export async function saveFieldReadingWith(input: FieldReadingInput, options: SaveFieldReadingOptions = {}): Promise<SavedFieldReading> {
  const { photo, newStation } = options;
  // Check every input before hashing a photo, so bad input fails fast and writes nothing.
  const station = newStation ? draftSynced(stationSpec(), newStation) : null;
  const stationId = station ? station.draft.id : input.stationId;
  parseRecord(FieldReadingSchema, { ...input, stationId, id: input.id ?? '00000000-0000-7000-8000-000000000000', revision: 1, deleted: false });
  const attachment = photo ? await prepareAttachment(photo, 'photo', 'field_readings', input.surveyId) : null;
  const reading = draftSynced(
    {
      ...fieldReadingSpec(),
      after: async (record: FieldReading, previous: FieldReadingRow | undefined) => {
        if (attachment) await db.attachments.put({ ...attachment, recordId: record.id });
        await refreshStationLatest(record.stationId);
        // A correction that moved the reading to another station changes that station's colour too.
        if (previous && previous.stationId !== record.stationId) await refreshStationLatest(previous.stationId);
      },
    },
    { ...input, stationId, ...(attachment ? { photoSha256: attachment.sha256, photoObjectKey: null } : {}) },
  );
  try {
    return await db.transaction('rw', tablesFor(reading, ...(station ? [station] : [])), async (tx) => {
      // The station first: the sync pushes in outbox order, and the server needs the station before its reading.
      const savedStation = station ? await writeSyncedInTx(station, tx) : null;
      return { reading: await writeSyncedInTx(reading, tx), station: savedStation };
    });
  } catch (error) {
    throw toCaptureError(error);
  }
}

/** Log a field reading (no id) or correct one (its id), with an optional photo (resize it first with resizePhoto). */
export async function saveFieldReading(input: FieldReadingInput, photo?: Blob): Promise<FieldReading> {
  return (await saveFieldReadingWith(input, photo ? { photo } : {})).reading;
}
