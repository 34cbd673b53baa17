import { StationSchema, type Station } from '@shared/schemas/capture';
import { db, type StationRow } from '@/db';
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
  after: async (record) => {
    const readings = await db.fieldReadings.where('stationId').equals(record.id).toArray();
    const live = readings.filter((r) => !r.deleted).sort((a, b) => (a.measuredAt < b.measuredAt ? 1 : -1));
    if (live[0]) await db.stations.update(record.id, { latestFieldT: live[0].fieldT });
  },
});

/** Place a new station (no id) or edit one (its id). Validated; written with its outbox entry atomically. */
export function saveStation(input: StationInput): Promise<Station> {
  return saveSynced(stationSpec(), input);
}
