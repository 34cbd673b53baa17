import { FieldReadingSchema, readingFieldTesla, type FieldReading } from '@shared/schemas/capture';
import { db, type FieldReadingRow } from '@/db';
import { prepareAttachment } from './attachments';
import { refreshStationLatest } from './station-latest';
import { parseRecord, saveSynced } from './write-synced';

export type FieldReadingInput = Omit<FieldReading, 'id' | 'revision' | 'deleted'> & { id?: string };

export const fieldReadingSpec = () => ({
  entity: 'field_readings' as const,
  table: db.fieldReadings,
  schema: FieldReadingSchema,
  label: 'That field reading',
  extraTables: [db.stations, db.attachments],
  toRow: (record: FieldReading): FieldReadingRow => ({ ...record, fieldT: readingFieldTesla(record) }),
});

/**
 * Log a field reading (no id) or correct one (its id). A photo (resize it first with resizePhoto) is
 * kept as an attachment in the same transaction; the reading records its SHA-256, and the object key
 * stays null until the sync uploads it.
 */
export async function saveFieldReading(input: FieldReadingInput, photo?: Blob): Promise<FieldReading> {
  // Check the input before hashing a photo, so bad input fails fast and writes nothing.
  parseRecord(FieldReadingSchema, { ...input, id: input.id ?? '00000000-0000-7000-8000-000000000000', revision: 1, deleted: false });
  const attachment = photo ? await prepareAttachment(photo, 'photo', 'field_readings', input.surveyId) : null;
  const spec = fieldReadingSpec();
  return saveSynced(
    {
      ...spec,
      after: async (record) => {
        if (attachment) await db.attachments.put({ ...attachment, recordId: record.id });
        await refreshStationLatest(record.stationId);
      },
    },
    attachment ? { ...input, photoSha256: attachment.sha256, photoObjectKey: null } : input,
  );
}
