import type { FieldReading } from '@shared/schemas/capture';
import { fieldReadingSpec } from './save-field-reading';
import { refreshStationLatest } from './station-latest';
import { tombstoneSynced } from './write-synced';

/** Tombstone a reading (deleted: true, revision + 1), queued for sync like an edit; the station's colour follows. */
export function deleteFieldReading(id: string): Promise<FieldReading> {
  return tombstoneSynced({ ...fieldReadingSpec(), after: (record) => refreshStationLatest(record.stationId) }, id);
}
