import { StationSchema, type Station } from '@shared/schemas/capture';
import { db, type StationRow } from '@/db';
import { refreshStationLatest } from './station-latest';
import { saveSynced, type SyncedWriteSpec } from './write-synced';

export type StationInput = Omit<Station, 'id' | 'revision' | 'deleted'> & { id?: string };

export const stationSpec = (): SyncedWriteSpec<Station, StationRow> => ({
  entity: 'stations',
  table: db.stations,
  schema: StationSchema,
  label: 'That station',
  extraTables: [db.fieldReadings],
  // latestFieldT is derived from readings, so an edit of the station keeps it.
  toRow: (record) => ({ ...record, latestFieldT: null }),
  after: (record) => refreshStationLatest(record.id),
});

/** Place a new station (no id) or edit one (its id). Validated; written with its outbox entry atomically. */
export function saveStation(input: StationInput): Promise<Station> {
  return saveSynced(stationSpec(), input);
}
